/**
 * `model/no-dynamics` (error): A plant has neither matrices, equations nor a transfer function.
 *
 * Example message: plant `hoist` has no dynamics: write A and B, equations (x' = …), or a transfer function
 */
import { defineDiagnostic, code } from './define';

export const noDynamics = defineDiagnostic({
  code: 'model/no-dynamics',
  severity: 'error',
  fires: 'A plant has neither matrices, equations nor a transfer function.',
  example: 'plant `hoist` has no dynamics: write A and B, equations (x\' = …), or a transfer function',
  message: (plant: string): string =>
    `plant ${code(plant)} has no dynamics: write A and B, equations (x' = …), or a transfer function`,
});
