/**
 * `model/around-ignored` (warning): `around` in a matrix or transfer-function plant: those forms are already linear, so it is ignored.
 *
 * Example message: `around` only applies to equations; this plant is in matrix form and it is ignored
 */
import { defineDiagnostic } from './define';

export const aroundIgnored = defineDiagnostic({
  code: 'model/around-ignored',
  severity: 'warning',
  fires: '`around` in a matrix or transfer-function plant: those forms are already linear, so it is ignored.',
  example: '`around` only applies to equations; this plant is in matrix form and it is ignored',
  message: (form: string): string =>
    '`around` only applies to equations; this plant is in ' + form + ' and it is ignored',
});
