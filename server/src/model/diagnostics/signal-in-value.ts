/**
 * `model/signal-in-value` (error): A state, input, output or disturbance appears where a number is needed (a parameter, a matrix entry, a controller value).
 *
 * Example message: `omega` is a state; a matrix entry must be a number
 */
import { defineDiagnostic, code } from './define';

export const signalInValue = defineDiagnostic({
  code: 'model/signal-in-value',
  severity: 'error',
  fires: 'A state, input, output or disturbance appears where a number is needed (a parameter, a matrix entry, a controller value).',
  example: '`omega` is a state; a matrix entry must be a number',
  message: (name: string, role: string, place: string): string =>
    `${code(name)} is ${role}; ${place} must be a number`,
});
