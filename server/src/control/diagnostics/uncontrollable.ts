/**
 * `control/uncontrollable` (error when the mode is not stable, else warning): the orthogonal
 * staircase finds a mode of A that no input can move (the pair (A, B) is not controllable).
 *
 * Example message: uncontrollable pair (A, B): mode s = 2 cannot be moved by any input, and it is unstable
 */
import type { Complex, Diagnostic, Range, RelatedInformation } from '../../model/types';
import { defineDiagnostic } from '../../model/diagnostics/define';
import { formatMode } from './control-values';

export const uncontrollableKind = defineDiagnostic({
  code: 'control/uncontrollable',
  severity: 'error',
  fires: 'A mode of A cannot be moved by any input (orthogonal staircase rank decision); error when that mode is not stable.',
  example: 'uncontrollable pair (A, B): mode s = 2 cannot be moved by any input, and it is unstable',
  message: (mode: Complex, stable: boolean, domain: 'continuous' | 'discrete'): string =>
    `uncontrollable pair (A, B): mode ${formatMode(mode, domain)} cannot be moved by any input` +
    (stable ? ' (it is stable, so the plant is still stabilisable; keep this pole in the requested list)' : ', and it is not stable: no state feedback can stabilise the plant'),
});

export function uncontrollableDiagnostic(
  range: Range,
  details: { mode: Complex; stable: boolean; domain?: 'continuous' | 'discrete' },
  related?: RelatedInformation[],
): Diagnostic {
  return uncontrollableKind.create(range, [details.mode, details.stable, details.domain ?? 'continuous'], {
    related,
    severity: details.stable ? 'warning' : 'error',
    data: { mode: details.mode },
  });
}
