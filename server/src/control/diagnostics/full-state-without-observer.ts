/**
 * `control/full-state-without-observer` (warning): the controller feeds back every state but has no
 * observer, while the outputs do not measure every state (rank C < n): the gain needs signals the
 * plant does not provide. Quick fix: `add-observer`.
 *
 * Example message: full-state feedback needs all 4 states, but the outputs measure only 2 independent combinations: add an observer
 */
import type { Diagnostic, Range, RelatedInformation } from '../../model/types';
import { defineDiagnostic } from '../../model/diagnostics/define';

export const fullStateWithoutObserverKind = defineDiagnostic({
  code: 'control/full-state-without-observer',
  severity: 'warning',
  fires: 'State feedback without an observer while rank C < n.',
  example: 'full-state feedback needs all 4 states, but the outputs measure only 2 independent combinations: add an observer',
  message: (states: number, measured: number): string =>
    `full-state feedback needs all ${states} states, but the outputs measure only ${measured} independent combination${measured === 1 ? '' : 's'}: add an observer`,
});

export function fullStateWithoutObserverDiagnostic(range: Range, details: { states: number; measuredRank: number }, related?: RelatedInformation[]): Diagnostic {
  return fullStateWithoutObserverKind.create(range, [details.states, details.measuredRank], { related, data: { fix: 'add-observer' } });
}
