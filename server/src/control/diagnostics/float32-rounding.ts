/**
 * `control/float32-rounding` (warning): With gains and matrices rounded to 32-bit floats, a closed-loop pole moves by more than √ε₃₂ relative, or leaves the stability region.
 *
 * Example message: in 32-bit arithmetic the closed-loop pole -9.5 moves by 3.1 % (to -9.2+0.4j); this design needs 64-bit arithmetic or better-conditioned poles
 */
import { defineDiagnostic } from '../../model/diagnostics/define';
import type { Complex } from '../../model/types';
import { complexText, fmt } from './spec-number-format';

export const float32Rounding = defineDiagnostic({
  code: 'control/float32-rounding',
  severity: 'warning',
  fires: 'With gains and matrices rounded to 32-bit floats, a closed-loop pole moves by more than √ε₃₂ relative, or leaves the stability region.',
  example: 'in 32-bit arithmetic the closed-loop pole -9.5 moves by 3.1 % (to -9.2+0.4j); this design needs 64-bit arithmetic or better-conditioned poles',
  message: (pole: Complex, moved: Complex, relativeMove: number, leftStability: boolean): string =>
    leftStability
      ? `in 32-bit arithmetic the closed-loop pole ${complexText(pole)} becomes ${complexText(moved)}, which is unstable; this design needs 64-bit arithmetic or better-conditioned poles`
      : `in 32-bit arithmetic the closed-loop pole ${complexText(pole)} moves by ${fmt(100 * relativeMove)} % (to ${complexText(moved)}); this design needs 64-bit arithmetic or better-conditioned poles`,
});
