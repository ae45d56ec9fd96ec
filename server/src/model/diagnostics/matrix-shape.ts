/**
 * `model/matrix-shape` (error): A plant matrix does not match the declared signals; the range is the extra rows/entries, or the short row.
 *
 * Example message: B has 3 rows but the plant declares 2 states (theta, omega)
 */
import { defineDiagnostic } from './define';

export const matrixShape = defineDiagnostic({
  code: 'model/matrix-shape',
  severity: 'error',
  fires: 'A plant matrix does not match the declared signals; the range is the extra rows/entries, or the short row.',
  example: 'B has 3 rows but the plant declares 2 states (theta, omega)',
  message: (detail: string): string =>
    detail,
});
