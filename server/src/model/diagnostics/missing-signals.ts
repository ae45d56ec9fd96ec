/**
 * `model/missing-signals` (error): A form needs a signal declaration that is absent: equations without `states`, `E` without `disturbances`.
 *
 * Example message: equations need a `states` line naming the states
 */
import { defineDiagnostic } from './define';

export const missingSignals = defineDiagnostic({
  code: 'model/missing-signals',
  severity: 'error',
  fires: 'A form needs a signal declaration that is absent: equations without `states`, `E` without `disturbances`.',
  example: 'equations need a `states` line naming the states',
  message: (detail: string): string =>
    detail,
});
