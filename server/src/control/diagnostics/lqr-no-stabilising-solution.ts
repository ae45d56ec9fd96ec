/**
 * `control/lqr-no-solution` (error): The Riccati equation has no stabilising solution, or its solver did not converge, although the weights passed their checks.
 *
 * Example message: the LQR Riccati equation has no stabilising solution (solver did not converge); check that every unstable mode is controllable and penalised
 */
import { defineDiagnostic } from '../../model/diagnostics/define';
import { fmt } from './spec-number-format';

export const lqrNoStabilisingSolution = defineDiagnostic({
  code: 'control/lqr-no-solution',
  severity: 'error',
  fires: 'The Riccati equation has no stabilising solution, or its solver did not converge, although the weights passed their checks.',
  example: 'the LQR Riccati equation has no stabilising solution (solver did not converge); check that every unstable mode is controllable and penalised',
  message: (reason: 'no-stabilising-solution' | 'no-convergence'): string =>
    reason === 'no-convergence'
      ? 'the LQR Riccati solver did not converge; the weights may be badly scaled against the plant'
      : 'the LQR Riccati equation has no stabilising solution; check that every unstable mode is controllable and penalised',
});
