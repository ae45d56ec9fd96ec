/**
 * `model/no-design` (error): A controller has neither `poles`, `lqr` nor `spec`, so there is nothing to compute the gain from.
 *
 * Example message: controller `lift` has no design: add `poles = […]`, `lqr Q = …, R = …` or `spec settling <= …`
 */
import { defineDiagnostic, code } from './define';

export const noDesign = defineDiagnostic({
  code: 'model/no-design',
  severity: 'error',
  fires: 'A controller has neither `poles`, `lqr` nor `spec`, so there is nothing to compute the gain from.',
  example: 'controller `lift` has no design: add `poles = […]`, `lqr Q = …, R = …` or `spec settling <= …`',
  message: (name: string): string =>
    `controller ${code(name)} has no design: add ${code('poles = […]')}, ${code('lqr Q = …, R = …')} or ${code('spec settling <= …')}`,
});
