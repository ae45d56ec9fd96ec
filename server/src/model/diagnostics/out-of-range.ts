/**
 * `model/out-of-range` (error): A value outside what it can physically mean: a non-positive sample period or time spec, an overshoot outside 0…100 %, a delay that is not a whole number of samples, a limit whose low end is not below its high end.
 *
 * Example message: the sample period must be positive, got -0.005 s
 */
import { defineDiagnostic } from './define';

export const outOfRange = defineDiagnostic({
  code: 'model/out-of-range',
  severity: 'error',
  fires: 'A value outside what it can physically mean: a non-positive sample period or time spec, an overshoot outside 0…100 %, a delay that is not a whole number of samples, a limit whose low end is not below its high end.',
  example: 'the sample period must be positive, got -0.005 s',
  message: (detail: string): string =>
    detail,
});
