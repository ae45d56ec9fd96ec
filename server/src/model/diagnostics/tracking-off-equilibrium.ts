/**
 * `model/tracking-off-equilibrium` (error): A controller with `track` or `step` controls a plant whose operating point is not an equilibrium: the linear model around it is not valid for holding a set-point.
 *
 * Example message: plant `hoist` is not at an equilibrium at its operating point, so a set-point cannot be held; move `around` to an equilibrium first
 */
import { defineDiagnostic, code } from './define';

export const trackingOffEquilibrium = defineDiagnostic({
  code: 'model/tracking-off-equilibrium',
  severity: 'error',
  fires: 'A controller with `track` or `step` controls a plant whose operating point is not an equilibrium: the linear model around it is not valid for holding a set-point.',
  example: 'plant `hoist` is not at an equilibrium at its operating point, so a set-point cannot be held; move `around` to an equilibrium first',
  message: (plant: string): string =>
    `plant ${code(plant)} is not at an equilibrium at its operating point, so a set-point cannot be held; move ${code('around')} to an equilibrium first`,
});
