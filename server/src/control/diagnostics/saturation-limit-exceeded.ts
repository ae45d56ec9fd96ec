/**
 * `control/input-limit-exceeded` (warning): In the linear step response an input goes beyond its declared limit, so the real loop saturates and the linear metrics do not hold.
 *
 * Example message: input `force` reaches 38 in the step response, beyond its limit [-20, 20]; the loop will saturate
 */
import { code, defineDiagnostic } from '../../model/diagnostics/define';
import { fmt } from './spec-number-format';

export const saturationLimitExceeded = defineDiagnostic({
  code: 'control/input-limit-exceeded',
  severity: 'warning',
  fires: 'In the linear step response an input goes beyond its declared limit, so the real loop saturates and the linear metrics do not hold.',
  example: 'input `force` reaches 38 in the step response, beyond its limit [-20, 20]; the loop will saturate',
  message: (input: string, peak: number, low: number, high: number): string =>
    `input ${code(input)} reaches ${fmt(peak)} in the step response, beyond its limit [${fmt(low)}, ${fmt(high)}]; the loop will saturate`,
});
