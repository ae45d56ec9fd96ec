/**
 * `model/mixed-forms` (error): A plant mixes matrix assignments, equations and a transfer function; one plant uses exactly one form.
 *
 * Example message: this plant is already written in matrix form (A = …); equations cannot be mixed in
 */
import { defineDiagnostic } from './define';

export const mixedForms = defineDiagnostic({
  code: 'model/mixed-forms',
  severity: 'error',
  fires: 'A plant mixes matrix assignments, equations and a transfer function; one plant uses exactly one form.',
  example: 'this plant is already written in matrix form (A = …); equations cannot be mixed in',
  message: (existing: string, added: string): string =>
    `this plant is already written in ${existing}; ${added} cannot be mixed in`,
});
