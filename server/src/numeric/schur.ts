// Real Schur form A = Z·T·Zᵀ by the Francis implicit double-shift QR algorithm on the Hessenberg
// form (Francis 1961/62; Golub & Van Loan, Matrix Computations, algorithm 7.5.2), with the
// deflation criterion of Ahues & Tisseur, the exceptional shifts and small-bulge restart of
// LAPACK dlahqr, and the standardisation of 2×2 blocks of LAPACK dlanv2. The iteration count is
// bounded: when the budget of sweeps is exhausted the result says `converged: false`.

import { type Dense, denseFromRows, denseToRows, transposeDense } from './dense';
import { hessenbergDense } from './hessenberg';
import { generateHouseholder } from './householder';
import type { Complex, Rows } from './types';
import { countIterations, noteNonConvergence } from './iterationCount';
import { standardizeBlockInPlace, standardizeTwoByTwo } from './twoByTwoStandardForm';

export { standardizeBlockInPlace, standardizeTwoByTwo, type TwoByTwoStandardForm } from './twoByTwoStandardForm';

const EPS = Number.EPSILON;
const SAFE_MIN = 2.2250738585072014e-308;
const EXCEPTIONAL_SHIFT_PERIOD = 10;

export interface RealSchurOptions {
  /**
   * Maximum number of QR sweeps over the whole reduction. Default 30·max(10, n), the bound LAPACK
   * dlahqr allows per eigenvalue, here spent in total (typical use is 2–4 sweeps per eigenvalue).
   */
  maxSweeps?: number;
}

export interface RealSchurResult {
  /** Upper quasi-triangular; 2×2 diagonal blocks hold complex pairs with equal diagonal entries. */
  T: Rows;
  /** Orthogonal, A = Z·T·Zᵀ. */
  Z: Rows;
  converged: boolean;
}

export interface HessenbergQrOutcome {
  converged: boolean;
  /** Eigenvalues in diagonal order; NaN where the iteration did not converge. */
  eigenvalues: Complex[];
}

/**
 * Francis double-shift QR on the upper Hessenberg h (n×n, row-major, modified in place).
 * With computeT the full quasi-triangular T is formed; otherwise only the eigenvalues are valid.
 * When zt is given it holds Zᵀ (row-major, so Z's columns are contiguous) and Z is
 * post-multiplied by the accumulated orthogonal transformations.
 */
export function hessenbergQr(
  h: Float64Array,
  n: number,
  zt: Float64Array | null,
  computeT: boolean,
  maxSweeps = 30 * Math.max(10, n),
): HessenbergQrOutcome {
  const eigenvalues: Complex[] = Array.from({ length: n }, () => ({ re: NaN, im: NaN }));
  const smallNumber = SAFE_MIN * (Math.max(n, 1) / EPS);
  let sweepsLeft = maxSweeps;
  let sinceDeflation = 0;
  const v = new Float64Array(3);
  let i = n - 1;
  while (i >= 0) {
    let l = 0;
    let deflated = false;
    for (;;) {
      // Look for a negligible subdiagonal entry (Ahues & Tisseur criterion, as in dlahqr).
      let k = i;
      for (; k > l; k--) {
        const sub = Math.abs(h[k * n + k - 1]);
        if (sub <= smallNumber) break;
        let test = Math.abs(h[(k - 1) * n + k - 1]) + Math.abs(h[k * n + k]);
        if (test === 0) {
          if (k - 2 >= l) test += Math.abs(h[(k - 1) * n + k - 2]);
          if (k + 1 <= i) test += Math.abs(h[(k + 1) * n + k]);
        }
        if (sub <= EPS * test) {
          const up = Math.abs(h[(k - 1) * n + k]);
          const ab = Math.max(sub, up);
          const ba = Math.min(sub, up);
          const hkk = Math.abs(h[k * n + k]);
          const difference = Math.abs(h[(k - 1) * n + k - 1] - h[k * n + k]);
          const aa = Math.max(hkk, difference);
          const bb = Math.min(hkk, difference);
          const s = aa + ab;
          if (ba * (ab / s) <= Math.max(smallNumber, EPS * (bb * (aa / s)))) break;
        }
      }
      l = k;
      if (l > 0) h[l * n + l - 1] = 0;
      if (l >= i - 1) {
        deflated = true;
        break;
      }
      if (sweepsLeft <= 0) break;
      sweepsLeft--;
      countIterations();
      sinceDeflation++;
      const i1 = computeT ? 0 : l;
      const i2 = computeT ? n - 1 : i;

      // Shifts: eigenvalues of the trailing 2×2, or an exceptional shift every tenth sweep.
      let h11: number;
      let h12: number;
      let h21: number;
      let h22: number;
      if (sinceDeflation % (2 * EXCEPTIONAL_SHIFT_PERIOD) === 0) {
        const s = Math.abs(h[i * n + i - 1]) + Math.abs(h[(i - 1) * n + i - 2]);
        h11 = 0.75 * s + h[i * n + i];
        h12 = -0.4375 * s;
        h21 = s;
        h22 = h11;
      } else if (sinceDeflation % EXCEPTIONAL_SHIFT_PERIOD === 0) {
        const s = Math.abs(h[(l + 1) * n + l]) + Math.abs(h[(l + 2) * n + l + 1]);
        h11 = 0.75 * s + h[l * n + l];
        h12 = -0.4375 * s;
        h21 = s;
        h22 = h11;
      } else {
        h11 = h[(i - 1) * n + i - 1];
        h21 = h[i * n + i - 1];
        h12 = h[(i - 1) * n + i];
        h22 = h[i * n + i];
      }
      let rt1r = 0;
      let rt1i = 0;
      let rt2r = 0;
      let rt2i = 0;
      const shiftScale = Math.abs(h11) + Math.abs(h12) + Math.abs(h21) + Math.abs(h22);
      if (shiftScale !== 0) {
        h11 /= shiftScale;
        h21 /= shiftScale;
        h12 /= shiftScale;
        h22 /= shiftScale;
        const trace = (h11 + h22) / 2;
        const det = (h11 - trace) * (h22 - trace) - h12 * h21;
        const rootDiscriminant = Math.sqrt(Math.abs(det));
        if (det >= 0) {
          rt1r = trace * shiftScale;
          rt2r = rt1r;
          rt1i = rootDiscriminant * shiftScale;
          rt2i = -rt1i;
        } else {
          // Real shifts: use the one closer to h22 twice.
          rt1r = trace + rootDiscriminant;
          rt2r = trace - rootDiscriminant;
          if (Math.abs(rt1r - h22) <= Math.abs(rt2r - h22)) {
            rt1r *= shiftScale;
            rt2r = rt1r;
          } else {
            rt2r *= shiftScale;
            rt1r = rt2r;
          }
          rt1i = 0;
          rt2i = 0;
        }
      }

      // Look for two consecutive small subdiagonals to start the bulge lower down.
      let m = i - 2;
      let v1 = 0;
      let v2 = 0;
      let v3 = 0;
      for (; m >= l; m--) {
        const hmm = h[m * n + m];
        let h21s = h[(m + 1) * n + m];
        let s = Math.abs(hmm - rt2r) + Math.abs(rt2i) + Math.abs(h21s);
        h21s /= s;
        v1 = h21s * h[m * n + m + 1] + (hmm - rt1r) * ((hmm - rt2r) / s) - rt1i * (rt2i / s);
        v2 = h21s * (hmm + h[(m + 1) * n + m + 1] - rt1r - rt2r);
        v3 = h21s * h[(m + 2) * n + m + 1];
        s = Math.abs(v1) + Math.abs(v2) + Math.abs(v3);
        v1 /= s;
        v2 /= s;
        v3 /= s;
        if (m === l) break;
        const h00 = Math.abs(h[m * n + m - 1]) * (Math.abs(v2) + Math.abs(v3));
        const h01 = Math.abs(v1) * (Math.abs(h[(m - 1) * n + m - 1]) + Math.abs(hmm) + Math.abs(h[(m + 1) * n + m + 1]));
        if (h00 <= EPS * h01) break;
      }

      // Double-shift sweep: chase the 3×3 bulge down with Householder reflectors.
      for (let k = m; k <= i - 1; k++) {
        const nr = Math.min(3, i - k + 1);
        if (k > m) {
          v[0] = h[k * n + k - 1];
          v[1] = h[(k + 1) * n + k - 1];
          v[2] = nr === 3 ? h[(k + 2) * n + k - 1] : 0;
        } else {
          v[0] = v1;
          v[1] = v2;
          v[2] = v3;
        }
        const { tau: t1, beta } = generateHouseholder(v, nr);
        if (k > m) {
          h[k * n + k - 1] = beta;
          h[(k + 1) * n + k - 1] = 0;
          if (k < i - 1) h[(k + 2) * n + k - 1] = 0;
        } else if (m > l) {
          h[k * n + k - 1] *= 1 - t1;
        }
        const w2 = v[1];
        const t2 = t1 * w2;
        if (nr === 3) {
          const w3 = v[2];
          const t3 = t1 * w3;
          const r0 = k * n;
          const r1 = r0 + n;
          const r2 = r1 + n;
          for (let j = k; j <= i2; j++) {
            const sum = h[r0 + j] + w2 * h[r1 + j] + w3 * h[r2 + j];
            h[r0 + j] -= sum * t1;
            h[r1 + j] -= sum * t2;
            h[r2 + j] -= sum * t3;
          }
          const jEnd = Math.min(k + 3, i);
          for (let j = i1; j <= jEnd; j++) {
            const o = j * n + k;
            const sum = h[o] + w2 * h[o + 1] + w3 * h[o + 2];
            h[o] -= sum * t1;
            h[o + 1] -= sum * t2;
            h[o + 2] -= sum * t3;
          }
          if (zt) {
            // Rows k..k+2 of Zᵀ, i.e. columns k..k+2 of Z, contiguous in memory.
            for (let j = 0; j < n; j++) {
              const sum = zt[r0 + j] + w2 * zt[r1 + j] + w3 * zt[r2 + j];
              zt[r0 + j] -= sum * t1;
              zt[r1 + j] -= sum * t2;
              zt[r2 + j] -= sum * t3;
            }
          }
        } else if (nr === 2) {
          const r0 = k * n;
          const r1 = r0 + n;
          for (let j = k; j <= i2; j++) {
            const sum = h[r0 + j] + w2 * h[r1 + j];
            h[r0 + j] -= sum * t1;
            h[r1 + j] -= sum * t2;
          }
          for (let j = i1; j <= i; j++) {
            const o = j * n + k;
            const sum = h[o] + w2 * h[o + 1];
            h[o] -= sum * t1;
            h[o + 1] -= sum * t2;
          }
          if (zt) {
            for (let j = 0; j < n; j++) {
              const sum = zt[r0 + j] + w2 * zt[r1 + j];
              zt[r0 + j] -= sum * t1;
              zt[r1 + j] -= sum * t2;
            }
          }
        }
      }
    }
    if (!deflated) {
      noteNonConvergence('schur-qr');
      return { converged: false, eigenvalues };
    }
    if (l === i) {
      eigenvalues[i] = { re: h[i * n + i], im: 0 };
    } else {
      const form = computeT
        ? standardizeBlockInPlace(h, n, i - 1, null)
        : standardizeBlockInPlace(h, n, i - 1, null, l, i);
      if (zt && !(form.cs === 1 && form.sn === 0)) {
        const r0 = (i - 1) * n;
        const r1 = r0 + n;
        for (let j = 0; j < n; j++) {
          const x = zt[r0 + j];
          const y = zt[r1 + j];
          zt[r0 + j] = form.cs * x + form.sn * y;
          zt[r1 + j] = form.cs * y - form.sn * x;
        }
      }
      eigenvalues[i - 1] = form.eigenvalue1;
      eigenvalues[i] = form.eigenvalue2;
    }
    sinceDeflation = 0;
    i = l - 1;
  }
  return { converged: true, eigenvalues };
}

export interface RealSchurDense {
  T: Dense;
  Z: Dense;
  converged: boolean;
  /** Eigenvalues in the order of T's diagonal. */
  eigenvalues: Complex[];
}

/** A = Z·T·Zᵀ for a square Dense matrix. */
export function realSchurDense(matrix: Dense, options: RealSchurOptions = {}): RealSchurDense {
  const n = matrix.rows;
  if (!matrix.data.every(Number.isFinite)) {
    // Non-finite data: no meaningful Schur form; report failure rather than NaN "converged".
    const nanDense = (): Dense => ({ rows: n, cols: n, data: new Float64Array(n * n).fill(NaN) });
    return { T: nanDense(), Z: nanDense(), converged: false, eigenvalues: Array.from({ length: n }, () => ({ re: NaN, im: NaN })) };
  }
  const { H, Q } = hessenbergDense(matrix, true);
  const zTransposed = transposeDense(Q!);
  const outcome = hessenbergQr(H.data, n, zTransposed.data, true, options.maxSweeps);
  // Entries below the subdiagonal are exact zeros of the Hessenberg form; make sure of it.
  for (let i = 2; i < n; i++) H.data.fill(0, i * n, i * n + i - 1);
  return { T: H, Z: transposeDense(zTransposed), converged: outcome.converged, eigenvalues: outcome.eigenvalues };
}

/** Real Schur decomposition A = Z·T·Zᵀ (T upper quasi-triangular with standardised 2×2 blocks). */
export function realSchur(A: Rows, options: RealSchurOptions = {}): RealSchurResult {
  const { T, Z, converged } = realSchurDense(denseFromRows(A), options);
  return { T: denseToRows(T), Z: denseToRows(Z), converged };
}

/** Eigenvalues read off the diagonal blocks of a quasi-triangular T, in diagonal order. */
export function eigenvaluesOfQuasiTriangular(t: Dense): Complex[] {
  const n = t.rows;
  const d = t.data;
  const values: Complex[] = [];
  for (let k = 0; k < n; ) {
    if (k + 1 < n && d[(k + 1) * n + k] !== 0) {
      const form = standardizeTwoByTwo(d[k * n + k], d[k * n + k + 1], d[(k + 1) * n + k], d[(k + 1) * n + k + 1]);
      values.push(form.eigenvalue1, form.eigenvalue2);
      k += 2;
    } else {
      values.push({ re: d[k * n + k], im: 0 });
      k += 1;
    }
  }
  return values;
}
