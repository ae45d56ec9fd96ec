/**
 * `model/unpaired-pole` (error): A complex pole has no conjugate partner (within a tolerance scaled to its magnitude); a real system's poles come in conjugate pairs.
 *
 * Example message: pole -4+3i has no conjugate partner -4-3i; complex poles of a real system come in pairs
 */
import { defineDiagnostic } from './define';

export const unpairedPole = defineDiagnostic({
  code: 'model/unpaired-pole',
  severity: 'error',
  fires: 'A complex pole has no conjugate partner (within a tolerance scaled to its magnitude); a real system\'s poles come in conjugate pairs.',
  example: 'pole -4+3i has no conjugate partner -4-3i; complex poles of a real system come in pairs',
  message: (pole: string, partner: string): string =>
    `pole ${pole} has no conjugate partner ${partner}; complex poles of a real system come in pairs`,
});
