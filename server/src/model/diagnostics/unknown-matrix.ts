/**
 * `model/unknown-matrix` (error): A matrix assignment names something other than A, B, C, D or E.
 *
 * Example message: `F` is not a plant matrix; the matrices are A, B, C, D and E
 */
import { defineDiagnostic, code } from './define';

export const unknownMatrix = defineDiagnostic({
  code: 'model/unknown-matrix',
  severity: 'error',
  fires: 'A matrix assignment names something other than A, B, C, D or E.',
  example: '`F` is not a plant matrix; the matrices are A, B, C, D and E',
  message: (name: string): string =>
    `${code(name)} is not a plant matrix; the matrices are A, B, C, D and E`,
});
