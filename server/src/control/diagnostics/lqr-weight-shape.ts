/**
 * `control/lqr-weight-shape` (error): The LQR state weight does not cover the states and the integrators of the design.
 *
 * Example message: Q must be 3 × 3 (the states and one weight per integrator) but is 2 × 2
 */
import { defineDiagnostic } from '../../model/diagnostics/define';

export const lqrWeightShape = defineDiagnostic({
  code: 'control/lqr-weight-shape',
  severity: 'error',
  fires: 'The LQR state weight does not cover the states and the integrators of the design.',
  example: 'Q must be 3 × 3 (the states and one weight per integrator) but is 2 × 2',
  message: (name: string, expected: number, found: number): string => `${name} must be ${expected} × ${expected} (the states and one weight per integrator) but is ${found} × ${found}`,
});
