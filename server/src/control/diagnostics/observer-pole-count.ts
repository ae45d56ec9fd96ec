/**
 * `control/observer-pole-count` (error): The observer pole list does not give one pole per estimated state.
 *
 * Example message: the observer needs 3 poles (one per estimated state) but 2 are given
 */
import { defineDiagnostic } from '../../model/diagnostics/define';

export const observerPoleCount = defineDiagnostic({
  code: 'control/observer-pole-count',
  severity: 'error',
  fires: 'The observer pole list does not give one pole per estimated state.',
  example: 'the observer needs 3 poles (one per estimated state) but 2 are given',
  message: (expected: number, found: number): string => `the observer needs ${expected} poles (one per estimated state) but ${found} ${found === 1 ? 'is' : 'are'} given`,
});
