/**
 * `model/around-missing-state` (error): `around` does not give a value for every state.
 *
 * Example message: `around` gives no value for state `omega`
 */
import { defineDiagnostic, code } from './define';

export const aroundMissingState = defineDiagnostic({
  code: 'model/around-missing-state',
  severity: 'error',
  fires: '`around` does not give a value for every state.',
  example: '`around` gives no value for state `omega`',
  message: (names: string[]): string =>
    '`around` gives no value for ' + (names.length === 1 ? 'state ' : 'states ') + names.map(code).join(', '),
});
