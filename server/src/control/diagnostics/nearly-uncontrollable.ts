/**
 * `control/nearly-uncontrollable` (warning): the pair is controllable, but the PBH margin
 * σ_min([A − λI, B]) / ‖[A B]‖ at some mode is below 1 / settings.placementConditionLimit: moving
 * that mode needs a gain of order 1/margin relative to the model, so any placement is fragile.
 * A huge gain is never presented as fine.
 *
 * Example message: mode s = −0.5 is nearly uncontrollable (margin 3.1e-9 of ‖[A B]‖): moving it needs gains around 3.2e8 times the model scale
 */
import type { Complex, Diagnostic, Range, RelatedInformation } from '../../model/types';
import { defineDiagnostic } from '../../model/diagnostics/define';
import { formatMode, formatNumber } from './control-values';

export const nearlyUncontrollableKind = defineDiagnostic({
  code: 'control/nearly-uncontrollable',
  severity: 'warning',
  fires: 'Controllable, but the relative PBH margin at some mode is below 1/placementConditionLimit.',
  example: 'mode s = −0.5 is nearly uncontrollable (margin 3.1e-9 of ‖[A B]‖): moving it needs gains around 3.2e8 times the model scale',
  message: (mode: Complex, margin: number, domain: 'continuous' | 'discrete'): string =>
    `mode ${formatMode(mode, domain)} is nearly uncontrollable (margin ${formatNumber(margin)} of ‖[A B]‖): moving it needs gains around ${formatNumber(1 / margin)} times the model scale`,
});

/** True when the margin calls for this warning. */
export function isNearlyUncontrollable(margin: number | null, placementConditionLimit: number): boolean {
  return margin !== null && margin > 0 && margin < 1 / placementConditionLimit;
}

export function nearlyUncontrollableDiagnostic(
  range: Range,
  details: { mode: Complex; margin: number; domain?: 'continuous' | 'discrete' },
  related?: RelatedInformation[],
): Diagnostic {
  return nearlyUncontrollableKind.create(range, [details.mode, details.margin, details.domain ?? 'continuous'], { related, data: { margin: details.margin } });
}
