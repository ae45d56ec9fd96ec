/**
 * `model/reserved-name` (error): A parameter or signal is named like a built-in constant or function (`pi`, `sin`, `diag`, …).
 *
 * Example message: `pi` is a built-in constant and cannot be redefined
 */
import { defineDiagnostic, code } from './define';

export const reservedName = defineDiagnostic({
  code: 'model/reserved-name',
  severity: 'error',
  fires: 'A parameter or signal is named like a built-in constant or function (`pi`, `sin`, `diag`, …).',
  example: '`pi` is a built-in constant and cannot be redefined',
  message: (name: string, builtin: string): string =>
    `${code(name)} is a built-in ${builtin} and cannot be redefined`,
});
