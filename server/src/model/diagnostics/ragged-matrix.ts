/**
 * `model/ragged-matrix` (error): The rows of a matrix literal have different lengths (when no declaration says which is right); the range is the odd row.
 *
 * Example message: row 2 of A has 3 entries but row 1 has 2
 */
import { defineDiagnostic } from './define';

export const raggedMatrix = defineDiagnostic({
  code: 'model/ragged-matrix',
  severity: 'error',
  fires: 'The rows of a matrix literal have different lengths (when no declaration says which is right); the range is the odd row.',
  example: 'row 2 of A has 3 entries but row 1 has 2',
  message: (detail: string): string =>
    detail,
});
