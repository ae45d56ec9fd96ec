// Standard form of a real 2×2 block of a Schur form (LAPACK dlanv2): upper triangular for real
// eigenvalues, equal diagonal entries and off-diagonal entries of opposite sign for a complex pair;
// and its application in place to a quasi-triangular matrix and its Schur vectors.

import type { Complex } from './types';

export interface TwoByTwoStandardForm {
  a: number;
  b: number;
  c: number;
  d: number;
  /** Rotation [cs −sn; sn cs] with [a b; c d]_old = R·[a b; c d]_new·Rᵀ. */
  cs: number;
  sn: number;
  eigenvalue1: Complex;
  eigenvalue2: Complex;
}

const EPS = Number.EPSILON;

function signOf(value: number): number {
  return value >= 0 ? 1 : -1;
}

/**
 * Schur factorisation of a real 2×2 matrix in standard form: either upper triangular (real
 * eigenvalues) or with equal diagonal entries and off-diagonal entries of opposite sign
 * (complex pair a ± i·sqrt(|b·c|)). LAPACK dlanv2.
 */
export function standardizeTwoByTwo(a0: number, b0: number, c0: number, d0: number): TwoByTwoStandardForm {
  let a = a0;
  let b = b0;
  let c = c0;
  let d = d0;
  let cs = 1;
  let sn = 0;
  if (c === 0) {
    // already upper triangular
  } else if (b === 0) {
    cs = 0;
    sn = 1;
    const swap = d;
    d = a;
    a = swap;
    b = -c;
    c = 0;
  } else if (a - d === 0 && signOf(b) !== signOf(c)) {
    // already standard
  } else {
    const difference = a - d;
    let p = 0.5 * difference;
    const bcMax = Math.max(Math.abs(b), Math.abs(c));
    const bcMis = Math.min(Math.abs(b), Math.abs(c)) * signOf(b) * signOf(c);
    const scaleFactor = Math.max(Math.abs(p), bcMax);
    let z = (p / scaleFactor) * p + (bcMax / scaleFactor) * bcMis;
    if (z >= 4 * EPS) {
      // Real eigenvalues: reduce to upper triangular.
      z = p + signOf(p) * Math.sqrt(scaleFactor) * Math.sqrt(z);
      a = d + z;
      d = d - (bcMax / z) * bcMis;
      const tau = Math.hypot(c, z);
      cs = z / tau;
      sn = c / tau;
      b = b - c;
      c = 0;
    } else {
      // Complex or nearly equal real eigenvalues: make the diagonal entries equal.
      const sigma = b + c;
      const tau = Math.hypot(sigma, difference);
      cs = Math.sqrt(0.5 * (1 + Math.abs(sigma) / tau));
      sn = -(p / (tau * cs)) * signOf(sigma);
      const aa = a * cs + b * sn;
      const bb = -a * sn + b * cs;
      const cc = c * cs + d * sn;
      const dd = -c * sn + d * cs;
      a = aa * cs + cc * sn;
      b = bb * cs + dd * sn;
      c = -aa * sn + cc * cs;
      d = -bb * sn + dd * cs;
      const mean = 0.5 * (a + d);
      a = mean;
      d = mean;
      if (c !== 0) {
        if (b !== 0) {
          if (signOf(b) === signOf(c)) {
            // Real eigenvalues after all: one more rotation to triangular form.
            const sab = Math.sqrt(Math.abs(b));
            const sac = Math.sqrt(Math.abs(c));
            p = signOf(c) * sab * sac;
            const tauInverse = 1 / Math.sqrt(Math.abs(b + c));
            a = mean + p;
            d = mean - p;
            b = b - c;
            c = 0;
            const cs1 = sab * tauInverse;
            const sn1 = sac * tauInverse;
            const newCs = cs * cs1 - sn * sn1;
            sn = cs * sn1 + sn * cs1;
            cs = newCs;
          }
        } else {
          b = -c;
          c = 0;
          const swap = cs;
          cs = -sn;
          sn = swap;
        }
      }
    }
  }
  const imaginary = c === 0 ? 0 : Math.sqrt(Math.abs(b)) * Math.sqrt(Math.abs(c));
  return {
    a,
    b,
    c,
    d,
    cs,
    sn,
    eigenvalue1: { re: a, im: imaginary },
    eigenvalue2: { re: d, im: imaginary === 0 ? 0 : -imaginary },
  };
}

/**
 * Applies the standardising rotation of the 2×2 block at rows/columns (k, k+1) of the n×n
 * quasi-triangular t (rows k, k+1 to the right of the block, columns k, k+1 above it) and to the
 * columns k, k+1 of z. `rowEnd`/`columnStart` bound the parts of t that are kept up to date.
 */
export function standardizeBlockInPlace(
  t: Float64Array,
  n: number,
  k: number,
  z: Float64Array | null,
  columnStart = 0,
  rowEnd = n - 1,
): TwoByTwoStandardForm {
  const form = standardizeTwoByTwo(t[k * n + k], t[k * n + k + 1], t[(k + 1) * n + k], t[(k + 1) * n + k + 1]);
  t[k * n + k] = form.a;
  t[k * n + k + 1] = form.b;
  t[(k + 1) * n + k] = form.c;
  t[(k + 1) * n + k + 1] = form.d;
  const { cs, sn } = form;
  if (cs === 1 && sn === 0) return form;
  for (let j = k + 2; j <= rowEnd; j++) {
    const x = t[k * n + j];
    const y = t[(k + 1) * n + j];
    t[k * n + j] = cs * x + sn * y;
    t[(k + 1) * n + j] = cs * y - sn * x;
  }
  for (let i = columnStart; i < k; i++) {
    const x = t[i * n + k];
    const y = t[i * n + k + 1];
    t[i * n + k] = cs * x + sn * y;
    t[i * n + k + 1] = cs * y - sn * x;
  }
  if (z) {
    for (let i = 0; i < n; i++) {
      const x = z[i * n + k];
      const y = z[i * n + k + 1];
      z[i * n + k] = cs * x + sn * y;
      z[i * n + k + 1] = cs * y - sn * x;
    }
  }
  return form;
}
