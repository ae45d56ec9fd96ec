// Generalised eigenvalues of a real pencil A − λB by Hessenberg–triangular reduction and the
// implicit double-shift QZ iteration of Moler & Stewart, "An algorithm for generalized matrix
// eigenvalue problems", SIAM J. Numer. Anal. 10(2), 1973 (as in Golub & Van Loan, Matrix
// Computations, section 7.7), with zero-chasing deflation of infinite eigenvalues. Only eigenvalues
// are wanted, so the orthogonal factors are not accumulated and each transformation is restricted
// to the active diagonal block.

import { type Dense, denseFromRows, normFrobeniusDense } from './dense';
import type { Complex, Rows } from './types';
import { countIterations, noteNonConvergence } from './iterationCount';

export interface GeneralizedEigenvalues {
  /** λ_i = alpha_i / beta_i; beta_i ≥ 0, and beta_i ≈ 0 marks an infinite eigenvalue. */
  alpha: Complex[];
  beta: number[];
  /** False when the iteration bound (30 sweeps per eigenvalue) was reached; alpha/beta are then NaN for the unfinished part. */
  converged: boolean;
}

/** Rotation on rows p, q over columns from..to: [row_p; row_q] ← [c s; −s c]·[row_p; row_q]. */
function rotateRows(m: Float64Array, n: number, p: number, q: number, c: number, s: number, from: number, to: number): void {
  const rp = p * n;
  const rq = q * n;
  for (let j = from; j <= to; j++) {
    const a = m[rp + j];
    const b = m[rq + j];
    m[rp + j] = c * a + s * b;
    m[rq + j] = c * b - s * a;
  }
}

/** Rotation on columns p, q over rows from..to: col_p ← c·col_p − s·col_q, col_q ← s·col_p + c·col_q. */
function rotateColumns(m: Float64Array, n: number, p: number, q: number, c: number, s: number, from: number, to: number): void {
  for (let i = from; i <= to; i++) {
    const a = m[i * n + p];
    const b = m[i * n + q];
    m[i * n + p] = c * a - s * b;
    m[i * n + q] = s * a + c * b;
  }
}

/** (c, s) with [c s; −s c]·[x; y] = [r; 0]. */
function rowRotationFor(x: number, y: number): [number, number] {
  if (y === 0) return [1, 0];
  const r = Math.hypot(x, y);
  return [x / r, y / r];
}

/** (c, s) for rotateColumns that zeroes the left entry a of a row [a b]. */
function columnRotationFor(a: number, b: number): [number, number] {
  if (a === 0) return [1, 0];
  const r = Math.hypot(a, b);
  return [b / r, a / r];
}

/** Householder vector u (length 3) with (I − 2uuᵀ/uᵀu)·x = ±‖x‖·e_target; null when x = 0. */
function reflector3(x0: number, x1: number, x2: number, target: number): Float64Array | null {
  const scaleFactor = Math.max(Math.abs(x0), Math.abs(x1), Math.abs(x2));
  if (scaleFactor === 0) return null;
  const u = new Float64Array([x0 / scaleFactor, x1 / scaleFactor, x2 / scaleFactor]);
  const norm = Math.hypot(u[0], u[1], u[2]);
  u[target] += u[target] >= 0 ? norm : -norm;
  return u;
}

function reflectRows(m: Float64Array, n: number, k: number, u: Float64Array, from: number, to: number): void {
  const factor = 2 / (u[0] * u[0] + u[1] * u[1] + u[2] * u[2]);
  for (let j = from; j <= to; j++) {
    const d = factor * (u[0] * m[k * n + j] + u[1] * m[(k + 1) * n + j] + u[2] * m[(k + 2) * n + j]);
    m[k * n + j] -= d * u[0];
    m[(k + 1) * n + j] -= d * u[1];
    m[(k + 2) * n + j] -= d * u[2];
  }
}

function reflectColumns(m: Float64Array, n: number, k: number, u: Float64Array, from: number, to: number): void {
  const factor = 2 / (u[0] * u[0] + u[1] * u[1] + u[2] * u[2]);
  for (let i = from; i <= to; i++) {
    const row = i * n + k;
    const d = factor * (u[0] * m[row] + u[1] * m[row + 1] + u[2] * m[row + 2]);
    m[row] -= d * u[0];
    m[row + 1] -= d * u[1];
    m[row + 2] -= d * u[2];
  }
}

/** Reduces (H, T) in place to H upper Hessenberg, T upper triangular by orthogonal equivalence. */
function hessenbergTriangular(h: Float64Array, t: Float64Array, n: number): void {
  // T ← QᵀT upper triangular by Householder reflections, applied to H as well.
  for (let k = 0; k < n - 1; k++) {
    let norm = 0;
    for (let i = k; i < n; i++) norm = Math.hypot(norm, t[i * n + k]);
    if (norm === 0) continue;
    const alpha = t[k * n + k] >= 0 ? -norm : norm;
    const u = new Float64Array(n - k);
    for (let i = k; i < n; i++) u[i - k] = t[i * n + k];
    u[0] -= alpha;
    let uu = 0;
    for (let i = 0; i < u.length; i++) uu += u[i] * u[i];
    if (uu === 0) continue;
    for (const m of [t, h]) {
      for (let j = m === t ? k : 0; j < n; j++) {
        let d = 0;
        for (let i = k; i < n; i++) d += u[i - k] * m[i * n + j];
        d *= 2 / uu;
        for (let i = k; i < n; i++) m[i * n + j] -= d * u[i - k];
      }
    }
    for (let i = k + 1; i < n; i++) t[i * n + k] = 0;
  }
  // Givens rotations from the bottom of each column of H; each fill-in of T is removed from the right.
  for (let j = 0; j < n - 2; j++) {
    for (let i = n - 1; i >= j + 2; i--) {
      const [c, s] = rowRotationFor(h[(i - 1) * n + j], h[i * n + j]);
      if (s === 0) continue;
      rotateRows(h, n, i - 1, i, c, s, j, n - 1);
      rotateRows(t, n, i - 1, i, c, s, i - 1, n - 1);
      h[i * n + j] = 0;
      const [cz, sz] = columnRotationFor(t[i * n + i - 1], t[i * n + i]);
      if (sz === 0) continue;
      rotateColumns(t, n, i - 1, i, cz, sz, 0, i);
      rotateColumns(h, n, i - 1, i, cz, sz, 0, n - 1);
      t[i * n + i - 1] = 0;
    }
  }
}

/** Eigenvalues of the 2×2 pencil [a b; c d] − λ[e f; 0 g] as (alpha, beta) pairs. */
function pencil2x2(a: number, b: number, c: number, d: number, e: number, f: number, g: number): Array<[Complex, number]> {
  // det = e·g·λ² − (a·g + d·e − c·f)·λ + (a·d − b·c)
  const quadratic = e * g;
  const linear = a * g + d * e - c * f;
  const constant = a * d - b * c;
  const discriminant = linear * linear - 4 * quadratic * constant;
  const normalise = (alpha: Complex, beta: number): [Complex, number] =>
    beta < 0 ? [{ re: -alpha.re, im: -alpha.im }, -beta] : [alpha, beta];
  if (discriminant < 0) {
    const imaginary = Math.sqrt(-discriminant) / 2;
    return [
      normalise({ re: linear / 2, im: imaginary }, quadratic),
      normalise({ re: linear / 2, im: -imaginary }, quadratic),
    ];
  }
  // Real roots without cancellation: λ₁ = q/(e·g), λ₂ = (a·d − b·c)/q.
  const q = (linear + (linear >= 0 ? 1 : -1) * Math.sqrt(discriminant)) / 2;
  if (q === 0) return [normalise({ re: 0, im: 0 }, quadratic), normalise({ re: 0, im: 0 }, quadratic)];
  return [normalise({ re: q, im: 0 }, quadratic), normalise({ re: constant, im: 0 }, q)];
}

/** Generalised eigenvalues of the square pencil A − λB, both given as flat Dense matrices. */
export function generalizedEigenvaluesDense(A: Dense, B: Dense): GeneralizedEigenvalues {
  const n = A.rows;
  const alpha: Complex[] = new Array(n);
  const beta: number[] = new Array(n).fill(NaN);
  for (let i = 0; i < n; i++) alpha[i] = { re: NaN, im: NaN };
  if (A.cols !== n || B.rows !== n || B.cols !== n) return { alpha, beta, converged: false };
  const h = A.data.slice();
  const t = B.data.slice();
  for (let i = 0; i < n * n; i++) {
    if (!Number.isFinite(h[i]) || !Number.isFinite(t[i])) return { alpha, beta, converged: false };
  }
  hessenbergTriangular(h, t, n);
  const eps = Number.EPSILON;
  const normH = normFrobeniusDense({ rows: n, cols: n, data: h });
  const normT = normFrobeniusDense({ rows: n, cols: n, data: t });
  const tinyT = eps * normT;
  const record = (index: number, value: Complex, weight: number) => {
    alpha[index] = weight < 0 ? { re: -value.re, im: -value.im } : value;
    beta[index] = Math.abs(weight);
  };

  let hi = n - 1;
  let sinceDeflation = 0;
  let totalSweeps = 0;
  const sweepLimit = 30 * Math.max(n, 1);
  while (hi >= 0) {
    // Find the active block [lo, hi]: negligible subdiagonal entries are set to zero.
    let lo = hi;
    while (lo > 0) {
      const sub = Math.abs(h[lo * n + lo - 1]);
      let reference = Math.abs(h[(lo - 1) * n + lo - 1]) + Math.abs(h[lo * n + lo]);
      if (reference === 0) reference = normH;
      if (sub <= eps * reference) {
        h[lo * n + lo - 1] = 0;
        break;
      }
      lo--;
    }
    if (lo === hi) {
      record(hi, { re: h[hi * n + hi], im: 0 }, Math.abs(t[hi * n + hi]) <= tinyT ? 0 : t[hi * n + hi]);
      hi--;
      sinceDeflation = 0;
      continue;
    }
    // A (numerically) zero diagonal entry of T: chase it to the bottom and deflate an infinite eigenvalue.
    let zeroAt = -1;
    for (let j = lo; j <= hi; j++) {
      if (Math.abs(t[j * n + j]) <= tinyT) {
        zeroAt = j;
        break;
      }
    }
    if (zeroAt >= 0) {
      t[zeroAt * n + zeroAt] = 0;
      for (let k = zeroAt; k < hi; k++) {
        const [c, s] = rowRotationFor(t[k * n + k + 1], t[(k + 1) * n + k + 1]);
        rotateRows(t, n, k, k + 1, c, s, k, hi);
        rotateRows(h, n, k, k + 1, c, s, Math.max(k - 1, lo), hi);
        t[(k + 1) * n + k + 1] = 0;
        if (k > lo) {
          const [cz, sz] = columnRotationFor(h[(k + 1) * n + k - 1], h[(k + 1) * n + k]);
          rotateColumns(h, n, k - 1, k, cz, sz, lo, k + 1);
          rotateColumns(t, n, k - 1, k, cz, sz, lo, k);
          h[(k + 1) * n + k - 1] = 0;
        }
      }
      const [cz, sz] = columnRotationFor(h[hi * n + hi - 1], h[hi * n + hi]);
      rotateColumns(h, n, hi - 1, hi, cz, sz, lo, hi);
      rotateColumns(t, n, hi - 1, hi, cz, sz, lo, hi);
      h[hi * n + hi - 1] = 0;
      t[hi * n + hi - 1] = 0;
      continue;
    }
    if (lo === hi - 1) {
      const pairs = pencil2x2(
        h[lo * n + lo], h[lo * n + hi], h[hi * n + lo], h[hi * n + hi],
        t[lo * n + lo], t[lo * n + hi], t[hi * n + hi],
      );
      record(lo, pairs[0][0], pairs[0][1]);
      record(hi, pairs[1][0], pairs[1][1]);
      hi -= 2;
      sinceDeflation = 0;
      continue;
    }
    if (totalSweeps >= sweepLimit) {
      noteNonConvergence('qz');
      return { alpha, beta, converged: false };
    }
    totalSweeps++;
    countIterations();
    sinceDeflation++;
    doubleShiftSweep(h, t, n, lo, hi, sinceDeflation % 10 === 0);
  }
  return { alpha, beta, converged: true };
}

/** One implicit double-shift QZ sweep on the unreduced block [lo, hi] (T nonsingular there). */
function doubleShiftSweep(h: Float64Array, t: Float64Array, n: number, lo: number, hi: number, exceptional: boolean): void {
  const m = hi - 1;
  let shiftSum: number;
  let shiftProduct: number;
  if (exceptional) {
    // Ad hoc shift to break a cycle (the Wilkinson-style exceptional shift of the QR algorithm,
    // expressed for M = H·T⁻¹).
    const omega = Math.abs(h[hi * n + m] / t[m * n + m]) + Math.abs(h[m * n + m - 1] / t[(m - 1) * n + m - 1]);
    const centre = 0.75 * omega + h[hi * n + hi] / t[hi * n + hi];
    shiftSum = 2 * centre;
    shiftProduct = centre * centre + 0.4375 * omega * omega;
  } else {
    // Eigenvalues of the trailing 2×2 pencil through W = H₂₂·T₂₂⁻¹.
    const t11 = t[m * n + m];
    const t12 = t[m * n + hi];
    const t22 = t[hi * n + hi];
    const w11 = h[m * n + m] / t11;
    const w21 = h[hi * n + m] / t11;
    const w12 = (h[m * n + hi] - w11 * t12) / t22;
    const w22 = (h[hi * n + hi] - w21 * t12) / t22;
    shiftSum = w11 + w22;
    shiftProduct = w11 * w22 - w12 * w21;
  }
  // First column of (M − σ₁I)(M − σ₂I), M = H·T⁻¹, from the leading entries only.
  const t11 = t[lo * n + lo];
  const t12 = t[lo * n + lo + 1];
  const t22 = t[(lo + 1) * n + lo + 1];
  const a = h[lo * n + lo] / t11;
  const b = h[(lo + 1) * n + lo] / t11;
  const y2 = b / t22;
  const y1 = (a - t12 * y2) / t11;
  let v0 = h[lo * n + lo] * y1 + h[lo * n + lo + 1] * y2 - shiftSum * a + shiftProduct;
  let v1 = h[(lo + 1) * n + lo] * y1 + h[(lo + 1) * n + lo + 1] * y2 - shiftSum * b;
  let v2 = h[(lo + 2) * n + lo + 1] * y2;

  for (let k = lo; k <= hi - 2; k++) {
    if (k > lo) {
      v0 = h[k * n + k - 1];
      v1 = h[(k + 1) * n + k - 1];
      v2 = h[(k + 2) * n + k - 1];
    }
    const left = reflector3(v0, v1, v2, 0);
    if (left !== null) {
      reflectRows(h, n, k, left, Math.max(k - 1, lo), hi);
      reflectRows(t, n, k, left, k, hi);
      if (k > lo) {
        h[(k + 1) * n + k - 1] = 0;
        h[(k + 2) * n + k - 1] = 0;
      }
    }
    const lastRow = Math.min(k + 3, hi);
    // Restore T: zero T(k+2, k..k+1) with a reflection from the right, then T(k+1, k) with a rotation.
    const right = reflector3(t[(k + 2) * n + k], t[(k + 2) * n + k + 1], t[(k + 2) * n + k + 2], 2);
    if (right !== null) {
      reflectColumns(h, n, k, right, lo, lastRow);
      reflectColumns(t, n, k, right, lo, k + 2);
      t[(k + 2) * n + k] = 0;
      t[(k + 2) * n + k + 1] = 0;
    }
    const [cz, sz] = columnRotationFor(t[(k + 1) * n + k], t[(k + 1) * n + k + 1]);
    rotateColumns(h, n, k, k + 1, cz, sz, lo, lastRow);
    rotateColumns(t, n, k, k + 1, cz, sz, lo, k + 1);
    t[(k + 1) * n + k] = 0;
  }
  // Final 2×2 step: zero H(hi, hi−2) from the left, then T(hi, hi−1) from the right.
  const [c, s] = rowRotationFor(h[m * n + m - 1], h[hi * n + m - 1]);
  rotateRows(h, n, m, hi, c, s, m - 1, hi);
  rotateRows(t, n, m, hi, c, s, m, hi);
  h[hi * n + m - 1] = 0;
  const [cz, sz] = columnRotationFor(t[hi * n + m], t[hi * n + hi]);
  rotateColumns(h, n, m, hi, cz, sz, lo, hi);
  rotateColumns(t, n, m, hi, cz, sz, lo, hi);
  t[hi * n + m] = 0;
}

/** Generalised eigenvalues of A − λB (B may be singular; infinite eigenvalues have beta ≈ 0). */
export function generalizedEigenvalues(A: Rows, B: Rows): GeneralizedEigenvalues {
  return generalizedEigenvaluesDense(denseFromRows(A), denseFromRows(B));
}

/**
 * The finite eigenvalues α/β of A − λB. A pair counts as infinite when |α|·tol·‖B‖_F > |β|·max(‖A‖_F, ‖B‖_F),
 * i.e. when |λ| exceeds max(‖A‖, ‖B‖)/‖B‖ by the factor 1/tol; pairs with α ≈ β ≈ 0 (a singular pencil)
 * are dropped as indeterminate. The default tol = n·√ε covers infinite eigenvalues of index 2,
 * which rounding perturbs to |λ| ≈ ε^(−1/2) (common practice). Infinite eigenvalues of index k ≥ 3
 * become |λ| ≈ ε^(−1/k) and are indistinguishable from large finite ones unless the pencil's
 * zero structure is exact: for the zeros of a system use invariantZeros, which removes them first.
 */
export function finiteGeneralizedEigenvalues(A: Rows, B: Rows, tol?: number): Complex[] {
  const n = A.length;
  const a = denseFromRows(A);
  const b = denseFromRows(B);
  const threshold = tol ?? Math.max(n, 1) * Math.sqrt(Number.EPSILON);
  const normA = normFrobeniusDense(a);
  const normB = normFrobeniusDense(b);
  const { alpha, beta } = generalizedEigenvaluesDense(a, b);
  const finite: Complex[] = [];
  for (let i = 0; i < n; i++) {
    const magnitude = Math.hypot(alpha[i].re, alpha[i].im);
    if (!Number.isFinite(magnitude) || !Number.isFinite(beta[i])) continue;
    const indeterminate = magnitude <= n * Number.EPSILON * normA && beta[i] <= n * Number.EPSILON * normB;
    if (indeterminate) continue;
    if (beta[i] === 0 || magnitude * threshold * normB > beta[i] * Math.max(normA, normB)) continue;
    finite.push({ re: alpha[i].re / beta[i], im: alpha[i].im / beta[i] });
  }
  return finite;
}

/** Eigenvalues of a square matrix as the pencil A − λI. */
export function eigenvaluesByQz(A: Dense): { values: Complex[]; converged: boolean } {
  const n = A.rows;
  const identity = { rows: n, cols: n, data: new Float64Array(n * n) };
  for (let i = 0; i < n; i++) identity.data[i * n + i] = 1;
  const { alpha, beta, converged } = generalizedEigenvaluesDense(A, identity);
  return { values: alpha.map((value, i) => ({ re: value.re / beta[i], im: value.im / beta[i] })), converged };
}
