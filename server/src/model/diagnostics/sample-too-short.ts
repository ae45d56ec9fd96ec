/**
 * `model/sample-too-short` (error): A sample period below one nanosecond: no digital controller runs that fast, and the discretised model would be numerically meaningless.
 *
 * Example message: a sample period of 1e-12 s is below 1 ns; no digital controller samples that fast
 */
import { defineDiagnostic } from './define';

export const sampleTooShort = defineDiagnostic({
  code: 'model/sample-too-short',
  severity: 'error',
  fires: 'A sample period below one nanosecond: no digital controller runs that fast, and the discretised model would be numerically meaningless.',
  example: 'a sample period of 1e-12 s is below 1 ns; no digital controller samples that fast',
  message: (seconds: number): string =>
    `a sample period of ${seconds} s is below 1 ns; no digital controller samples that fast`,
});
