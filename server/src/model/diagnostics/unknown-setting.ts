/**
 * `model/unknown-setting` (error): A name a controller line does not know: an lqr weight other than Q, R, N; a noise weight other than W, V; a spec other than settling, overshoot, rise; an observer form other than current or predictor.
 *
 * Example message: `lqr` takes Q, R and N; `P` is not one of them
 */
import { defineDiagnostic, code } from './define';

export const unknownSetting = defineDiagnostic({
  code: 'model/unknown-setting',
  severity: 'error',
  fires: 'A name a controller line does not know: an lqr weight other than Q, R, N; a noise weight other than W, V; a spec other than settling, overshoot, rise; an observer form other than current or predictor.',
  example: '`lqr` takes Q, R and N; `P` is not one of them',
  message: (line: string, name: string, allowed: string, suggestion?: string): string =>
    `${code(line)} takes ${allowed}; ${code(name)} is not one of them` + (suggestion ? ` (did you mean ${code(suggestion)}?)` : ''),
});
