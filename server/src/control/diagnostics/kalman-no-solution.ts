/**
 * `control/kalman-no-solution` (error): No steady-state Kalman gain exists for the given noise intensities (V not positive definite, W not positive semidefinite, an undetectable mode, or no stabilising Riccati solution).
 *
 * Example message: no steady-state estimator gain: V must be positive definite (smallest eigenvalue -0.1)
 */
import { defineDiagnostic } from '../../model/diagnostics/define';
import { fmt } from './spec-number-format';

export const kalmanNoSolution = defineDiagnostic({
  code: 'control/kalman-no-solution',
  severity: 'error',
  fires: 'No steady-state Kalman gain exists for the given noise intensities (V not positive definite, W not positive semidefinite, an undetectable mode, or no stabilising Riccati solution).',
  example: 'no steady-state estimator gain: V must be positive definite (smallest eigenvalue -0.1)',
  message: (reason: string, smallest?: number): string => reason === 'v-not-positive-definite' ? `no steady-state estimator gain: V must be positive definite${smallest !== undefined ? ` (smallest eigenvalue ${fmt(smallest)})` : ''}` : reason === 'w-not-positive-semidefinite' ? 'no steady-state estimator gain: W must be positive semidefinite' : reason === 'not-detectable' ? 'no steady-state estimator gain: an unstable mode cannot be seen from the outputs' : reason === 'noise-misses-boundary-mode' ? 'no steady-state estimator gain: the process noise does not excite a mode on the stability boundary' : 'no steady-state estimator gain: the estimator Riccati equation has no stabilising solution',
});
