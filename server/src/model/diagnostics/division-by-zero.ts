/**
 * `model/division-by-zero` (error): A division's divisor evaluates to exactly zero; the range is the divisor.
 *
 * Example message: division by zero: `J - J0` is 0
 */
import { defineDiagnostic, code } from './define';

export const divisionByZero = defineDiagnostic({
  code: 'model/division-by-zero',
  severity: 'error',
  fires: 'A division\'s divisor evaluates to exactly zero; the range is the divisor.',
  example: 'division by zero: `J - J0` is 0',
  message: (divisorText: string): string =>
    `division by zero: ${code(divisorText)} is 0`,
});
