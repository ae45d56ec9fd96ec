/**
 * `control/observer-impossible` (error): Observer poles cannot be placed: a mode that is not among the requested poles cannot be seen from the outputs.
 *
 * Example message: observer poles cannot be placed: the mode s = -0.05 is unobservable from the outputs and is not among the requested poles
 */
import type { Complex } from '../../model/types';
import { defineDiagnostic } from '../../model/diagnostics/define';
import { complexText } from './spec-number-format';

export const observerImpossible = defineDiagnostic({
  code: 'control/observer-impossible',
  severity: 'error',
  fires: 'Observer poles cannot be placed: a mode that is not among the requested poles cannot be seen from the outputs.',
  example: 'observer poles cannot be placed: the mode s = -0.05 is unobservable from the outputs and is not among the requested poles',
  message: (mode: Complex | null): string => mode ? `observer poles cannot be placed: the mode ${complexText(mode)} is unobservable from the outputs and is not among the requested poles` : 'observer poles cannot be placed on this plant and output set',
});
