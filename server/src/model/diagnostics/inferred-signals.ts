/**
 * `model/inferred-signals` (info): Signal names were not declared and Loopwright named them (x1…, u1…, y1…, or `u`/`y` for a transfer function).
 *
 * Example message: no `inputs` declared: the input is called `u`
 */
import { defineDiagnostic } from './define';

export const inferredSignals = defineDiagnostic({
  code: 'model/inferred-signals',
  severity: 'info',
  fires: 'Signal names were not declared and Loopwright named them (x1…, u1…, y1…, or `u`/`y` for a transfer function).',
  example: 'no `inputs` declared: the input is called `u`',
  message: (detail: string): string =>
    detail,
});
