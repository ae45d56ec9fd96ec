/**
 * `model/duplicate-name` (error): A plant, controller, parameter or signal name is declared a second time in the same scope.
 *
 * Example message: `omega` is already declared as a state
 */
import { defineDiagnostic, code } from './define';

export const duplicateName = defineDiagnostic({
  code: 'model/duplicate-name',
  severity: 'error',
  fires: 'A plant, controller, parameter or signal name is declared a second time in the same scope.',
  example: '`omega` is already declared as a state',
  message: (name: string, firstRole: string): string =>
    `${code(name)} is already declared as ${firstRole}`,
});
