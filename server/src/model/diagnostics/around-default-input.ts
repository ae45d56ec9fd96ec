/**
 * `model/around-default-input` (info): `around` leaves some inputs (or disturbances) out; they are taken as 0.
 *
 * Example message: `around` gives no value for input `current`: taken as 0
 */
import { defineDiagnostic, code } from './define';

export const aroundDefaultInput = defineDiagnostic({
  code: 'model/around-default-input',
  severity: 'info',
  fires: '`around` leaves some inputs (or disturbances) out; they are taken as 0.',
  example: '`around` gives no value for input `current`: taken as 0',
  message: (names: string[], role: string): string =>
    '`around` gives no value for ' + role + ' ' + names.map(code).join(', ') + ': taken as 0',
});
