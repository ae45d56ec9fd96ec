/**
 * `control/integral-infeasible` (error): integral action cannot be designed: more integrated outputs
 * than inputs, (A, B) not stabilisable, or an invariant zero at the DC point for the integrated
 * outputs (the augmented pair then has an uncontrollable integrator).
 *
 * Example message: integral action is impossible: 2 integrated outputs but only 1 input
 */
import type { Complex, Diagnostic, Range, RelatedInformation } from '../../model/types';
import { defineDiagnostic } from '../../model/diagnostics/define';
import { formatMode, quote } from './control-values';

export type IntegralInfeasibleReason = 'not-stabilisable' | 'more-outputs-than-inputs' | 'zero-at-dc' | 'no-outputs';

export const integralInfeasibleKind = defineDiagnostic({
  code: 'control/integral-infeasible',
  severity: 'error',
  fires: 'Integral action on the chosen outputs is impossible (too many outputs, not stabilisable, zero at DC).',
  example: 'integral action is impossible: 2 integrated outputs but only 1 input',
  message: (reason: IntegralInfeasibleReason, outputs: string[], inputs: string[], mode: Complex | undefined, domain: 'continuous' | 'discrete'): string => {
    switch (reason) {
      case 'more-outputs-than-inputs':
        return `integral action is impossible: ${outputs.length} integrated outputs but only ${inputs.length} input${inputs.length === 1 ? '' : 's'}`;
      case 'not-stabilisable':
        return `integral action is impossible: mode ${mode ? formatMode(mode, domain) : ''} is uncontrollable and not stable`;
      case 'zero-at-dc':
        return `integral action is impossible: the plant has an invariant zero at ${domain === 'discrete' ? 'z = 1' : 's = 0'} for ${outputs.map(quote).join(', ')} with ${inputs.map(quote).join(', ')}, so the integrators cannot be driven to rest`;
      case 'no-outputs':
        return 'integral action needs at least one output to integrate';
    }
  },
});

export function integralInfeasibleDiagnostic(
  range: Range,
  details: { reason: IntegralInfeasibleReason; outputs: string[]; inputs: string[]; mode?: Complex; domain?: 'continuous' | 'discrete' },
  related?: RelatedInformation[],
): Diagnostic {
  return integralInfeasibleKind.create(range, [details.reason, details.outputs, details.inputs, details.mode, details.domain ?? 'continuous'], {
    related,
    data: { reason: details.reason },
  });
}
