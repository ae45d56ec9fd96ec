/**
 * `model/ambiguous-power` (warning): In a transfer function, a number with the unit `s` is raised to a power (`2 s^2`): it reads as (2 s)^2, which is rarely what was meant.
 *
 * Example message: `2 s^2` reads as (2 s)^2 = 4 s^2; write `2*s^2` for 2·s²
 */
import { defineDiagnostic, code } from './define';

export const ambiguousPower = defineDiagnostic({
  code: 'model/ambiguous-power',
  severity: 'warning',
  fires: 'In a transfer function, a number with the unit `s` is raised to a power (`2 s^2`): it reads as (2 s)^2, which is rarely what was meant.',
  example: '`2 s^2` reads as (2 s)^2 = 4 s^2; write `2*s^2` for 2·s²',
  message: (text: string, squared: string, intended: string): string =>
    `${code(text)} reads as ${squared}; write ${code(intended)} if that is what you meant`,
});
