/**
 * `model/conflicting-design` (error): A controller gives both `poles` and `lqr`; only one can decide the gain.
 *
 * Example message: `poles` and `lqr` both decide the gain; keep one
 */
import { defineDiagnostic } from './define';

export const conflictingDesign = defineDiagnostic({
  code: 'model/conflicting-design',
  severity: 'error',
  fires: 'A controller gives both `poles` and `lqr`; only one can decide the gain.',
  example: '`poles` and `lqr` both decide the gain; keep one',
  message: (): string =>
    '`poles` and `lqr` both decide the gain; keep one',
});
