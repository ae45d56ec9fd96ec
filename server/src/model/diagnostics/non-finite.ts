/**
 * `model/non-finite` (error): A sub-expression evaluates to NaN or ±Infinity (overflow, log of 0, …); the range is the innermost such sub-expression.
 *
 * Example message: `exp(800)` overflows to Infinity
 */
import { defineDiagnostic, code } from './define';

export const nonFinite = defineDiagnostic({
  code: 'model/non-finite',
  severity: 'error',
  fires: 'A sub-expression evaluates to NaN or ±Infinity (overflow, log of 0, …); the range is the innermost such sub-expression.',
  example: '`exp(800)` overflows to Infinity',
  message: (text: string, what: string): string =>
    `${code(text)} ${what}`,
});
