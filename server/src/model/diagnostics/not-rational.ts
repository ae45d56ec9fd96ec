/**
 * `model/not-rational` (error): A transfer function uses something that is not a ratio of polynomials in `s` (a function of s, a non-integer power of s, a matrix, a signal).
 *
 * Example message: `sqrt(s)` is not a polynomial in s; a transfer function is a ratio of polynomials
 */
import { defineDiagnostic } from './define';

export const notRational = defineDiagnostic({
  code: 'model/not-rational',
  severity: 'error',
  fires: 'A transfer function uses something that is not a ratio of polynomials in `s` (a function of s, a non-integer power of s, a matrix, a signal).',
  example: '`sqrt(s)` is not a polynomial in s; a transfer function is a ratio of polynomials',
  message: (detail: string): string =>
    detail,
});
