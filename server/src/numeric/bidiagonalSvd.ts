// Singular value decomposition by Golub–Kahan–Reinsch: Householder bidiagonalisation A = Q·B·Pᵀ
// (Golub & Kahan, SIAM J. Numer. Anal. B 2, 1965), then implicit QR sweeps on the upper
// bidiagonal B (Golub & Reinsch, Numer. Math. 14, 1970) with the zero-shift sweep and the
// relative convergence criteria of Demmel & Kahan (SIAM J. Sci. Stat. Comput. 11, 1990), in the
// arrangement of LAPACK dbdsqr: chase direction chosen by which end is larger, the shift taken
// from the trailing (or leading) 2×2 block, zero shift when it could spoil small singular values.
// B's singular values come out to high relative accuracy; A's to absolute accuracy O(ε·‖A‖), as
// for every method that starts with an orthogonal reduction. Sweeps are bounded (6·n² inner
// steps, dbdsqr's limit); on exhaustion `converged` is false and the values are still returned.

import type { Dense } from './dense';
import { countIterations, noteNonConvergence } from './iterationCount';

const EPS = Number.EPSILON / 2; // unit roundoff, LAPACK's dlamch('E')
const SAFE_MIN = 2.2250738585072014e-308;
/** Outer bound of the inner-step budget, per n² (LAPACK dbdsqr's MAXITR). */
const MAX_ITERATION_FACTOR = 6;
/** Exact power of two lifting a subnormal column into the normal range (dlarfg's 1/safmin). */
const RESCALE = 2 ** 600;

export interface BidiagonalSvd {
  /** m×k with orthonormal columns (k = min(m, n)), or null when not requested. */
  U: Dense | null;
  /** Singular values, descending. */
  s: Float64Array;
  /** n×k with orthonormal columns, or null when not requested. */
  V: Dense | null;
  converged: boolean;
}

/** Plane rotation [c s; −s c]·[f; g] = [r; 0] with c ≥ 0 and r of the sign of f (LAPACK 3.10 dlartg). */
function givens(f: number, g: number, out: Float64Array): void {
  if (g === 0) {
    out[0] = 1;
    out[1] = 0;
    out[2] = f;
    return;
  }
  if (f === 0) {
    out[0] = 0;
    out[1] = g >= 0 ? 1 : -1;
    out[2] = Math.abs(g);
    return;
  }
  const sumOfSquares = f * f + g * g;
  let d = Math.sqrt(sumOfSquares);
  if (!(sumOfSquares > SAFE_MIN / EPS) || sumOfSquares === Infinity) d = Math.hypot(f, g);
  const r = f >= 0 ? d : -d;
  out[0] = Math.abs(f) / d;
  out[1] = g / r;
  out[2] = r;
}

/** Smaller singular value of the upper triangular [[f, g], [0, h]] (LAPACK dlas2). */
function smallerSingularValue2x2(f: number, g: number, h: number): number {
  const fa = Math.abs(f);
  const ga = Math.abs(g);
  const ha = Math.abs(h);
  const fhmn = Math.min(fa, ha);
  const fhmx = Math.max(fa, ha);
  if (fhmn === 0) return 0;
  if (ga < fhmx) {
    const as = 1 + fhmn / fhmx;
    const at = (fhmx - fhmn) / fhmx;
    const au = (ga / fhmx) ** 2;
    const c = 2 / (Math.sqrt(as * as + au) + Math.sqrt(at * at + au));
    return fhmn * c;
  }
  const au = fhmx / ga;
  if (au === 0) return (fhmn * fhmx) / ga;
  const as = 1 + fhmn / fhmx;
  const at = (fhmx - fhmn) / fhmx;
  const c = 1 / (Math.sqrt(1 + (as * au) ** 2) + Math.sqrt(1 + (at * au) ** 2));
  return 2 * (fhmn * c) * au;
}

/** Rotates rows j and j+1 (length `width`) of a row-major array: [x; y] ← [c·x + s·y; c·y − s·x]. */
function rotateRows(rows: Float64Array | null, width: number, j: number, c: number, s: number): void {
  if (rows === null) return;
  const xo = j * width;
  const yo = xo + width;
  for (let i = 0; i < width; i++) {
    const x = rows[xo + i];
    const y = rows[yo + i];
    rows[yo + i] = c * y - s * x;
    rows[xo + i] = s * y + c * x;
  }
}

/**
 * Implicit QR on the n×n upper bidiagonal (d, e), in place; the rotations update the rows of
 * `leftT` (n×uWidth, i.e. Uᵀ) and of `rightT` (n×vWidth, i.e. Vᵀ) when given, so that
 * B = leftTᵀ·diag(d)·rightT holds throughout. Returns false when the step budget ran out.
 */
function bidiagonalQr(
  d: Float64Array,
  e: Float64Array,
  n: number,
  leftT: Float64Array | null,
  uWidth: number,
  rightT: Float64Array | null,
  vWidth: number,
): boolean {
  if (n <= 1) return true;
  const tolerance = Math.max(10, Math.min(100, EPS ** -0.125)) * EPS;
  // Estimate of σ_min for the absolute deflation threshold (dbdsqr, relative accuracy branch).
  let mu = Math.abs(d[0]);
  let smallestEstimate = mu;
  for (let i = 1; i < n && smallestEstimate > 0; i++) {
    mu = Math.abs(d[i]) * (mu / (mu + Math.abs(e[i - 1])));
    smallestEstimate = Math.min(smallestEstimate, mu);
  }
  const maxSteps = MAX_ITERATION_FACTOR * n * n;
  const threshold = Math.max((tolerance * smallestEstimate) / Math.sqrt(n), maxSteps * SAFE_MIN);
  const rotation = new Float64Array(3);
  let steps = 0;
  let oldLow = -1;
  let oldHigh = -1;
  let direction = 1;
  let passes = 0;
  let high = n - 1; // last index of the unreduced block still being worked on
  while (high > 0) {
    // Every pass either sweeps (counted in steps) or deflates; the pass bound is a second guard.
    if (steps > maxSteps || ++passes > maxSteps + 2 * n) return false;
    // Find the top `low` of the unreduced block ending at `high`.
    let largest = Math.abs(d[high]);
    let low = 0;
    let split = false;
    for (let i = high - 1; i >= 0; i--) {
      const absD = Math.abs(d[i]);
      const absE = Math.abs(e[i]);
      if (absE <= threshold) {
        e[i] = 0;
        low = i + 1;
        split = true;
        break;
      }
      largest = Math.max(largest, absD, absE);
    }
    if (split && low === high) {
      high--; // d[high] has converged
      continue;
    }
    // Chase from the larger end towards the smaller (dbdsqr's idir).
    if (low > oldHigh || high < oldLow) direction = Math.abs(d[low]) >= Math.abs(d[high]) ? 1 : 2;
    // Relative convergence tests (Demmel & Kahan, section 4) along the chase direction.
    let smallest: number;
    let deflated = false;
    if (direction === 1) {
      if (Math.abs(e[high - 1]) <= tolerance * Math.abs(d[high])) {
        e[high - 1] = 0;
        continue;
      }
      mu = Math.abs(d[low]);
      smallest = mu;
      for (let i = low; i < high; i++) {
        if (Math.abs(e[i]) <= tolerance * mu) {
          e[i] = 0;
          deflated = true;
          break;
        }
        mu = Math.abs(d[i + 1]) * (mu / (mu + Math.abs(e[i])));
        smallest = Math.min(smallest, mu);
      }
    } else {
      if (Math.abs(e[low]) <= tolerance * Math.abs(d[low])) {
        e[low] = 0;
        continue;
      }
      mu = Math.abs(d[high]);
      smallest = mu;
      for (let i = high - 1; i >= low; i--) {
        if (Math.abs(e[i]) <= tolerance * mu) {
          e[i] = 0;
          deflated = true;
          break;
        }
        mu = Math.abs(d[i]) * (mu / (mu + Math.abs(e[i])));
        smallest = Math.min(smallest, mu);
      }
    }
    if (deflated) continue;
    oldLow = low;
    oldHigh = high;
    // Shift: zero when it would be negligible against the smallest singular value (keeps relative
    // accuracy), otherwise the smaller singular value of the 2×2 block at the far end.
    let shift = 0;
    if ((n * tolerance * smallest) / largest > Math.max(EPS, 0.01 * tolerance)) {
      let endValue: number;
      if (direction === 1) {
        endValue = Math.abs(d[low]);
        shift = smallerSingularValue2x2(d[high - 1], e[high - 1], d[high]);
      } else {
        endValue = Math.abs(d[high]);
        shift = smallerSingularValue2x2(d[low], e[low], d[low + 1]);
      }
      if (endValue > 0 && (shift / endValue) ** 2 < EPS) shift = 0;
    }
    steps += high - low;
    countIterations();

    if (shift === 0) {
      // Zero-shift QR sweep (Demmel & Kahan, section 3): no cancellation, tiny values stay accurate.
      if (direction === 1) {
        let cs = 1;
        let oldCs = 1;
        let oldSn = 0;
        for (let i = low; i < high; i++) {
          givens(d[i] * cs, e[i], rotation);
          cs = rotation[0];
          const sn = rotation[1];
          const r = rotation[2];
          if (i > low) e[i - 1] = oldSn * r;
          givens(oldCs * r, d[i + 1] * sn, rotation);
          oldCs = rotation[0];
          oldSn = rotation[1];
          d[i] = rotation[2];
          rotateRows(rightT, vWidth, i, cs, sn);
          rotateRows(leftT, uWidth, i, oldCs, oldSn);
        }
        const h = d[high] * cs;
        d[high] = h * oldCs;
        e[high - 1] = h * oldSn;
        if (Math.abs(e[high - 1]) <= threshold) e[high - 1] = 0;
      } else {
        let cs = 1;
        let oldCs = 1;
        let oldSn = 0;
        for (let i = high; i > low; i--) {
          givens(d[i] * cs, e[i - 1], rotation);
          cs = rotation[0];
          const sn = rotation[1];
          const r = rotation[2];
          if (i < high) e[i] = oldSn * r;
          givens(oldCs * r, d[i - 1] * sn, rotation);
          oldCs = rotation[0];
          oldSn = rotation[1];
          d[i] = rotation[2];
          rotateRows(rightT, vWidth, i - 1, oldCs, -oldSn);
          rotateRows(leftT, uWidth, i - 1, cs, -sn);
        }
        const h = d[low] * cs;
        d[low] = h * oldCs;
        e[low] = h * oldSn;
        if (Math.abs(e[low]) <= threshold) e[low] = 0;
      }
    } else if (direction === 1) {
      // Shifted implicit QR sweep, chasing the bulge from top to bottom.
      let f = (Math.abs(d[low]) - shift) * ((d[low] >= 0 ? 1 : -1) + shift / d[low]);
      let g = e[low];
      for (let i = low; i < high; i++) {
        givens(f, g, rotation);
        const cosR = rotation[0];
        const sinR = rotation[1];
        if (i > low) e[i - 1] = rotation[2];
        f = cosR * d[i] + sinR * e[i];
        e[i] = cosR * e[i] - sinR * d[i];
        g = sinR * d[i + 1];
        d[i + 1] = cosR * d[i + 1];
        givens(f, g, rotation);
        const cosL = rotation[0];
        const sinL = rotation[1];
        d[i] = rotation[2];
        f = cosL * e[i] + sinL * d[i + 1];
        d[i + 1] = cosL * d[i + 1] - sinL * e[i];
        if (i < high - 1) {
          g = sinL * e[i + 1];
          e[i + 1] = cosL * e[i + 1];
        }
        rotateRows(rightT, vWidth, i, cosR, sinR);
        rotateRows(leftT, uWidth, i, cosL, sinL);
      }
      e[high - 1] = f;
      if (Math.abs(e[high - 1]) <= threshold) e[high - 1] = 0;
    } else {
      // Shifted implicit QR sweep, chasing the bulge from bottom to top.
      let f = (Math.abs(d[high]) - shift) * ((d[high] >= 0 ? 1 : -1) + shift / d[high]);
      let g = e[high - 1];
      for (let i = high; i > low; i--) {
        givens(f, g, rotation);
        const cosR = rotation[0];
        const sinR = rotation[1];
        if (i < high) e[i] = rotation[2];
        f = cosR * d[i] + sinR * e[i - 1];
        e[i - 1] = cosR * e[i - 1] - sinR * d[i];
        g = sinR * d[i - 1];
        d[i - 1] = cosR * d[i - 1];
        givens(f, g, rotation);
        const cosL = rotation[0];
        const sinL = rotation[1];
        d[i] = rotation[2];
        f = cosL * e[i - 1] + sinL * d[i - 1];
        d[i - 1] = cosL * d[i - 1] - sinL * e[i - 1];
        if (i > low + 1) {
          g = sinL * e[i - 2];
          e[i - 2] = cosL * e[i - 2];
        }
        rotateRows(rightT, vWidth, i - 1, cosL, -sinL);
        rotateRows(leftT, uWidth, i - 1, cosR, -sinR);
      }
      e[low] = f;
      if (Math.abs(e[low]) <= threshold) e[low] = 0;
    }
  }
  return true;
}

/**
 * Householder reflector I − τ·v·vᵀ with v[0] = 1 mapping x to (β, 0, …, 0) (LAPACK dlarfg).
 * `x` is read at data[start + i·stride], i < length, and overwritten with v (v[0] = 1 implied:
 * the first slot receives β). Returns τ (0 when x is already a multiple of e₁).
 */
function householderVector(data: Float64Array, start: number, length: number, stride: number): number {
  let tailNorm = tailNorm2(data, start, length, stride);
  if (tailNorm === 0) return 0;
  let alpha = data[start];
  let norm = Math.hypot(alpha, tailNorm);
  // As dlarfg: a column of (nearly) subnormal entries is scaled up by an exact power of two first, so
  // that τ and v are computed with full relative precision and the reflector stays orthogonal.
  let rescalings = 0;
  while (norm < SAFE_MIN / EPS && rescalings < 3) {
    for (let i = 0; i < length; i++) data[start + i * stride] *= RESCALE;
    rescalings++;
    alpha = data[start];
    tailNorm = tailNorm2(data, start, length, stride);
    norm = Math.hypot(alpha, tailNorm);
  }
  const beta = alpha >= 0 ? -norm : norm;
  const tau = (beta - alpha) / beta;
  const inverse = 1 / (alpha - beta);
  for (let i = 1; i < length; i++) data[start + i * stride] *= inverse;
  let unscaledBeta = beta;
  for (let i = 0; i < rescalings; i++) unscaledBeta /= RESCALE;
  data[start] = unscaledBeta;
  return tau;
}

/** Euclidean norm of data[start + i·stride], 1 ≤ i < length, scaled only when squares under- or overflow. */
function tailNorm2(data: Float64Array, start: number, length: number, stride: number): number {
  let sumOfSquares = 0;
  for (let i = 1; i < length; i++) {
    const value = data[start + i * stride];
    sumOfSquares += value * value;
  }
  if (sumOfSquares > SAFE_MIN / EPS && sumOfSquares !== Infinity) return Math.sqrt(sumOfSquares);
  let scale = 0;
  let sum = 1;
  for (let i = 1; i < length; i++) {
    const magnitude = Math.abs(data[start + i * stride]);
    if (magnitude === 0) continue;
    if (scale < magnitude) {
      sum = 1 + sum * (scale / magnitude) ** 2;
      scale = magnitude;
    } else sum += (magnitude / scale) ** 2;
  }
  return scale * Math.sqrt(sum);
}

/**
 * Thin SVD of a tall (m ≥ n) row-major m×n array. Works in a copy; returns descending singular
 * values and, when asked, Uᵀ (n×m) and Vᵀ (n×n) row-major.
 */
function tallBidiagonalSvd(
  source: Float64Array,
  m: number,
  n: number,
  wantVectors: boolean,
): { s: Float64Array; Ut: Float64Array | null; Vt: Float64Array | null; converged: boolean } {
  const a = source.slice();
  const d = new Float64Array(n);
  const e = new Float64Array(Math.max(n - 1, 0));
  const tauLeft = new Float64Array(n);
  const tauRight = new Float64Array(n);
  const work = new Float64Array(n);
  // Householder bidiagonalisation (Golub & Van Loan, algorithm 5.4.2): Qᵀ·A·P = B upper bidiagonal.
  for (let k = 0; k < n; k++) {
    // Left reflector zeroes A[k+1:m, k]; applied to columns k+1…n−1 row by row.
    const tau = householderVector(a, k * n + k, m - k, n);
    tauLeft[k] = tau;
    d[k] = a[k * n + k];
    if (tau !== 0 && k + 1 < n) {
      const width = n - k - 1;
      for (let j = 0; j < width; j++) work[j] = a[k * n + k + 1 + j];
      for (let i = k + 1; i < m; i++) {
        const vi = a[i * n + k];
        if (vi === 0) continue;
        const offset = i * n + k + 1;
        for (let j = 0; j < width; j++) work[j] += vi * a[offset + j];
      }
      for (let j = 0; j < width; j++) {
        work[j] *= tau;
        a[k * n + k + 1 + j] -= work[j];
      }
      for (let i = k + 1; i < m; i++) {
        const vi = a[i * n + k];
        if (vi === 0) continue;
        const offset = i * n + k + 1;
        for (let j = 0; j < width; j++) a[offset + j] -= vi * work[j];
      }
    }
    if (k + 1 >= n) continue;
    // Right reflector zeroes A[k, k+2:n]; applied to rows k+1…m−1.
    const start = k * n + k + 1;
    const length = n - k - 1;
    const tauR = householderVector(a, start, length, 1);
    tauRight[k] = tauR;
    e[k] = a[start];
    if (tauR !== 0) {
      for (let i = k + 1; i < m; i++) {
        const offset = i * n + k + 1;
        let dot = a[offset];
        for (let j = 1; j < length; j++) dot += a[offset + j] * a[start + j];
        dot *= tauR;
        if (dot === 0) continue;
        a[offset] -= dot;
        for (let j = 1; j < length; j++) a[offset + j] -= dot * a[start + j];
      }
    }
  }

  let Ut: Float64Array | null = null;
  let Vt: Float64Array | null = null;
  if (wantVectors) {
    // Q (m×n thin) = H_0·…·H_{n−1}·[I; 0] by backward accumulation, then stored as Uᵀ.
    const q = new Float64Array(m * n);
    for (let i = 0; i < n; i++) q[i * n + i] = 1;
    for (let k = n - 1; k >= 0; k--) {
      const tau = tauLeft[k];
      if (tau === 0) continue;
      const width = n - k;
      for (let j = 0; j < width; j++) work[j] = q[k * n + k + j];
      for (let i = k + 1; i < m; i++) {
        const vi = a[i * n + k];
        if (vi === 0) continue;
        const offset = i * n + k;
        for (let j = 0; j < width; j++) work[j] += vi * q[offset + j];
      }
      for (let j = 0; j < width; j++) {
        work[j] *= tau;
        q[k * n + k + j] -= work[j];
      }
      for (let i = k + 1; i < m; i++) {
        const vi = a[i * n + k];
        if (vi === 0) continue;
        const offset = i * n + k;
        for (let j = 0; j < width; j++) q[offset + j] -= vi * work[j];
      }
    }
    Ut = new Float64Array(n * m);
    for (let i = 0; i < m; i++) for (let j = 0; j < n; j++) Ut[j * m + i] = q[i * n + j];
    // P = G_0·…·G_{n−3} (G_k acts on indices k+1…n−1) by backward accumulation; Vᵀ starts as Pᵀ.
    const p = new Float64Array(n * n);
    for (let i = 0; i < n; i++) p[i * n + i] = 1;
    for (let k = n - 2; k >= 0; k--) {
      const tau = tauRight[k];
      if (tau === 0) continue;
      const start = k * n + k + 1; // v[0] = 1 at a[start] implied, v[j] at a[start + j]
      const length = n - k - 1;
      const first = k + 1;
      // P[first:, first:] ← (I − τ·v·vᵀ)·P[first:, first:]
      for (let j = 0; j < length; j++) work[j] = p[first * n + first + j];
      for (let i = 1; i < length; i++) {
        const vi = a[start + i];
        if (vi === 0) continue;
        const offset = (first + i) * n + first;
        for (let j = 0; j < length; j++) work[j] += vi * p[offset + j];
      }
      for (let j = 0; j < length; j++) {
        work[j] *= tau;
        p[first * n + first + j] -= work[j];
      }
      for (let i = 1; i < length; i++) {
        const vi = a[start + i];
        if (vi === 0) continue;
        const offset = (first + i) * n + first;
        for (let j = 0; j < length; j++) p[offset + j] -= vi * work[j];
      }
    }
    Vt = new Float64Array(n * n);
    for (let i = 0; i < n; i++) for (let j = 0; j < n; j++) Vt[j * n + i] = p[i * n + j];
  }

  // Rounding cannot make a finite input non-finite after the scaling below; this guards the loop.
  let finite = true;
  for (let i = 0; i < n; i++) if (!Number.isFinite(d[i]) || (i < n - 1 && !Number.isFinite(e[i]))) finite = false;
  if (!finite) d.fill(NaN);
  const converged = finite && bidiagonalQr(d, e, n, Ut, m, Vt, n);
  if (!converged) noteNonConvergence('svd-jacobi'); // the SVD kernels' shared label in the tally

  // Make the values non-negative (flipping the matching row of Vᵀ), then sort descending.
  for (let i = 0; i < n; i++) {
    if (d[i] < 0) {
      d[i] = -d[i];
      if (Vt) for (let j = 0; j < n; j++) Vt[i * n + j] = -Vt[i * n + j];
    }
  }
  for (let i = 0; i < n - 1; i++) {
    let best = i;
    for (let j = i + 1; j < n; j++) if (d[j] > d[best]) best = j;
    if (best === i) continue;
    const swap = d[i];
    d[i] = d[best];
    d[best] = swap;
    if (Ut) swapRows(Ut, m, i, best);
    if (Vt) swapRows(Vt, n, i, best);
  }
  return { s: d, Ut, Vt, converged };
}

function swapRows(data: Float64Array, width: number, i: number, j: number): void {
  const io = i * width;
  const jo = j * width;
  for (let c = 0; c < width; c++) {
    const swap = data[io + c];
    data[io + c] = data[jo + c];
    data[jo + c] = swap;
  }
}

function transposeFlat(data: Float64Array, rows: number, cols: number): Float64Array {
  const result = new Float64Array(rows * cols);
  for (let i = 0; i < rows; i++) for (let j = 0; j < cols; j++) result[j * rows + i] = data[i * cols + j];
  return result;
}

/**
 * Thin SVD A = U·diag(s)·Vᵀ of an m×n Dense matrix by Golub–Kahan–Reinsch. Non-finite input gives
 * NaN values and factors with converged = false; an entry scale near overflow or underflow is
 * removed by an exact power-of-two scaling first.
 */
export function bidiagonalSvdDense(matrix: Dense, wantVectors: boolean): BidiagonalSvd {
  const m = matrix.rows;
  const n = matrix.cols;
  const k = Math.min(m, n);
  if (k === 0) {
    return {
      U: wantVectors ? { rows: m, cols: 0, data: new Float64Array(0) } : null,
      s: new Float64Array(0),
      V: wantVectors ? { rows: n, cols: 0, data: new Float64Array(0) } : null,
      converged: true,
    };
  }
  let largest = 0;
  for (let i = 0; i < matrix.data.length; i++) {
    const magnitude = Math.abs(matrix.data[i]);
    if (!(magnitude <= Number.MAX_VALUE)) {
      const nanDense = (rows: number): Dense => ({ rows, cols: k, data: new Float64Array(rows * k).fill(NaN) });
      return { U: wantVectors ? nanDense(m) : null, s: new Float64Array(k).fill(NaN), V: wantVectors ? nanDense(n) : null, converged: false };
    }
    if (magnitude > largest) largest = magnitude;
  }
  const tall = m >= n;
  let data = tall ? matrix.data : transposeFlat(matrix.data, m, n);
  const rows = tall ? m : n;
  const cols = k;
  // Exact power-of-two scaling keeps sums of squares representable (LAPACK dgesvd scales likewise).
  // Two factors, since 2^p alone overflows for the subnormal range.
  let firstScale = 1;
  let secondScale = 1;
  if (largest > 0 && (largest > 2 ** 480 || largest < 2 ** -480)) {
    const exponent = -Math.round(Math.log2(largest));
    firstScale = 2 ** Math.trunc(exponent / 2);
    secondScale = 2 ** (exponent - Math.trunc(exponent / 2));
    data = data.map((value) => value * firstScale * secondScale);
  }
  const result = tallBidiagonalSvd(data, rows, cols, wantVectors);
  if (firstScale !== 1) for (let i = 0; i < k; i++) result.s[i] = result.s[i] / firstScale / secondScale;
  if (!wantVectors) return { U: null, s: result.s, V: null, converged: result.converged };
  // For the tall problem: U = (Uᵀ)ᵀ is rows×k, V = (Vᵀ)ᵀ is k×k.
  const leftFactor: Dense = { rows, cols: k, data: transposeFlat(result.Ut!, k, rows) };
  const rightFactor: Dense = { rows: k, cols: k, data: transposeFlat(result.Vt!, k, k) };
  return tall
    ? { U: leftFactor, s: result.s, V: rightFactor, converged: result.converged }
    : { U: rightFactor, s: result.s, V: leftFactor, converged: result.converged };
}
