/**
 * `control/zero-dc-gain` (error): the Rosenbrock matrix [A B; C_t D_t] at s = 0 (discrete
 * [A − I, B; C_t D_t]) lacks full row rank — an invariant zero at the DC point, possibly cancelled
 * in the transfer function. State feedback cannot move zeros, so no prescaler and no integral
 * action can hold a constant set-point on the tracked outputs.
 *
 * Example message: the plant has an invariant zero at s = 0 (possibly cancelled in the transfer function): state feedback cannot move zeros, so neither a prescaler nor integral action can hold a constant set-point on `speed` with `force`
 */
import type { Diagnostic, Range, RelatedInformation } from '../../model/types';
import { defineDiagnostic } from '../../model/diagnostics/define';
import { formatNumber, quote } from './control-values';

function combinationText(outputs: string[], weights: number[]): string {
  return weights
    .map((w, i) => ({ w, name: outputs[i] }))
    .filter(({ w }) => Math.abs(w) > 1e-3 * Math.max(...weights.map(Math.abs)))
    .map(({ w, name }, k) => `${k === 0 ? (w < 0 ? '−' : '') : w < 0 ? ' − ' : ' + '}${formatNumber(Math.abs(w))}·${quote(name)}`)
    .join('');
}

export const zeroDcGainKind = defineDiagnostic({
  code: 'control/zero-dc-gain',
  severity: 'error',
  fires: 'The plant has an invariant zero at s = 0 (z = 1) for the tracked outputs, decided by the rank of [A B; C D] at DC.',
  example:
    'the plant has an invariant zero at s = 0 (possibly cancelled in the transfer function): state feedback cannot move zeros, so neither a prescaler nor integral action can hold a constant set-point on `speed` with `force`',
  message: (outputs: string[], inputs: string[], domain: 'continuous' | 'discrete', combination?: number[]): string => {
    const point = domain === 'discrete' ? 'z = 1' : 's = 0';
    const target =
      outputs.length > 1 && combination
        ? `the combination ${combinationText(outputs, combination)} of ${outputs.map(quote).join(', ')}`
        : outputs.map(quote).join(', ');
    return (
      `the plant has an invariant zero at ${point} (possibly cancelled in the transfer function): ` +
      `state feedback cannot move zeros, so neither a prescaler nor integral action can hold a constant set-point on ${target} with ${inputs.map(quote).join(', ')}`
    );
  },
});

export function zeroDcGainDiagnostic(
  range: Range,
  details: { outputs: string[]; inputs: string[]; domain?: 'continuous' | 'discrete'; singularCombination?: number[] },
  related?: RelatedInformation[],
): Diagnostic {
  return zeroDcGainKind.create(range, [details.outputs, details.inputs, details.domain ?? 'continuous', details.singularCombination], {
    related,
    data: details.singularCombination ? { singularCombination: details.singularCombination } : undefined,
  });
}
