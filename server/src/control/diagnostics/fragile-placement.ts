/**
 * `control/fragile-placement` (warning): the placed closed loop is sensitive — eigenvector condition
 * above settings.placementConditionLimit, achieved poles off by more than √ε relative, or a gain
 * far beyond the model's scale. Small implementation or model errors move the poles.
 *
 * Example message: fragile pole placement: eigenvector condition 3.2e9, achieved poles off by up to 4e-5 relative, gain norm 1.7e10
 */
import type { Diagnostic, Range, RelatedInformation } from '../../model/types';
import { defineDiagnostic } from '../../model/diagnostics/define';
import { formatNumber } from './control-values';

export const fragilePlacementKind = defineDiagnostic({
  code: 'control/fragile-placement',
  severity: 'warning',
  fires: 'The placement result is flagged fragile (ill-conditioned eigenvectors, inaccurate poles or an excessive gain).',
  example: 'fragile pole placement: eigenvector condition 3.2e9, achieved poles off by up to 4e-5 relative, gain norm 1.7e10',
  message: (condition: number, poleError: number, gainNorm: number): string =>
    `fragile pole placement: eigenvector condition ${formatNumber(condition)}, achieved poles off by up to ${formatNumber(poleError)} relative, gain norm ${formatNumber(gainNorm)}; slower or less spread poles usually help`,
});

export function fragilePlacementDiagnostic(
  range: Range,
  details: { eigenvectorCondition: number; maxRelativePoleError: number; gainNorm: number },
  related?: RelatedInformation[],
): Diagnostic {
  return fragilePlacementKind.create(range, [details.eigenvectorCondition, details.maxRelativePoleError, details.gainNorm], { related });
}
