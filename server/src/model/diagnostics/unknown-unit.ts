/**
 * `model/unknown-unit` (error): A number carries a unit suffix Loopwright does not know.
 *
 * Example message: unknown unit `kg`; units are s ms us ns min Hz kHz %
 */
import { defineDiagnostic, code } from './define';

export const unknownUnit = defineDiagnostic({
  code: 'model/unknown-unit',
  severity: 'error',
  fires: 'A number carries a unit suffix Loopwright does not know.',
  example: 'unknown unit `kg`; units are s ms us ns min Hz kHz %',
  message: (unit: string, suggestion?: string): string =>
    `unknown unit ${code(unit)}` + (suggestion ? `; did you mean ${code(suggestion)}?` : '; units are s ms us ns min Hz kHz %'),
});
