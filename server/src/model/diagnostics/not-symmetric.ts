/**
 * `model/not-symmetric` (error): A weight matrix (Q, R, N is exempt; observer W, V) is not symmetric beyond a tolerance scaled to its norm; the range is the offending entry, the related information its mirror.
 *
 * Example message: Q is not symmetric: Q(1,2) = 1 but Q(2,1) = 0
 */
import { defineDiagnostic } from './define';

export const notSymmetric = defineDiagnostic({
  code: 'model/not-symmetric',
  severity: 'error',
  fires: 'A weight matrix (Q, R, N is exempt; observer W, V) is not symmetric beyond a tolerance scaled to its norm; the range is the offending entry, the related information its mirror.',
  example: 'Q is not symmetric: Q(1,2) = 1 but Q(2,1) = 0',
  message: (detail: string): string =>
    detail,
});
