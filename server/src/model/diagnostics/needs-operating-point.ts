/**
 * `model/needs-operating-point` (error): Equations are nonlinear (a nonlinear function or product touches a state or input) and there is no `around` line to linearise about.
 *
 * Example message: nonlinear model needs an operating point: add `around …`
 */
import { defineDiagnostic } from './define';

export const needsOperatingPoint = defineDiagnostic({
  code: 'model/needs-operating-point',
  severity: 'error',
  fires: 'Equations are nonlinear (a nonlinear function or product touches a state or input) and there is no `around` line to linearise about.',
  example: 'nonlinear model needs an operating point: add `around …`',
  message: (): string =>
    'nonlinear model needs an operating point: add `around …`',
});
