/**
 * `model/unexpected-unit` (warning): A unit appears where units carry no meaning (matrix entries, equations, poles, weights); the number is converted to SI and used.
 *
 * Example message: a unit means nothing in a matrix entry: `20 ms` is read as 0.02
 */
import { defineDiagnostic, code } from './define';

export const unexpectedUnit = defineDiagnostic({
  code: 'model/unexpected-unit',
  severity: 'warning',
  fires: 'A unit appears where units carry no meaning (matrix entries, equations, poles, weights); the number is converted to SI and used.',
  example: 'a unit means nothing in a matrix entry: `20 ms` is read as 0.02',
  message: (text: string, place: string, value: number): string =>
    `a unit means nothing in ${place}: ${code(text)} is read as ${value}`,
});
