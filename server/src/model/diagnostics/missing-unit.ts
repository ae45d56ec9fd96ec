/**
 * `model/missing-unit` (warning): A bare number where a unit is expected: `sample`, `settling`, `rise` (read as seconds) and `overshoot` (read as percent).
 *
 * Example message: `0.01` has no unit: read as 0.01 s; write e.g. `10 ms`
 */
import { defineDiagnostic, code } from './define';

export const missingUnit = defineDiagnostic({
  code: 'model/missing-unit',
  severity: 'warning',
  fires: 'A bare number where a unit is expected: `sample`, `settling`, `rise` (read as seconds) and `overshoot` (read as percent).',
  example: '`0.01` has no unit: read as 0.01 s; write e.g. `10 ms`',
  message: (text: string, assumption: string, example: string): string =>
    `${code(text)} has no unit: read as ${assumption}; write e.g. ${code(example)}`,
});
