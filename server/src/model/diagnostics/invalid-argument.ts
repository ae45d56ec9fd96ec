/**
 * `model/invalid-argument` (error): A built-in function gets an argument outside its domain (`identity(0)`, `zeros(1.5, 2)`, `diag` of a matrix that is not a vector).
 *
 * Example message: `identity` needs a whole number ≥ 1, got 1.5
 */
import { defineDiagnostic } from './define';

export const invalidArgument = defineDiagnostic({
  code: 'model/invalid-argument',
  severity: 'error',
  fires: 'A built-in function gets an argument outside its domain (`identity(0)`, `zeros(1.5, 2)`, `diag` of a matrix that is not a vector).',
  example: '`identity` needs a whole number ≥ 1, got 1.5',
  message: (detail: string): string =>
    detail,
});
