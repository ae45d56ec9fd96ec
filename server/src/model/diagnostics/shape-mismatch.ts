/**
 * `model/shape-mismatch` (error): Matrix arithmetic with incompatible shapes, a matrix where a number is needed, or a matrix inside a matrix literal (block concatenation is not supported).
 *
 * Example message: cannot add a 2×2 matrix and a 3×1 matrix
 */
import { defineDiagnostic } from './define';

export const shapeMismatch = defineDiagnostic({
  code: 'model/shape-mismatch',
  severity: 'error',
  fires: 'Matrix arithmetic with incompatible shapes, a matrix where a number is needed, or a matrix inside a matrix literal (block concatenation is not supported).',
  example: 'cannot add a 2×2 matrix and a 3×1 matrix',
  message: (detail: string): string =>
    detail,
});
