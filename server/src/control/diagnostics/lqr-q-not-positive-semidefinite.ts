/**
 * `control/lqr-q-not-positive-semidefinite` (error): The state weight Q − N R⁻¹ Nᵀ (or the process noise W) has a negative eigenvalue: the cost rewards some state motion, so no minimum exists.
 *
 * Example message: Q − N R⁻¹ Nᵀ must be positive semidefinite; it has the eigenvalue -0.5
 */
import { defineDiagnostic } from '../../model/diagnostics/define';
import { fmt } from './spec-number-format';

export const lqrQNotPositiveSemidefinite = defineDiagnostic({
  code: 'control/lqr-q-not-positive-semidefinite',
  severity: 'error',
  fires: 'The state weight Q − N R⁻¹ Nᵀ (or the process noise W) has a negative eigenvalue: the cost rewards some state motion, so no minimum exists.',
  example: 'Q − N R⁻¹ Nᵀ must be positive semidefinite; it has the eigenvalue -0.5',
  message: (matrix: string, smallest: number): string =>
    `${matrix} must be positive semidefinite; it has the eigenvalue ${fmt(smallest)}`,
});
