/**
 * `control/lqr-r-not-positive-definite` (error): The input weight R (or the measurement noise V) is not symmetric positive definite: some input costs nothing, and the optimal gain is infinite.
 *
 * Example message: R must be positive definite (every input must cost something); its smallest Cholesky pivot is -0.1
 */
import { defineDiagnostic } from '../../model/diagnostics/define';
import { fmt } from './spec-number-format';

export const lqrRNotPositiveDefinite = defineDiagnostic({
  code: 'control/lqr-r-not-positive-definite',
  severity: 'error',
  fires: 'The input weight R (or the measurement noise V) is not symmetric positive definite: some input costs nothing, and the optimal gain is infinite.',
  example: 'R must be positive definite (every input must cost something); its smallest Cholesky pivot is -0.1',
  message: (matrix: string, smallest: number): string =>
    `${matrix} must be positive definite (every input must cost something); its smallest Cholesky pivot is ${fmt(smallest)}`,
});
