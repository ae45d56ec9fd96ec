/**
 * `control/pathological-sampling` (warning): Two plant eigenvalues differ by a multiple of j2π/T, so the sampled model loses controllability and observability of that pair.
 *
 * Example message: sampling at T = 0.314 s folds the modes 0 ± 10j onto the same point: the sampled plant loses controllability; change T
 */
import { defineDiagnostic } from '../../model/diagnostics/define';
import type { Complex } from '../../model/types';
import { complexText, fmt } from './spec-number-format';

export const samplingPathological = defineDiagnostic({
  code: 'control/pathological-sampling',
  severity: 'warning',
  fires: 'Two plant eigenvalues differ by a multiple of j2π/T, so the sampled model loses controllability and observability of that pair.',
  example: 'sampling at T = 0.314 s folds the modes 0 ± 10j onto the same point: the sampled plant loses controllability; change T',
  message: (period: number, first: Complex, second: Complex): string =>
    `sampling at T = ${fmt(period)} s folds the modes ${complexText(first)} and ${complexText(second)} onto the same point: the sampled plant loses controllability; change T`,
});
