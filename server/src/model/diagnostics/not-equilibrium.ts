/**
 * `model/not-equilibrium` (warning): The drift f(x0, u0, w0) at the operating point is not zero (beyond rounding scaled to the size of the terms): the point is not an equilibrium. Lists the residual per state and, when it exists, the input that would hold the state.
 *
 * Example message: the operating point is not an equilibrium: omega' = -9.81 there; current = 2.4525 would hold it
 */
import { defineDiagnostic } from './define';

export const notEquilibrium = defineDiagnostic({
  code: 'model/not-equilibrium',
  severity: 'warning',
  fires: 'The drift f(x0, u0, w0) at the operating point is not zero (beyond rounding scaled to the size of the terms): the point is not an equilibrium. Lists the residual per state and, when it exists, the input that would hold the state.',
  example: 'the operating point is not an equilibrium: omega\' = -9.81 there; current = 2.4525 would hold it',
  message: (detail: string): string =>
    detail,
});
