// Invariant zeros of the plant: values of s where the Rosenbrock pencil [A − sI, B; C, D] drops
// below its normal rank — including zeros cancelled in every transfer function by uncontrollable
// or unobservable modes. Computed by the numeric layer (Emami-Naeini & Van Dooren 1982 reduction
// to a square pencil, then QZ) for any numbers of inputs and outputs. Whether a zero sits at the
// DC point is NOT decided here (setpoint.ts decides tracking by rank at s = 0 / z = 1).
import type { Complex, Rows } from '../numeric/types';
import { invariantZeros } from '../numeric';
import { sortEigenvalues } from './controlLinearAlgebra';

export interface PlantZerosResult {
  /** False when the reduction could not settle the rank decisions (ambiguous data). */
  supported: boolean;
  zeros: Complex[];
  /** Normal rank of the transfer matrix D + C(sI − A)⁻¹B (−1 when unsupported). */
  normalRank: number;
}

export function plantInvariantZeros(A: Rows, B: Rows, C: Rows, D: Rows): PlantZerosResult {
  const result = invariantZeros(A, B, C, D);
  return { supported: result.normalRank >= 0, zeros: sortEigenvalues(result.zeros), normalRank: result.normalRank };
}
