/**
 * `model/improper-transfer` (error): The numerator of a transfer function has a higher degree than its denominator (no state-space realisation exists).
 *
 * Example message: the transfer function is improper: numerator degree 3 exceeds denominator degree 2
 */
import { defineDiagnostic } from './define';

export const improperTransfer = defineDiagnostic({
  code: 'model/improper-transfer',
  severity: 'error',
  fires: 'The numerator of a transfer function has a higher degree than its denominator (no state-space realisation exists).',
  example: 'the transfer function is improper: numerator degree 3 exceeds denominator degree 2',
  message: (numeratorDegree: number, denominatorDegree: number): string =>
    `the transfer function is improper: numerator degree ${numeratorDegree} exceeds denominator degree ${denominatorDegree}`,
});
