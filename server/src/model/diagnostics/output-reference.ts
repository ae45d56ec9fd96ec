/**
 * `model/output-reference` (error): An equation uses an output's name; outputs are computed from states and inputs, never fed back into equations.
 *
 * Example message: `height` is an output; equations may use states, inputs, disturbances and parameters
 */
import { defineDiagnostic, code } from './define';

export const outputReference = defineDiagnostic({
  code: 'model/output-reference',
  severity: 'error',
  fires: 'An equation uses an output\'s name; outputs are computed from states and inputs, never fed back into equations.',
  example: '`height` is an output; equations may use states, inputs, disturbances and parameters',
  message: (name: string): string =>
    `${code(name)} is an output; equations may use states, inputs, disturbances and parameters`,
});
