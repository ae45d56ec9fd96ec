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
  const t = T.data;
  const values: Complex[] = [];
  const vr = new Float64Array(n * n);
  const vi = new Float64Array(n * n);
  /** First row of each diagonal block and its size, in diagonal order. */
  const blockStart: number[] = [];
  const blockSize: number[] = [];
  for (let k = 0; k < n; ) {
    const size = k + 1 < n && t[(k + 1) * n + k] !== 0 ? 2 : 1;
    blockStart.push(k);
    blockSize.push(size);
    const lambda: Complex =
      size === 1 ? { re: t[k * n + k], im: 0 } : { re: t[k * n + k], im: Math.sqrt(Math.abs(t[k * n + k + 1])) * Math.sqrt(Math.abs(t[(k + 1) * n + k])) };
    const [yr, yi] = quasiTriangularEigenvector(t, n, k, size, lambda);
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
      // The conjugate pair's vector is the conjugate vector.
      for (let i = 0; i <= top; i++) {
        vr[i * n + k + 1] = vr[i * n + k];
        vi[i * n + k + 1] = -vi[i * n + k];
      }
      values.push({ re: lambda.re, im: -lambda.im });
    }
    k += size;
  }

  // W = V⁻¹ column by column: V·w = e_j, back substitution over the diagonal blocks from the one
  // holding j upward (w has no entries below that block).
  const wr = new Float64Array(n * n);
  const wi = new Float64Array(n * n);
  const blockOf = new Int32Array(n);
  blockStart.forEach((start, b) => {
    for (let i = start; i < start + blockSize[b]; i++) blockOf[i] = b;
  });
  let singular = false;
  for (let j = 0; j < n; j++) {
    const last = blockStart[blockOf[j]] + blockSize[blockOf[j]] - 1;
    for (let b = blockOf[j]; b >= 0; b--) {
      const start = blockStart[b];
      const size = blockSize[b];
      // Right-hand side rows start … start+size−1: e_j minus the part already solved below.
      let r0r = start === j ? 1 : 0;
      let r0i = 0;
      let r1r = size === 2 && start + 1 === j ? 1 : 0;
      let r1i = 0;
      for (let q = start + size; q <= last; q++) {
        const xr = wr[q * n + j];
        const xi = wi[q * n + j];
        if (xr === 0 && xi === 0) continue;
        const a = start * n + q;
        r0r -= vr[a] * xr - vi[a] * xi;
        r0i -= vr[a] * xi + vi[a] * xr;
        if (size === 2) {
          const c = a + n;
          r1r -= vr[c] * xr - vi[c] * xi;
          r1i -= vr[c] * xi + vi[c] * xr;
        }
      }
      if (size === 1) {
        const dr = vr[start * n + start];
        const di = vi[start * n + start];
        const d = dr * dr + di * di;
        if (!(d > 0)) singular = true;
        wr[start * n + j] = (r0r * dr + r0i * di) / d;
        wi[start * n + j] = (r0i * dr - r0r * di) / d;
      } else {
        // Cramer's rule on the 2×2 complex block [a b; c d] (its columns are conjugate vectors).
        const p = start * n + start;
        const ar = vr[p], ai = vi[p], br = vr[p + 1], bi = vi[p + 1];
        const cr = vr[p + n], ci = vi[p + n], dr = vr[p + n + 1], di = vi[p + n + 1];
        const detR = ar * dr - ai * di - (br * cr - bi * ci);
        const detI = ar * di + ai * dr - (br * ci + bi * cr);
        const det = detR * detR + detI * detI;
        if (!(det > 0)) singular = true;
        // x0 = (d·r0 − b·r1)/det, x1 = (a·r1 − c·r0)/det
        const n0r = dr * r0r - di * r0i - (br * r1r - bi * r1i);
        const n0i = dr * r0i + di * r0r - (br * r1i + bi * r1r);
        const n1r = ar * r1r - ai * r1i - (cr * r0r - ci * r0i);
        const n1i = ar * r1i + ai * r1r - (cr * r0i + ci * r0r);
        wr[start * n + j] = (n0r * detR + n0i * detI) / det;
        wi[start * n + j] = (n0i * detR - n0r * detI) / det;
        wr[(start + 1) * n + j] = (n1r * detR + n1i * detI) / det;
        wi[(start + 1) * n + j] = (n1i * detR - n1r * detI) / det;
      }
    }
  }
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
