/**
 * `control/no-inputs` (error): A controller is designed for a plant that declares no inputs, so no feedback can act on it.
 *
 * Example message: plant `rig` declares no inputs: state feedback needs at least one actuator
 */
import { code, defineDiagnostic } from '../../model/diagnostics/define';

export const noInputs = defineDiagnostic({
  code: 'control/no-inputs',
  severity: 'error',
  fires: 'A controller is designed for a plant that declares no inputs, so no feedback can act on it.',
  example: 'plant `rig` declares no inputs: state feedback needs at least one actuator',
  message: (plant: string): string => `plant ${code(plant)} declares no inputs: state feedback needs at least one actuator`,
});
