/**
 * `control/ill-conditioned-setpoint` (warning): tracking is possible, but the Rosenbrock matrix at
 * DC is nearly singular or the prescaler is far beyond the model's natural gain scale
 * (settings.setpointGainLimit): a zero close to s = 0, so tiny model errors move the set-point.
 *
 * Example message: the set-point gain is 1.2e8 times the model's natural scale (condition 3.4e9): a zero lies close to s = 0, so small model errors shift the settled output
 */
import type { Diagnostic, Range, RelatedInformation } from '../../model/types';
import { defineDiagnostic } from '../../model/diagnostics/define';
import { formatNumber } from './control-values';

export const illConditionedSetpointKind = defineDiagnostic({
  code: 'control/ill-conditioned-setpoint',
  severity: 'warning',
  fires: 'The prescaler exists but the set-point equations are ill-conditioned (condition or gain beyond settings.setpointGainLimit).',
  example:
    "the set-point gain is 1.2e8 times the model's natural scale (condition 3.4e9): a zero lies close to s = 0, so small model errors shift the settled output",
  message: (relativeGain: number, condition: number, domain: 'continuous' | 'discrete'): string =>
    `the set-point gain is ${formatNumber(relativeGain)} times the model's natural scale (condition ${formatNumber(condition)}): a zero lies close to ${domain === 'discrete' ? 'z = 1' : 's = 0'}, so small model errors shift the settled output`,
});

export function illConditionedSetpointDiagnostic(
  range: Range,
  details: { relativeGain: number; conditionNumber: number; domain?: 'continuous' | 'discrete' },
  related?: RelatedInformation[],
): Diagnostic {
  return illConditionedSetpointKind.create(range, [details.relativeGain, details.conditionNumber, details.domain ?? 'continuous'], { related });
}
