/**
 * `control/defective-closed-loop` (warning): a pole is requested more times than there are
 * independent inputs (rank B), so the closed loop must contain a Jordan block: its poles are then
 * very sensitive (a k-fold pole moves like ε^(1/k)).
 *
 * Example message: pole s = −2 is requested 3 times with 1 independent input: the closed loop is defective (a Jordan block), so this pole is sensitive; spread the poles slightly
 */
import type { Complex, Diagnostic, Range, RelatedInformation } from '../../model/types';
import { defineDiagnostic } from '../../model/diagnostics/define';
import { formatMode } from './control-values';

export const defectiveClosedLoopKind = defineDiagnostic({
  code: 'control/defective-closed-loop',
  severity: 'warning',
  fires: 'A requested pole has multiplicity greater than rank B, which forces a defective (Jordan-block) closed loop.',
  example:
    'pole s = −2 is requested 3 times with 1 independent input: the closed loop is defective (a Jordan block), so this pole is sensitive; spread the poles slightly',
  message: (pole: Complex, multiplicity: number, inputRank: number, domain: 'continuous' | 'discrete'): string =>
    `pole ${formatMode(pole, domain)} is requested ${multiplicity} times with ${inputRank} independent input${inputRank === 1 ? '' : 's'}: the closed loop is defective (a Jordan block), so this pole is sensitive; spread the poles slightly`,
});

export function defectiveClosedLoopDiagnostic(
  range: Range,
  details: { pole: Complex; multiplicity: number; inputRank: number; domain?: 'continuous' | 'discrete' },
  related?: RelatedInformation[],
): Diagnostic {
  return defectiveClosedLoopKind.create(range, [details.pole, details.multiplicity, details.inputRank, details.domain ?? 'continuous'], { related });
}
