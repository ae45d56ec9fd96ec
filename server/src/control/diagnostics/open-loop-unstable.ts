/**
 * `control/open-loop-unstable` (info): the plant without feedback has modes that are not stable.
 *
 * Example message: the plant is unstable without feedback: mode s = 1.5 grows with time constant 0.667 s
 */
import type { Complex, Diagnostic, Range, RelatedInformation } from '../../model/types';
import { defineDiagnostic } from '../../model/diagnostics/define';
import { formatMode, formatNumber } from './control-values';

export const openLoopUnstableKind = defineDiagnostic({
  code: 'control/open-loop-unstable',
  severity: 'info',
  fires: 'Some open-loop mode is unstable or marginal (with the scaled stability tolerance).',
  example: 'the plant is unstable without feedback: mode s = 1.5 grows with time constant 0.667 s',
  message: (mode: Complex, marginal: boolean, timeConstant: number | null, domain: 'continuous' | 'discrete'): string =>
    marginal
      ? `the plant is marginally stable without feedback: mode ${formatMode(mode, domain)} neither decays nor grows`
      : `the plant is unstable without feedback: mode ${formatMode(mode, domain)} grows` + (timeConstant !== null ? ` with time constant ${formatNumber(timeConstant)} s` : ''),
});

export function openLoopUnstableDiagnostic(
  range: Range,
  details: { mode: Complex; marginal: boolean; timeConstant: number | null; domain?: 'continuous' | 'discrete' },
  related?: RelatedInformation[],
): Diagnostic {
  return openLoopUnstableKind.create(range, [details.mode, details.marginal, details.timeConstant, details.domain ?? 'continuous'], { related });
}
