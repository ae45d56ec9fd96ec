/**
 * `model/internal-error` (error): The model checker itself failed on this document (a bug in Loopwright, not in the model).
 *
 * Example message: internal error while checking the model: x is undefined
 */
import { defineDiagnostic } from './define';

export const internalError = defineDiagnostic({
  code: 'model/internal-error',
  severity: 'error',
  fires: 'The model checker itself failed on this document (a bug in Loopwright, not in the model).',
  example: 'internal error while checking the model: x is undefined',
  message: (detail: string): string =>
    `internal error while checking the model: ${detail}`,
});
