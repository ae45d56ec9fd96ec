/**
 * `model/unknown-name` (error): An expression, equation, `around`, `track`, `integral`, `limit` or `step` uses a name that is not declared where it is used; the nearest declared name is suggested.
 *
 * Example message: unknown name `omgea`; did you mean `omega`?
 */
import { defineDiagnostic, code } from './define';

export const unknownName = defineDiagnostic({
  code: 'model/unknown-name',
  severity: 'error',
  fires: 'An expression, equation, `around`, `track`, `integral`, `limit` or `step` uses a name that is not declared where it is used; the nearest declared name is suggested.',
  example: 'unknown name `omgea`; did you mean `omega`?',
  message: (name: string, what: string, suggestion?: string): string =>
    `unknown ${what} ${code(name)}` + (suggestion ? `; did you mean ${code(suggestion)}?` : ''),
});
