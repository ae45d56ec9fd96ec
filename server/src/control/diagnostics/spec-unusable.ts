/**
 * `control/spec-unusable` (error): A `spec` line gives no usable time requirement (no settling or rise time, an overshoot outside 0–100 %, or a non-positive time).
 *
 * Example message: the specification gives no settling or rise time, so no poles can be chosen from it
 */
import { defineDiagnostic } from '../../model/diagnostics/define';

export const specUnusable = defineDiagnostic({
  code: 'control/spec-unusable',
  severity: 'error',
  fires: 'A `spec` line gives no usable time requirement (no settling or rise time, an overshoot outside 0–100 %, or a non-positive time).',
  example: 'the specification gives no settling or rise time, so no poles can be chosen from it',
  message: (reason: string): string => reason === 'overshoot-out-of-range' ? 'the overshoot must lie between 0 and 100 %' : reason === 'time-not-positive' ? 'settling and rise times must be positive' : 'the specification gives no settling or rise time, so no poles can be chosen from it',
});
