/**
 * `model/wrong-arity` (error): A built-in function is called with the wrong number of arguments.
 *
 * Example message: `zeros` takes 2 arguments (rows, columns) but was given 1
 */
import { defineDiagnostic, code } from './define';

export const wrongArity = defineDiagnostic({
  code: 'model/wrong-arity',
  severity: 'error',
  fires: 'A built-in function is called with the wrong number of arguments.',
  example: '`zeros` takes 2 arguments (rows, columns) but was given 1',
  message: (name: string, expected: string, found: number): string =>
    `${code(name)} takes ${expected} but was given ${found}`,
});
