/**
 * `model/missing-equation` (error): A declared state has no `x' = …` equation, or a declared output has no `output y = …` equation.
 *
 * Example message: state `omega` has no equation `omega' = …`
 */
import { defineDiagnostic } from './define';

export const missingEquation = defineDiagnostic({
  code: 'model/missing-equation',
  severity: 'error',
  fires: 'A declared state has no `x\' = …` equation, or a declared output has no `output y = …` equation.',
  example: 'state `omega` has no equation `omega\' = …`',
  message: (detail: string): string =>
    detail,
});
