/**
 * `control/spec-not-met` (warning): The simulated step response misses a settling, overshoot or rise requirement (the second-order formulas used to choose the poles are approximate).
 *
 * Example message: the simulated settling time is 2.6 s, longer than the required 2 s
 */
import { defineDiagnostic } from '../../model/diagnostics/define';
import { fmt } from './spec-number-format';

function kindText(kind: 'settling' | 'overshoot' | 'rise', required: number, achieved: number | null): string {
  const unit = kind === 'overshoot' ? ' %' : ' s';
  const name = kind === 'settling' ? 'settling time' : kind === 'overshoot' ? 'overshoot' : 'rise time';
  if (achieved === null) return `the simulated response never meets the ${name} of ${fmt(required)}${unit}`;
  const comparison = kind === 'overshoot' ? 'more than the allowed' : 'longer than the required';
  return `the simulated ${name} is ${fmt(achieved)}${unit}, ${comparison} ${fmt(required)}${unit}`;
}

export const specViolation = defineDiagnostic({
  code: 'control/spec-not-met',
  severity: 'warning',
  fires: 'The simulated step response misses a settling, overshoot or rise requirement (the second-order formulas used to choose the poles are approximate).',
  example: 'the simulated settling time is 2.6 s, longer than the required 2 s',
  message: (kind: 'settling' | 'overshoot' | 'rise', required: number, achieved: number | null): string =>
    kindText(kind, required, achieved),
});
