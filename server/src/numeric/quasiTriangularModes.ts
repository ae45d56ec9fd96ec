// Modal coordinates of a real quasi-triangular (Schur) matrix: T·V = V·Λ, with V's columns the
// right eigenvectors of T (LAPACK dtrevc-style back substitution, `quasiTriangularEigenvector`),
// each scaled to unit 2-norm, and W = V⁻¹. An eigenvector of T has no entries below its own
// diagonal block, so V is block upper triangular (1×1 and 2×2 diagonal blocks where T has them)
// and W follows by block back substitution, about n³/6 complex multiply–adds.
//
// The condition κ = ‖V‖_F·‖W‖_F bounds how much rounding the change of coordinates amplifies; it
// is infinite when T is (numerically) defective. What to trust is the caller's decision: a modal
// sum Σ_k r_k/(λ − λ_k) is only as good as κ and the cancellation among its terms allow.
import { quasiTriangularEigenvector } from './eigenvectors';
import type { Dense } from './dense';
import type { Complex } from './types';

const EPS = Number.EPSILON;
const SAFE_MIN = 2.2250738585072014e-308;
/** Back substitution rescales the vector when an entry passes this (as eigenvectors.ts does). */
const RESCALE_THRESHOLD = 1e100;

export interface QuasiTriangularModes {
  n: number;
  /** Eigenvalues in T's diagonal order; a 2×2 block gives λ (positive imaginary part), then λ̄. */
  values: Complex[];
  /** V (row-major n × n, real and imaginary parts): column k belongs to values[k]. */
  vectorsRe: Float64Array;
  vectorsIm: Float64Array;
  /** W = V⁻¹ (row-major n × n). */
  inverseRe: Float64Array;
  inverseIm: Float64Array;
  /** ‖V‖_F·‖V⁻¹‖_F; Infinity when V is singular or a value is not finite. */
  condition: number;
}

/** Modal coordinates of the quasi-triangular T (standardised 2×2 blocks, as realSchurDense leaves them). */
export function quasiTriangularModes(T: Dense): QuasiTriangularModes {
  const n = T.rows;
  const { values, vr, vi, blockStart, blockSize } = eigenvectorMatrix(T.data, n);
  const { wr, wi, singular } = blockUpperTriangularInverse(vr, vi, n, blockStart, blockSize);
  let normV = 0;
  let normW = 0;
  for (let e = 0; e < n * n; e++) {
    normV += vr[e] * vr[e] + vi[e] * vi[e];
    normW += wr[e] * wr[e] + wi[e] * wi[e];
  }
  const condition = Math.sqrt(normV) * Math.sqrt(normW);
  return {
    n,
    values,
    vectorsRe: vr,
    vectorsIm: vi,
    inverseRe: wr,
    inverseIm: wi,
    condition: singular || !Number.isFinite(condition) ? Infinity : condition,
  };
}

/** V with unit columns, the eigenvalues, and T's diagonal blocks (first row, size). */
function eigenvectorMatrix(t: Float64Array, n: number) {
  const values: Complex[] = [];
  const vr = new Float64Array(n * n);
  const vi = new Float64Array(n * n);
  const blockStart: number[] = [];
  const blockSize: number[] = [];
  for (let k = 0; k < n; ) {
    const size = k + 1 < n && t[(k + 1) * n + k] !== 0 ? 2 : 1;
    blockStart.push(k);
    blockSize.push(size);
    const lambda: Complex =
      size === 1 ? { re: t[k * n + k], im: 0 } : { re: t[k * n + k], im: Math.sqrt(Math.abs(t[k * n + k + 1])) * Math.sqrt(Math.abs(t[(k + 1) * n + k])) };
    const [yr, yi] = size === 1 ? realQuasiTriangularEigenvector(t, n, k, lambda.re) : quasiTriangularEigenvector(t, n, k, size, lambda);
    const top = k + size - 1;
    let sumOfSquares = 0;
    for (let i = 0; i <= top; i++) sumOfSquares += yr[i] * yr[i] + yi[i] * yi[i];
    const scale = sumOfSquares > 0 ? 1 / Math.sqrt(sumOfSquares) : 0;
    for (let i = 0; i <= top; i++) {
      vr[i * n + k] = yr[i] * scale;
      vi[i * n + k] = yi[i] * scale;
    }
    values.push(lambda);
    if (size === 2) {
      // The conjugate eigenvalue's vector is the conjugate vector.
      for (let i = 0; i <= top; i++) {
        vr[i * n + k + 1] = vr[i * n + k];
        vi[i * n + k + 1] = -vi[i * n + k];
      }
      values.push({ re: lambda.re, im: -lambda.im });
    }
    k += size;
  }
  return { values, vr, vi, blockStart, blockSize };
}

/**
 * W = V⁻¹ column by column: V·w = e_j by back substitution over the diagonal blocks, from the one
 * holding j upward (w has no entries below that block).
 */
function blockUpperTriangularInverse(vr: Float64Array, vi: Float64Array, n: number, blockStart: number[], blockSize: number[]) {
  const wr = new Float64Array(n * n);
  const wi = new Float64Array(n * n);
  const blockOf = new Int32Array(n);
  blockStart.forEach((start, b) => {
    for (let i = start; i < start + blockSize[b]; i++) blockOf[i] = b;
  });
  let singular = false;
  const solved = new Float64Array(4);
  // Column j is built in contiguous scratch vectors, then stored.
  const xr = new Float64Array(n);
  const xi = new Float64Array(n);
  for (let j = 0; j < n; j++) {
    const last = blockStart[blockOf[j]] + blockSize[blockOf[j]] - 1;
    xr.fill(0);
    xi.fill(0);
    for (let b = blockOf[j]; b >= 0; b--) {
      const start = blockStart[b];
      const pair = blockSize[b] === 2;
      if (!solveBlockRow(vr, vi, xr, xi, n, j, start, pair, last, solved)) singular = true;
      xr[start] = solved[0];
      xi[start] = solved[1];
      if (pair) {
        xr[start + 1] = solved[2];
        xi[start + 1] = solved[3];
      }
    }
    for (let i = 0; i <= last; i++) {
      wr[i * n + j] = xr[i];
      wi[i * n + j] = xi[i];
    }
  }
  return { wr, wi, singular };
}

/**
 * A real eigenvalue's eigenvector of the quasi-triangular t (1×1 block at k) by real back
 * substitution, as quasiTriangularEigenvector does in complex arithmetic: tiny pivots raised to
 * max(ε·|λ|, n·SAFE_MIN/ε), the vector rescaled when an entry passes 1e100. Imaginary part zero.
 */
function realQuasiTriangularEigenvector(t: Float64Array, n: number, k: number, lambda: number): [Float64Array, Float64Array] {
  const y = new Float64Array(n);
  const minimumPivot = Math.max(EPS * Math.abs(lambda), SAFE_MIN * (n / EPS));
  y[k] = 1;
  const rescale = (magnitude: number) => {
    if (magnitude <= RESCALE_THRESHOLD) return;
    for (let p = 0; p <= k; p++) y[p] /= magnitude;
  };
  let j = k - 1;
  while (j >= 0) {
    if (j > 0 && t[j * n + j - 1] !== 0) {
      // 2×2 diagonal block at rows j−1, j: Gaussian elimination with row pivoting.
      let s1 = 0;
      let s2 = 0;
      for (let p = j + 1; p <= k; p++) {
        s1 += t[(j - 1) * n + p] * y[p];
        s2 += t[j * n + p] * y[p];
      }
      let a11 = t[(j - 1) * n + j - 1] - lambda;
      let a12 = t[(j - 1) * n + j];
      let a21 = t[j * n + j - 1];
      let a22 = t[j * n + j] - lambda;
      let r1 = -s1;
      let r2 = -s2;
      if (Math.abs(a21) > Math.abs(a11)) {
        [a11, a12, a21, a22, r1, r2] = [a21, a22, a11, a12, r2, r1];
      }
      if (Math.abs(a11) < minimumPivot) a11 = minimumPivot;
      const factor = a21 / a11;
      let u22 = a22 - factor * a12;
      if (Math.abs(u22) < minimumPivot) u22 = minimumPivot;
      const second = (r2 - factor * r1) / u22;
      const first = (r1 - a12 * second) / a11;
      y[j - 1] = first;
      y[j] = second;
      rescale(Math.max(Math.abs(first), Math.abs(second)));
      j -= 2;
    } else {
      let sum = 0;
      for (let p = j + 1; p <= k; p++) sum += t[j * n + p] * y[p];
      let pivot = t[j * n + j] - lambda;
      if (Math.abs(pivot) < minimumPivot) pivot = minimumPivot;
      y[j] = -sum / pivot;
      rescale(Math.abs(y[j]));
      j -= 1;
    }
  }
  return [y, new Float64Array(n)];
}

/**
 * One diagonal block's rows of column j of W (x, solved so far below the block): the block (1×1,
 * or 2×2 when `pair`) of V times w_block = e_j − V(block, beyond)·x(beyond). Into out (re, im of the first row, then the second);
 * false when the block is singular.
 */
function solveBlockRow(
  vr: Float64Array,
  vi: Float64Array,
  xr: Float64Array,
  xi: Float64Array,
  n: number,
  j: number,
  start: number,
  pair: boolean,
  last: number,
  out: Float64Array,
): boolean {
  let r0r = start === j ? 1 : 0;
  let r0i = 0;
  let r1r = pair && start + 1 === j ? 1 : 0;
  let r1i = 0;
  for (let q = start + (pair ? 2 : 1); q <= last; q++) {
    const er = xr[q];
    const ei = xi[q];
    if (er === 0 && ei === 0) continue;
    const a = start * n + q;
    r0r -= vr[a] * er - vi[a] * ei;
    r0i -= vr[a] * ei + vi[a] * er;
    if (pair) {
      const c = a + n;
      r1r -= vr[c] * er - vi[c] * ei;
      r1i -= vr[c] * ei + vi[c] * er;
    }
  }
  if (!pair) {
    const dr = vr[start * n + start];
    const di = vi[start * n + start];
    const d = dr * dr + di * di;
    out[0] = (r0r * dr + r0i * di) / d;
    out[1] = (r0i * dr - r0r * di) / d;
    return d > 0;
  }
  // Cramer's rule on the 2×2 complex block [a b; c d] (its columns are conjugate vectors).
  const p = start * n + start;
  const ar = vr[p], ai = vi[p], br = vr[p + 1], bi = vi[p + 1];
  const cr = vr[p + n], ci = vi[p + n], dr = vr[p + n + 1], di = vi[p + n + 1];
  const detR = ar * dr - ai * di - (br * cr - bi * ci);
  const detI = ar * di + ai * dr - (br * ci + bi * cr);
  const det = detR * detR + detI * detI;
  // x0 = (d·r0 − b·r1)/det, x1 = (a·r1 − c·r0)/det
  const n0r = dr * r0r - di * r0i - (br * r1r - bi * r1i);
  const n0i = dr * r0i + di * r0r - (br * r1i + bi * r1r);
  const n1r = ar * r1r - ai * r1i - (cr * r0r - ci * r0i);
  const n1i = ar * r1i + ai * r1r - (cr * r0i + ci * r0r);
  out[0] = (n0r * detR + n0i * detI) / det;
  out[1] = (n0i * detR - n0r * detI) / det;
  out[2] = (n1r * detR + n1i * detI) / det;
  out[3] = (n1i * detR - n1r * detI) / det;
  return det > 0;
}
