/**
 * `model/static-transfer` (error): The transfer function has no poles (the denominator is a constant): it is a pure gain with no state to feed back.
 *
 * Example message: the transfer function is a constant gain (no s in the denominator): there is no state to control
 */
import { defineDiagnostic } from './define';

export const staticTransfer = defineDiagnostic({
  code: 'model/static-transfer',
  severity: 'error',
  fires: 'The transfer function has no poles (the denominator is a constant): it is a pure gain with no state to feed back.',
  example: 'the transfer function is a constant gain (no s in the denominator): there is no state to control',
  message: (): string =>
    'the transfer function is a constant gain (no s in the denominator): there is no state to control',
});
