/**
 * `control/small-margin` (warning): A loop broken at one plant input has a phase margin below 30° or a gain margin within 6 dB (common practice), so modest model error destabilises it.
 *
 * Example message: the loop at input `u` has a phase margin of 18° (common practice: at least 30°)
 */
import { code, defineDiagnostic } from '../../model/diagnostics/define';
import { fmt } from './spec-number-format';

export const marginSmall = defineDiagnostic({
  code: 'control/small-margin',
  severity: 'warning',
  fires: 'A loop broken at one plant input has a phase margin below 30° or a gain margin within 6 dB (common practice), so modest model error destabilises it.',
  example: 'the loop at input `u` has a phase margin of 18° (common practice: at least 30°)',
  message: (input: string, what: 'phase' | 'gain-upper' | 'gain-lower', value: number): string =>
    what === 'phase'
      ? `the loop at input ${code(input)} has a phase margin of ${fmt(value)}° (common practice: at least 30°)`
      : `the loop at input ${code(input)} tolerates only ${fmt(Math.abs(value))} dB of gain ${what === 'gain-upper' ? 'increase' : 'decrease'} (common practice: at least 6 dB)`,
});
