/**
 * `model/unknown-plant` (error): A controller's `for` names a plant that is not declared in the document.
 *
 * Example message: no plant named `hoyst`; did you mean `hoist`?
 */
import { defineDiagnostic, code } from './define';

export const unknownPlant = defineDiagnostic({
  code: 'model/unknown-plant',
  severity: 'error',
  fires: 'A controller\'s `for` names a plant that is not declared in the document.',
  example: 'no plant named `hoyst`; did you mean `hoist`?',
  message: (name: string, suggestion?: string): string =>
    `no plant named ${code(name)}` + (suggestion ? `; did you mean ${code(suggestion)}?` : ''),
});
