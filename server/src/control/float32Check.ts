// Would the design survive 32-bit arithmetic on the target? The closed-loop matrix is formed
// twice: in double precision, and with every matrix entry and gain rounded to IEEE single
// precision (Math.fround) and every product and sum of A − B·K rounded as a single-precision
// implementation would compute them. Eigenvalues of both are compared pole by pole (nearest
// match). A pole is reported when its relative move |Δλ|/max(|λ|, ‖A‖·ε) exceeds √ε₃₂ (≈ 3.5e-4,
// ε₃₂ = 2⁻²³): a well-conditioned pole moves by about ε₃₂, so a move of √ε₃₂ means the pole
// sensitivity is ~1/√ε₃₂ and the design is fragile in single precision. A pole that leaves the
// stability region (|z| ≥ 1, Re s ≥ 0) is always reported.
import type { Complex, Rows } from '../numeric/types';
import { eigenvalues } from '../numeric';

export const FLOAT32_EPSILON = 2 ** -23;

export interface Float32PoleMove {
  double: Complex;
  single: Complex;
  relativeMove: number;
  leftStabilityRegion: boolean;
}

export interface Float32Check {
  /** True when no pole moved beyond the bound and none left the stability region. */
  ok: boolean;
  bound: number;
  largestRelativeMove: number;
  /** Poles that moved beyond the bound or became unstable. */
  flagged: Float32PoleMove[];
  doublePoles: Complex[];
  singlePoles: Complex[];
}

function closedLoopDouble(A: Rows, B: Rows, K: Rows): Rows {
  const m = K.length;
  return A.map((row, i) =>
    row.map((value, j) => {
      let sum = 0;
      for (let k = 0; k < m; k++) sum += B[i][k] * K[k][j];
      return value - sum;
    }),
  );
}

function closedLoopSingle(A: Rows, B: Rows, K: Rows): Rows {
  const f = Math.fround;
  const m = K.length;
  return A.map((row, i) =>
    row.map((value, j) => {
      let sum = 0;
      for (let k = 0; k < m; k++) sum = f(sum + f(f(B[i][k]) * f(K[k][j])));
      return f(f(value) - sum);
    }),
  );
}

function stable(pole: Complex, domain: 'continuous' | 'discrete'): boolean {
  return domain === 'continuous' ? pole.re < 0 : Math.hypot(pole.re, pole.im) < 1;
}

/** Greedy nearest matching of `moved` to `reference` (each used once). */
function matchNearest(reference: Complex[], moved: Complex[]): number[] {
  const used = new Array<boolean>(moved.length).fill(false);
  return reference.map((pole) => {
    let best = -1;
    let bestDistance = Infinity;
    moved.forEach((candidate, index) => {
      if (used[index]) return;
      const distance = Math.hypot(candidate.re - pole.re, candidate.im - pole.im);
      if (distance < bestDistance) {
        bestDistance = distance;
        best = index;
      }
    });
    if (best >= 0) used[best] = true;
    return best;
  });
}

/**
 * Checks eig(A − B K) (state feedback) in single precision. For an observer pass (Aᵀ, Cᵀ, Lᵀ);
 * for a composite loop pass the composite matrix as A with empty B and K.
 */
export function float32ClosedLoopCheck(A: Rows, B: Rows, K: Rows, domain: 'continuous' | 'discrete'): Float32Check {
  const n = A.length;
  const doubleLoop = closedLoopDouble(A, B, K);
  const singleLoop = closedLoopSingle(A, B, K);
  const doublePoles = eigenvalues(doubleLoop);
  const singlePoles = eigenvalues(singleLoop);
  let normA = 0;
  for (const row of doubleLoop) normA = Math.max(normA, row.reduce((sum, value) => sum + Math.abs(value), 0));
  const floor = Math.max(normA, Number.MIN_VALUE) * Number.EPSILON * Math.max(1, n);
  const bound = Math.sqrt(FLOAT32_EPSILON);
  const match = matchNearest(doublePoles, singlePoles);
  const flagged: Float32PoleMove[] = [];
  let largestRelativeMove = 0;
  doublePoles.forEach((pole, index) => {
    const single = singlePoles[match[index]] ?? { re: NaN, im: NaN };
    const relativeMove = Math.hypot(single.re - pole.re, single.im - pole.im) / Math.max(Math.hypot(pole.re, pole.im), floor);
    largestRelativeMove = Math.max(largestRelativeMove, Number.isFinite(relativeMove) ? relativeMove : Infinity);
    const leftStabilityRegion = stable(pole, domain) && !stable(single, domain);
    if (!(relativeMove <= bound) || leftStabilityRegion) flagged.push({ double: pole, single, relativeMove, leftStabilityRegion });
  });
  return { ok: flagged.length === 0, bound, largestRelativeMove, flagged, doublePoles, singlePoles };
}

/** The observer error matrix A − LC in single precision, through the transpose Aᵀ − Cᵀ Lᵀ. */
export function float32ObserverCheck(A: Rows, C: Rows, L: Rows, domain: 'continuous' | 'discrete'): Float32Check {
  const transpose = (M: Rows): Rows => (M.length === 0 ? [] : M[0].map((_, j) => M.map((row) => row[j])));
  return float32ClosedLoopCheck(transpose(A), transpose(C), transpose(L), domain);
}
