/**
 * `model/duplicate-definition` (error): The same matrix, state equation, output equation, `around`, `transfer` or controller line is given twice; the first one is used.
 *
 * Example message: `A` is already defined
 */
import { defineDiagnostic } from './define';

export const duplicateDefinition = defineDiagnostic({
  code: 'model/duplicate-definition',
  severity: 'error',
  fires: 'The same matrix, state equation, output equation, `around`, `transfer` or controller line is given twice; the first one is used.',
  example: '`A` is already defined',
  message: (what: string): string =>
    `${what} is already defined`,
});
