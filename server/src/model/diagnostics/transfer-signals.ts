/**
 * `model/transfer-signals` (error): A transfer-function plant declares more than one input or output, or declares states whose number differs from the denominator degree.
 *
 * Example message: a transfer function has one input, but 2 are declared
 */
import { defineDiagnostic } from './define';

export const transferSignals = defineDiagnostic({
  code: 'model/transfer-signals',
  severity: 'error',
  fires: 'A transfer-function plant declares more than one input or output, or declares states whose number differs from the denominator degree.',
  example: 'a transfer function has one input, but 2 are declared',
  message: (detail: string): string =>
    detail,
});
