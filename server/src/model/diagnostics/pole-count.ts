/**
 * `model/pole-count` (error): The number of requested poles differs from the number needed (plant states, plus integrators when `integral` has no `pole`; plant states for observer poles; integrators for `integral … pole`).
 *
 * Example message: 3 poles given but 2 are needed: the plant has 2 states (theta, omega)
 */
import { defineDiagnostic } from './define';

export const poleCount = defineDiagnostic({
  code: 'model/pole-count',
  severity: 'error',
  fires: 'The number of requested poles differs from the number needed (plant states, plus integrators when `integral` has no `pole`; plant states for observer poles; integrators for `integral … pole`).',
  example: '3 poles given but 2 are needed: the plant has 2 states (theta, omega)',
  message: (found: number, expected: number, why: string): string =>
    `${found} ${found === 1 ? 'pole' : 'poles'} given but ${expected} ${expected === 1 ? 'is' : 'are'} needed: ${why}`,
});
