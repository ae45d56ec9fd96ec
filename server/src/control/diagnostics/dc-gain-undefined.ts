/**
 * `control/dc-gain-undefined` (error): A − BK is singular (discrete: I − (A − BK)), i.e. the closed
 * loop keeps a pole at s = 0 / z = 1 — typically an uncontrollable integrator. The DC gain is then
 * undefined (not zero): the output drifts or holds whatever the initial state left.
 *
 * Example message: the closed-loop DC gain is undefined: the loop keeps a pole at s = 0 (an uncontrollable integrator), so the output does not settle to a value set by the reference
 */
import type { Diagnostic, Range, RelatedInformation } from '../../model/types';
import { defineDiagnostic } from '../../model/diagnostics/define';

export const dcGainUndefinedKind = defineDiagnostic({
  code: 'control/dc-gain-undefined',
  severity: 'error',
  fires: 'The closed loop A − BK has a pole exactly at the DC point (singular within a scaled tolerance), so no DC gain exists.',
  example:
    'the closed-loop DC gain is undefined: the loop keeps a pole at s = 0 (an uncontrollable integrator), so the output does not settle to a value set by the reference',
  message: (domain: 'continuous' | 'discrete'): string =>
    `the closed-loop DC gain is undefined: the loop keeps a pole at ${domain === 'discrete' ? 'z = 1' : 's = 0'} (an uncontrollable integrator), so the output does not settle to a value set by the reference`,
});

export function dcGainUndefinedDiagnostic(range: Range, details: { domain?: 'continuous' | 'discrete' } = {}, related?: RelatedInformation[]): Diagnostic {
  return dcGainUndefinedKind.create(range, [details.domain ?? 'continuous'], { related });
}
