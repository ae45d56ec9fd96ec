/**
 * `control/fragile-prescaler` (warning): with the nominal prescaler, ±p % error in one parameter
 * (or in B) leaves a steady-state tracking error above p/10 % (common practice: offsets worth
 * naming); the quick fix `add-integral-action` is offered when integral action is feasible.
 *
 * Example message: the prescaler relies on exact parameters: ±10 % in `efficiency` leaves 7.3 % steady-state error on `temperature` (integral action: 0 %)
 */
import type { Diagnostic, Range, RelatedInformation } from '../../model/types';
import { defineDiagnostic } from '../../model/diagnostics/define';
import { formatNumber, formatPercent, quote } from './control-values';

export const fragilePrescalerKind = defineDiagnostic({
  code: 'control/fragile-prescaler',
  severity: 'warning',
  fires: 'A ±p % parameter error leaves a noticeable steady-state tracking error with the nominal prescaler.',
  example: 'the prescaler relies on exact parameters: ±10 % in `efficiency` leaves 7.3 % steady-state error on `temperature` (integral action: 0 %)',
  message: (percent: number, parameter: string, error: number, outputs: string[], integralError: number | null): string =>
    `the prescaler relies on exact parameters: ±${formatNumber(percent)} % in ${parameter === 'B' ? 'the input gain B' : quote(parameter)} leaves ` +
    (Number.isFinite(error) ? `${formatPercent(error)} steady-state error` : 'an unstable loop') +
    ` on ${outputs.map(quote).join(', ')}` +
    (integralError !== null ? ` (integral action: ${formatPercent(integralError < 5e-7 ? 0 : integralError)})` : ''),
});

export function fragilePrescalerDiagnostic(
  range: Range,
  details: { percent: number; parameter: string; trackingError: number; outputs: string[]; integralError?: number | null; integralFeasible: boolean },
  related?: RelatedInformation[],
): Diagnostic {
  return fragilePrescalerKind.create(
    range,
    [details.percent, details.parameter, details.trackingError, details.outputs, details.integralError ?? null],
    { related, data: details.integralFeasible ? { fix: 'add-integral-action', trackingError: details.trackingError } : { trackingError: details.trackingError } },
  );
}
