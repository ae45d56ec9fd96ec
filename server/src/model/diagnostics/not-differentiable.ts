/**
 * `model/not-differentiable` (warning): A function is used at a point where it has no derivative (`abs` at 0 is a warning, the derivative is taken as 0; `sqrt` at 0 and other infinite slopes are errors).
 *
 * Example message: `abs` is not differentiable at 0 here; its derivative is taken as 0
 */
import { defineDiagnostic } from './define';

export const notDifferentiable = defineDiagnostic({
  code: 'model/not-differentiable',
  severity: 'warning',
  fires: 'A function is used at a point where it has no derivative (`abs` at 0 is a warning, the derivative is taken as 0; `sqrt` at 0 and other infinite slopes are errors).',
  example: '`abs` is not differentiable at 0 here; its derivative is taken as 0',
  message: (detail: string): string =>
    detail,
});
