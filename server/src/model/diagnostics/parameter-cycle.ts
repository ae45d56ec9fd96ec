/**
 * `model/parameter-cycle` (error): Parameters depend on each other in a circle, so none of them has a value; reported at every member with the whole cycle.
 *
 * Example message: parameters depend on each other in a cycle: a → b → a
 */
import { defineDiagnostic } from './define';

export const parameterCycle = defineDiagnostic({
  code: 'model/parameter-cycle',
  severity: 'error',
  fires: 'Parameters depend on each other in a circle, so none of them has a value; reported at every member with the whole cycle.',
  example: 'parameters depend on each other in a cycle: a → b → a',
  message: (cycle: string[]): string =>
    `parameters depend on each other in a cycle: ${cycle.join(' → ')}`,
});
