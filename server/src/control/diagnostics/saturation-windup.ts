/**
 * `control/integrator-windup` (warning): With integral action and input limits, the integrator winds up while the input is saturated; clamping the integrator reduces overshoot or settling noticeably.
 *
 * Example message: the integrator winds up while the input is saturated: overshoot 35 % without anti-windup, 4 % with clamping
 */
import { defineDiagnostic } from '../../model/diagnostics/define';
import { fmt } from './spec-number-format';

export const saturationWindup = defineDiagnostic({
  code: 'control/integrator-windup',
  severity: 'warning',
  fires: 'With integral action and input limits, the integrator winds up while the input is saturated; clamping the integrator reduces overshoot or settling noticeably.',
  example: 'the integrator winds up while the input is saturated: overshoot 35 % without anti-windup, 4 % with clamping',
  message: (overshootWithout: number | null, overshootWith: number | null): string =>
    `the integrator winds up while the input is saturated: overshoot ${overshootWithout === null ? 'unknown' : fmt(overshootWithout)} % without anti-windup, ${overshootWith === null ? 'unknown' : fmt(overshootWith)} % with clamping`,
});
