/**
 * `model/shadowed-name` (warning): A parameter has the same name as a signal of its plant (or as the Laplace variable `s` in a transfer function); in equations the signal wins.
 *
 * Example message: parameter `omega` has the same name as state `omega`; in equations `omega` means the state
 */
import { defineDiagnostic, code } from './define';

export const shadowedName = defineDiagnostic({
  code: 'model/shadowed-name',
  severity: 'warning',
  fires: 'A parameter has the same name as a signal of its plant (or as the Laplace variable `s` in a transfer function); in equations the signal wins.',
  example: 'parameter `omega` has the same name as state `omega`; in equations `omega` means the state',
  message: (name: string, role: string, meaning: string): string =>
    `parameter ${code(name)} has the same name as ${role}; ${meaning}`,
});
