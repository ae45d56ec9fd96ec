/**
 * `model/missing-weight` (error): `lqr` without Q or R, or `observer noise` without W or V.
 *
 * Example message: `lqr` needs `R` (1×1, weighting the inputs)
 */
import { defineDiagnostic, code } from './define';

export const missingWeight = defineDiagnostic({
  code: 'model/missing-weight',
  severity: 'error',
  fires: '`lqr` without Q or R, or `observer noise` without W or V.',
  example: '`lqr` needs `R` (1×1, weighting the inputs)',
  message: (line: string, name: string, shape: string): string =>
    `${code(line)} needs ${code(name)} (${shape})`,
});
