/**
 * `control/unobservable` (warning; error when the mode is not stable and an observer is needed):
 * a mode of A leaves no trace in any output, so no observer can estimate it.
 *
 * Example message: unobservable pair (A, C): mode s = 0 leaves no trace in any output, and it is not stable
 */
import type { Complex, Diagnostic, Range, RelatedInformation } from '../../model/types';
import { defineDiagnostic } from '../../model/diagnostics/define';
import { formatMode } from './control-values';

export const unobservableKind = defineDiagnostic({
  code: 'control/unobservable',
  severity: 'warning',
  fires: 'A mode of A is invisible in every output (staircase on (Aᵀ, Cᵀ)); an error when the mode is not stable and an observer is required.',
  example: 'unobservable pair (A, C): mode s = 0 leaves no trace in any output, and it is not stable',
  message: (mode: Complex, stable: boolean, domain: 'continuous' | 'discrete'): string =>
    `unobservable pair (A, C): mode ${formatMode(mode, domain)} leaves no trace in any output` +
    (stable ? ' (it is stable, so the plant is still detectable)' : ', and it is not stable: no observer can estimate it'),
});

export function unobservableDiagnostic(
  range: Range,
  details: { mode: Complex; stable: boolean; domain?: 'continuous' | 'discrete'; observerNeeded?: boolean },
  related?: RelatedInformation[],
): Diagnostic {
  return unobservableKind.create(range, [details.mode, details.stable, details.domain ?? 'continuous'], {
    related,
    severity: !details.stable && details.observerNeeded ? 'error' : 'warning',
    data: { mode: details.mode },
  });
}
