// Controllability and observability.
// The decision (controllable subspace dimension, which modes cannot be moved) comes from the
// orthogonal controllability staircase (Van Dooren 1981; Varga 1981): successive SVD rank
// decisions on orthogonally transformed blocks, never the powers A^k·B of the controllability
// matrix. The margin is the PBH measure σ_min([A − λI, B]) / ‖[A B]‖_F at each eigenvalue λ of A
// (Paige 1981): it is an upper bound on the distance to uncontrollability of Eising (1984), which
// minimises the same quantity over all complex s.
import type { Complex, Rows } from '../numeric/types';
import {
  EPS,
  eigenvaluesOf,
  frobenius,
  singularValuesOf,
  thinSvd,
  transposeRows,
  zerosRows,
  identityRows,
} from './controlLinearAlgebra';
import { balance } from '../numeric';

export type Domain = 'continuous' | 'discrete';

export interface StaircaseForm {
  /** Orthogonal T: the first `controllableDimension` columns span the controllable subspace. */
  T: Rows;
  /** Tᵀ·A·T = [[A11, A12], [0, A22]], A22 the uncontrollable part. */
  Abar: Rows;
  /** Tᵀ·B = [B1; 0]. */
  Bbar: Rows;
  controllableDimension: number;
  /** Row counts of the staircase blocks (controllability indices read off these). */
  blockSizes: number[];
  rankTolerance: number;
}

/**
 * Rank tolerance for the staircase and for rank tests on [A B]: 10·n·(n + m)·ε·‖[A B]‖_F (the
 * orthogonal steps are backward stable; the factor absorbs the growth of rounding along weakly
 * coupled chains seen on rotated block-triangular SciPy fixtures).
 */
export function structureTolerance(A: Rows, B: Rows): number {
  const n = A.length;
  const m = B[0]?.length ?? 0;
  const scale = Math.hypot(frobenius(A), frobenius(B));
  return 10 * Math.max(1, n) * Math.max(1, n + m) * EPS * scale;
}

export function controllabilityStaircase(A: Rows, B: Rows, tolerance = structureTolerance(A, B)): StaircaseForm {
  const n = A.length;
  const m = n === 0 ? 0 : (B[0]?.length ?? 0);
  // Flat row-major working copies; every step applies Householder reflectors to the trailing rows
  // and columns only, so the whole reduction costs O(n³) rather than O(n⁴).
  const Ab = new Float64Array(n * n);
  const Bb = new Float64Array(n * m);
  for (let i = 0; i < n; i++) {
    for (let j = 0; j < n; j++) Ab[i * n + j] = A[i][j];
    for (let j = 0; j < m; j++) Bb[i * m + j] = B[i][j];
  }
  // The reflectors in order: T = H₁·H₂⋯ is formed only when a caller reads it (the plant report
  // never does), by the same products the reduction would have applied to it step by step.
  const reflectors: { v: Float64Array; beta: number; start: number }[] = [];
  const columnSums = new Float64Array(n);
  const applyReflector = (v: Float64Array, beta: number, start: number) => {
    // Left on Ā and B̄ (rows start…n−1), right on Ā and T (columns start…n−1). The left product
    // runs along rows (w = vᵀĀ, then Ā −= β·v·w), which row-major storage reads contiguously.
    columnSums.fill(0);
    for (let i = start; i < n; i++) {
      const vi = v[i - start];
      if (vi === 0) continue;
      for (let j = 0, k = i * n; j < n; j++, k++) columnSums[j] += vi * Ab[k];
    }
    for (let i = start; i < n; i++) {
      const f = beta * v[i - start];
      if (f === 0) continue;
      for (let j = 0, k = i * n; j < n; j++, k++) Ab[k] -= f * columnSums[j];
    }
    for (let j = 0; j < m; j++) {
      let dot = 0;
      for (let i = start; i < n; i++) dot += v[i - start] * Bb[i * m + j];
      const f = beta * dot;
      if (f !== 0) for (let i = start; i < n; i++) Bb[i * m + j] -= f * v[i - start];
    }
    for (let i = 0; i < n; i++) {
      let dotA = 0;
      for (let j = start; j < n; j++) dotA += Ab[i * n + j] * v[j - start];
      const fA = beta * dotA;
      if (fA !== 0) for (let j = start; j < n; j++) Ab[i * n + j] -= fA * v[j - start];
    }
    reflectors.push({ v, beta, start });
  };
  const blockSizes: number[] = [];
  let offset = 0;
  let previousOffset = 0;
  let first = true;
  while (offset < n) {
    const rows = n - offset;
    const cols = first ? m : offset - previousOffset;
    if (cols === 0) break;
    const block: Rows = [];
    for (let i = offset; i < n; i++) {
      const row = new Array<number>(cols);
      for (let j = 0; j < cols; j++) row[j] = first ? Bb[i * m + j] : Ab[i * n + previousOffset + j];
      block.push(row);
    }
    const { U, s } = thinSvd(block);
    const rank = s.filter((value) => value > tolerance).length;
    if (rank === 0) break;
    // Householder QR of U_r: Q = H₁…H_r has range(U_r) as its first r columns.
    const work = new Float64Array(rows * rank);
    for (let i = 0; i < rows; i++) for (let j = 0; j < rank; j++) work[i * rank + j] = U[i][j];
    for (let j = 0; j < rank; j++) {
      const length = rows - j;
      const v = new Float64Array(length);
      let normSq = 0;
      for (let i = 0; i < length; i++) {
        v[i] = work[(j + i) * rank + j];
        normSq += v[i] * v[i];
      }
      const norm = Math.sqrt(normSq);
      if (norm === 0) continue;
      const alpha = v[0] >= 0 ? -norm : norm;
      const x0 = v[0];
      v[0] -= alpha;
      const vNormSq = normSq - 2 * alpha * x0 + alpha * alpha;
      if (vNormSq === 0) continue;
      const beta = 2 / vNormSq;
      for (let c = j; c < rank; c++) {
        let dot = 0;
        for (let i = 0; i < length; i++) dot += v[i] * work[(j + i) * rank + c];
        const f = beta * dot;
        for (let i = 0; i < length; i++) work[(j + i) * rank + c] -= f * v[i];
      }
      applyReflector(v, beta, offset + j);
    }
    // Clean the entries the rank decision declared zero, so the block structure is exact.
    for (let i = offset + rank; i < n; i++) {
      if (first) for (let j = 0; j < m; j++) Bb[i * m + j] = 0;
      else for (let j = previousOffset; j < offset; j++) Ab[i * n + j] = 0;
    }
    blockSizes.push(rank);
    previousOffset = offset;
    offset += rank;
    first = false;
  }
  // Below the controllable part everything in the first `offset` columns is exactly zero.
  for (let i = offset; i < n; i++) for (let j = 0; j < offset; j++) Ab[i * n + j] = 0;
  const toRows = (data: Float64Array, cols: number): Rows =>
    Array.from({ length: n }, (_, i) => Array.from(data.subarray(i * cols, (i + 1) * cols)));
  let transform: Rows | null = null;
  const formTransform = (): Rows => {
    const T = new Float64Array(n * n);
    for (let i = 0; i < n; i++) T[i * n + i] = 1;
    for (const { v, beta, start } of reflectors) {
      for (let i = 0; i < n; i++) {
        let dot = 0;
        for (let j = start; j < n; j++) dot += T[i * n + j] * v[j - start];
        const f = beta * dot;
        if (f !== 0) for (let j = start; j < n; j++) T[i * n + j] -= f * v[j - start];
      }
    }
    return toRows(T, n);
  };
  return {
    get T(): Rows {
      transform ??= formTransform();
      return transform;
    },
    Abar: toRows(Ab, n),
    Bbar: toRows(Bb, m),
    controllableDimension: offset,
    blockSizes,
    rankTolerance: tolerance,
  };
}

export interface UncontrollableMode {
  value: Complex;
  /** Stable in the domain's sense (strictly inside the stability region, with a scaled margin). */
  stable: boolean;
  /** σ_min([A − λI, B]) / ‖[A B]‖_F at this mode (≈ 0 for a truly uncontrollable mode). */
  margin: number;
}

export interface ControllabilityResult {
  controllable: boolean;
  controllableDimension: number;
  uncontrollableModes: UncontrollableMode[];
  stabilisable: boolean;
  /**
   * min over the eigenvalues λ of A of σ_min([A − λI, B]) / ‖[A B]‖_F (PBH measure, Paige 1981):
   * an upper bound on Eising's (1984) relative distance to the nearest uncontrollable pair.
   * `null` when not computed.
   */
  margin: number | null;
  /** Eigenvalue of A where the margin is attained. */
  marginMode: Complex | null;
  rankTolerance: number;
}

/** Stability of one eigenvalue with a tolerance `tolerance` (absolute, on Re s or on |z| − 1). */
export function classifyEigenvalue(value: Complex, domain: Domain, tolerance: number): 'stable' | 'marginal' | 'unstable' {
  const distance = domain === 'continuous' ? value.re : Math.hypot(value.re, value.im) - 1;
  if (distance < -tolerance) return 'stable';
  if (distance > tolerance) return 'unstable';
  return 'marginal';
}

/** Eigenvalue tolerance n·ε·‖A‖_F·c (c = 10), floored for the discrete domain at n·ε·10 (|z| ≈ 1 scale). */
export function eigenvalueTolerance(A: Rows, domain: Domain): number {
  const n = Math.max(1, A.length);
  const scale = domain === 'continuous' ? frobenius(A) : Math.max(frobenius(A), 1);
  return 10 * n * EPS * scale;
}

/** σ_min([A − λI, B]) via the real 2n × 2(n+m) representation for complex λ. */
export function pbhSmallestSingularValue(A: Rows, B: Rows, lambda: Complex): number {
  const n = A.length;
  const m = B[0]?.length ?? 0;
  const real = Math.abs(lambda.im) === 0;
  if (real) {
    const M = A.map((row, i) => [...row.map((value, j) => (i === j ? value - lambda.re : value)), ...B[i]]);
    const s = singularValuesOf(M);
    return s.length < n ? 0 : s[n - 1];
  }
  // [[Mr, −Mi], [Mi, Mr]] with Mr = [A − aI, B], Mi = [−bI, 0].
  const width = n + m;
  const M = zerosRows(2 * n, 2 * width);
  for (let i = 0; i < n; i++) {
    for (let j = 0; j < n; j++) {
      const value = A[i][j] - (i === j ? lambda.re : 0);
      M[i][j] = value;
      M[n + i][width + j] = value;
    }
    for (let j = 0; j < m; j++) {
      M[i][n + j] = B[i][j];
      M[n + i][width + n + j] = B[i][j];
    }
    M[i][width + i] = lambda.im; // −Mi with Mi = −b I
    M[n + i][i] = -lambda.im; // Mi
  }
  const s = singularValuesOf(M);
  return s.length < 2 * n ? 0 : s[2 * n - 1];
}

/**
 * The pair in balanced state units: D⁻¹AD, D⁻¹B with D the powers-of-two diagonal that balances
 * [[A, B], [0, 0]] (Parlett & Reinsch; the input coordinates have zero rows and stay unscaled).
 * Controllability and the uncontrollable modes do not depend on the states' units, but a rank
 * tolerance ε·‖[A B]‖ does: without this, a position in µm beside a force in kN can make a
 * genuine coupling look like rounding noise.
 */
export function balancedPair(A: Rows, B: Rows): { A: Rows; B: Rows } {
  const n = A.length;
  const m = B[0]?.length ?? 0;
  if (n === 0 || m === 0) return { A, B };
  const augmented = [...A.map((row, i) => [...row, ...B[i]]), ...Array.from({ length: m }, () => new Array<number>(n + m).fill(0))];
  if (!augmented.every((row) => row.every(Number.isFinite))) return { A, B };
  const { scaled } = balance(augmented);
  return { A: scaled.slice(0, n).map((row) => row.slice(0, n)), B: scaled.slice(0, n).map((row) => row.slice(n)) };
}

export function analyzeControllability(
  unitsA: Rows,
  unitsB: Rows,
  domain: Domain,
  options: { computeMargin?: boolean } = {},
): ControllabilityResult {
  // Decided, and the distance to uncontrollability measured, in balanced state units.
  const { A, B } = balancedPair(unitsA, unitsB);
  const n = A.length;
  const width = n === 0 ? 0 : (B[0]?.length ?? 0);
  const Bsafe = width === 0 ? A.map(() => [] as number[]) : B;
  const stair = width === 0
    ? { T: identityRows(n), Abar: A, Bbar: Bsafe, controllableDimension: 0, blockSizes: [], rankTolerance: structureTolerance(A, Bsafe) }
    : controllabilityStaircase(A, Bsafe);
  const nc = stair.controllableDimension;
  const scale = Math.hypot(frobenius(A), frobenius(Bsafe)) || 1;
  const A22 = stair.Abar.slice(nc).map((row) => row.slice(nc));
  const stabilityTolerance = eigenvalueTolerance(A, domain);
  const uncontrollableModes: UncontrollableMode[] = eigenvaluesOf(A22).map((value) => ({
    value,
    stable: classifyEigenvalue(value, domain, stabilityTolerance) === 'stable',
    margin: width === 0 ? 0 : pbhSmallestSingularValue(A, Bsafe, value) / scale,
  }));
  let margin: number | null = null;
  let marginMode: Complex | null = null;
  if (options.computeMargin !== false && n > 0) {
    margin = Infinity;
    for (const value of eigenvaluesOf(A)) {
      if (value.im < 0) continue; // the conjugate gives the same σ_min
      const measure = width === 0 ? 0 : pbhSmallestSingularValue(A, Bsafe, value) / scale;
      if (measure < margin) {
        margin = measure;
        marginMode = value;
      }
    }
  }
  return {
    controllable: nc === n,
    controllableDimension: nc,
    uncontrollableModes,
    stabilisable: uncontrollableModes.every((mode) => mode.stable),
    margin,
    marginMode,
    rankTolerance: stair.rankTolerance,
  };
}

export interface ObservabilityResult {
  observable: boolean;
  observableDimension: number;
  unobservableModes: UncontrollableMode[];
  detectable: boolean;
  margin: number | null;
  marginMode: Complex | null;
  rankTolerance: number;
}

/** Observability of (A, C) by duality: controllability of (Aᵀ, Cᵀ). */
export function analyzeObservability(
  A: Rows,
  C: Rows,
  domain: Domain,
  options: { computeMargin?: boolean } = {},
): ObservabilityResult {
  const n = A.length;
  const Ct = C.length === 0 ? A.map(() => [] as number[]) : transposeRows(C);
  const dual = analyzeControllability(transposeRows(A), Ct, domain, options);
  return {
    observable: dual.controllable,
    observableDimension: n === 0 ? 0 : dual.controllableDimension,
    unobservableModes: dual.uncontrollableModes,
    detectable: dual.stabilisable,
    margin: dual.margin,
    marginMode: dual.marginMode,
    rankTolerance: dual.rankTolerance,
  };
}

/** True when rank C = n (with tolerance max(p, n)·ε·‖C‖₂): the outputs determine every state. */
export function measuresAllStates(C: Rows, n: number): boolean {
  if (n === 0) return true;
  if (C.length < n) return false;
  const s = singularValuesOf(C);
  const tolerance = Math.max(C.length, n) * EPS * (s[0] ?? 0);
  return s.filter((value) => value > tolerance).length === n;
}
