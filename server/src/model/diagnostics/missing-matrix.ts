/**
 * `model/missing-matrix` (error): Matrix form without A or B, or without C when outputs are declared.
 *
 * Example message: matrix form needs `B` (2 states × 1 input)
 */
import { defineDiagnostic, code } from './define';

export const missingMatrix = defineDiagnostic({
  code: 'model/missing-matrix',
  severity: 'error',
  fires: 'Matrix form without A or B, or without C when outputs are declared.',
  example: 'matrix form needs `B` (2 states × 1 input)',
  message: (name: string, shape: string): string =>
    `matrix form needs ${code(name)} (${shape})`,
});
