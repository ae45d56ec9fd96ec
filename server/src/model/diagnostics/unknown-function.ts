/**
 * `model/unknown-function` (error): A call names a function that is not built in.
 *
 * Example message: unknown function `sine`; did you mean `sin`?
 */
import { defineDiagnostic, code } from './define';

export const unknownFunction = defineDiagnostic({
  code: 'model/unknown-function',
  severity: 'error',
  fires: 'A call names a function that is not built in.',
  example: 'unknown function `sine`; did you mean `sin`?',
  message: (name: string, suggestion?: string): string =>
    `unknown function ${code(name)}` + (suggestion ? `; did you mean ${code(suggestion)}?` : '; the functions are sin cos tan exp log sqrt tanh abs diag identity zeros'),
});
