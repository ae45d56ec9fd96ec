/**
 * `control/current-form-feedthrough` (error): A current-form estimator is asked for a plant with direct feedthrough (D ≠ 0): the estimate and the input would depend on each other within one sample.
 *
 * Example message: the current-form estimator needs D = 0 in plant `rig` (the input would feed back into its own estimate); use the predictor form
 */
import { code, defineDiagnostic } from '../../model/diagnostics/define';

export const currentFormFeedthrough = defineDiagnostic({
  code: 'control/current-form-feedthrough',
  severity: 'error',
  fires: 'A current-form estimator is asked for a plant with direct feedthrough (D ≠ 0): the estimate and the input would depend on each other within one sample.',
  example: 'the current-form estimator needs D = 0 in plant `rig` (the input would feed back into its own estimate); use the predictor form',
  message: (plant: string): string => `the current-form estimator needs D = 0 in plant ${code(plant)} (the input would feed back into its own estimate); use the predictor form`,
});
