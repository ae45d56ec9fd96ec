// Matrix sign function by the Newton iteration Z ← (c·Z + (c·Z)⁻¹)/2 with determinant scaling
// c = |det Z|^(−1/n) (Roberts, "Linear model reduction and solution of the algebraic Riccati
// equation by use of the sign function", Int. J. Control 32(4), 1980 — report of 1971; Byers 1987;
// Higham, Functions of Matrices, 2008, section 5.5). Bounded iteration; the result says whether it
// converged. The iteration is undefined when A has eigenvalues on (or numerically near) the
// imaginary axis: it then fails to converge, which is reported rather than thrown.

import { type Dense, denseFromRows, denseToRows, identityDense, norm1Dense, zerosDense } from './dense';
import { luFactor, luSolveDense } from './lu';
import type { Rows } from './types';
import { countIterations, noteNonConvergence } from './iterationCount';

export interface MatrixSignResult {
  S: Rows;
  converged: boolean;
  iterations: number;
}

/** At most this many Newton steps: with scaling, convergence takes about 10 even for ‖A‖‖A⁻¹‖ ≈ 1e12. */
const MAX_ITERATIONS = 100;

export function matrixSignDense(A: Dense): { S: Dense; converged: boolean; iterations: number } {
  const n = A.rows;
  let z = A.data.slice();
  if (n === 0) return { S: zerosDense(0, 0), converged: true, iterations: 0 };
  // Stop when the relative change falls below √(n)·n·ε·…: once in the quadratic regime the next
  // step would square an already negligible error (Higham 2008, section 5.5 stopping test).
  const tolerance = n * Math.sqrt(n) * Number.EPSILON * 10;
  let scalingActive = true;
  for (let iteration = 1; iteration <= MAX_ITERATIONS; iteration++) {
    countIterations();
    const factor = luFactor({ rows: n, cols: n, data: z });
    if (factor.hasZeroPivot) break;
    let logDet = 0;
    for (let i = 0; i < n; i++) logDet += Math.log(Math.abs(factor.lu.data[i * n + i]));
    const c = scalingActive ? Math.exp(-logDet / n) : 1;
    if (!Number.isFinite(c) || c === 0) break;
    const inverse = luSolveDense(factor, identityDense(n)).data;
    const next = new Float64Array(n * n);
    for (let i = 0; i < n * n; i++) next[i] = 0.5 * (c * z[i] + inverse[i] / c);
    let change = 0;
    for (let i = 0; i < n * n; i++) if (!Number.isFinite(next[i])) return failed(n, iteration);
    const difference = new Float64Array(n * n);
    for (let i = 0; i < n * n; i++) difference[i] = next[i] - z[i];
    change = norm1Dense({ rows: n, cols: n, data: difference }) / norm1Dense({ rows: n, cols: n, data: next });
    z = next;
    // Scaling only helps far from convergence; near it, it would spoil quadratic convergence.
    if (change < 1e-2) scalingActive = false;
    if (change <= tolerance) return { S: { rows: n, cols: n, data: z }, converged: true, iterations: iteration };
  }
  noteNonConvergence('matrix-sign');
  return failed(n, MAX_ITERATIONS);
}

function failed(n: number, iterations: number): { S: Dense; converged: boolean; iterations: number } {
  const S = zerosDense(n, n);
  S.data.fill(NaN);
  return { S, converged: false, iterations };
}

/** sign(A) for A without eigenvalues on the imaginary axis. */
export function matrixSign(A: Rows): MatrixSignResult {
  const { S, converged, iterations } = matrixSignDense(denseFromRows(A));
  return { S: denseToRows(S), converged, iterations };
}
