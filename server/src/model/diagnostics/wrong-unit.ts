/**
 * `model/wrong-unit` (error): A unit of the wrong kind for its place: a frequency or percentage for a settling/rise time, a time for an overshoot, a percentage for a sample period.
 *
 * Example message: `overshoot` is a percentage, not a time: write e.g. `5 %`
 */
import { defineDiagnostic, code } from './define';

export const wrongUnit = defineDiagnostic({
  code: 'model/wrong-unit',
  severity: 'error',
  fires: 'A unit of the wrong kind for its place: a frequency or percentage for a settling/rise time, a time for an overshoot, a percentage for a sample period.',
  example: '`overshoot` is a percentage, not a time: write e.g. `5 %`',
  message: (place: string, expected: string, example: string): string =>
    `${place} is ${expected}: write e.g. ${code(example)}`,
});
