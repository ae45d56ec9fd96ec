/**
 * `control/sample-too-long` (warning): The sample period is longer than the fastest closed-loop time constant (|λ|·T above the bound in samplingAdvice.ts) or than the bandwidth rule advises.
 *
 * Example message: a sample period of 0.5 s is too long for the fastest closed-loop pole (|λ| = 8 rad/s); use at most 0.0125 s
 */
import { defineDiagnostic } from '../../model/diagnostics/define';
import { fmt } from './spec-number-format';

export const samplingTooLong = defineDiagnostic({
  code: 'control/sample-too-long',
  severity: 'warning',
  fires: 'The sample period is longer than the fastest closed-loop time constant (|λ|·T above the bound in samplingAdvice.ts) or than the bandwidth rule advises.',
  example: 'a sample period of 0.5 s is too long for the fastest closed-loop pole (|λ| = 8 rad/s); use at most 0.0125 s',
  message: (period: number, fastestPole: number, advisedPeriod: number): string =>
    `a sample period of ${fmt(period)} s is too long for the fastest closed-loop pole (|λ| = ${fmt(fastestPole)} rad/s); use at most ${fmt(advisedPeriod)} s`,
});
