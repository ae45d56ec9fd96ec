// Golub–Kahan–Reinsch SVD (server/src/numeric/bidiagonalSvd.ts, the default method of svd.ts):
// identities, shapes, rank deficiency, relative accuracy on bidiagonal input, non-finite input,
// and NumPy 2.4.6 singular values (numpy.linalg.svd, LAPACK dgesdd) from
// test/fixtures/reference/numeric_core.json, written by test/reference/numeric_core.py.
import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import reference from '../fixtures/reference/numeric_core.json';
import { bidiagonalSvdDense } from '../../server/src/numeric/bidiagonalSvd';
import { denseFromRows, identity, multiply, normFrobenius, subtract, transpose } from '../../server/src/numeric/dense';
import { qrDecomposition } from '../../server/src/numeric/qr';
import { singularValues, svd, type SvdMethod } from '../../server/src/numeric/svd';
import type { Rows } from '../../server/src/numeric/types';
import { seededMatrix } from './coreTestMatrices';

const EPS = Number.EPSILON;
/** Safety factor over the backward-error bound max(m, n)·ε·‖A‖ (common practice: 10–100). */
const SAFETY = 100;

function orthonormalityError(Q: Rows): number {
  const k = Q[0]?.length ?? 0;
  return normFrobenius(subtract(multiply(transpose(Q), Q), identity(k)));
}

function reconstructionError(A: Rows, U: Rows, s: number[], V: Rows): number {
  const USigma = U.map((row) => row.map((value, j) => value * s[j]));
  return normFrobenius(subtract(multiply(USigma, transpose(V)), A));
}

/** n×n upper bidiagonal with the given diagonal and superdiagonal. */
function bidiagonal(d: number[], e: number[]): Rows {
  return d.map((value, i) => d.map((_, j) => (j === i ? value : j === i + 1 ? e[i] : 0)));
}

describe('Golub–Kahan–Reinsch SVD', () => {
  it.each([[1, 1], [2, 2], [5, 3], [3, 5], [1, 7], [7, 1], [30, 30], [80, 45], [45, 80]])(
    'gives U·Σ·Vᵀ = A, orthonormal thin factors and descending σ (%i×%i)',
    (m, n) => {
      const A = seededMatrix(m, n, 3000 + 7 * m + n);
      const { U, s, V, converged } = svd(A);
      const k = Math.min(m, n);
      expect(converged).toBe(true);
      expect([U.length, U[0].length, V.length, V[0].length, s.length]).toEqual([m, k, n, k, k]);
      for (let i = 1; i < k; i++) expect(s[i]).toBeLessThanOrEqual(s[i - 1]);
      expect(s[k - 1]).toBeGreaterThanOrEqual(0);
      expect(reconstructionError(A, U, s, V)).toBeLessThan(SAFETY * Math.max(m, n) * EPS * normFrobenius(A));
      expect(orthonormalityError(U)).toBeLessThan(SAFETY * Math.max(m, n) * EPS);
      expect(orthonormalityError(V)).toBeLessThan(SAFETY * Math.max(m, n) * EPS);
      // The values-only path runs the same sweeps without vectors: the same values.
      expect(singularValues(A)).toEqual(s);
    },
  );

  it.each(['bidiagonal-qr', 'jacobi'] as SvdMethod[])('agrees with numpy.linalg.svd on the reference matrices (%s)', (method) => {
    for (const c of reference.singular) {
      const m = c.A.length;
      const n = c.A[0].length;
      const computed = singularValues(c.A, { method });
      expect(computed.length).toBe(c.singularValues.length);
      computed.forEach((sigma, i) =>
        expect(Math.abs(sigma - c.singularValues[i])).toBeLessThanOrEqual(SAFETY * Math.max(m, n) * EPS * c.singularValues[0]),
      );
    }
  });

  it('returns empty factors for empty matrices', () => {
    for (const [m, n] of [[0, 0], [0, 3], [3, 0]]) {
      const result = bidiagonalSvdDense({ rows: m, cols: n, data: new Float64Array(0) }, true);
      expect(result.s.length).toBe(0);
      expect([result.U!.rows, result.U!.cols, result.V!.rows, result.V!.cols]).toEqual([m, 0, n, 0]);
      expect(result.converged).toBe(true);
    }
  });

  it('reveals exact rank deficiency with orthonormal factors', () => {
    for (const [m, n, r] of [[12, 9, 4], [9, 12, 3], [20, 20, 1]]) {
      const A = multiply(seededMatrix(m, r, 70 + m), seededMatrix(r, n, 71 + n));
      const { U, s, V, converged } = svd(A);
      expect(converged).toBe(true);
      // Rank-revealing rule of numericalRank: σ ≤ max(m, n)·ε·σ_max is zero (NumPy's matrix_rank rule).
      expect(s.filter((sigma) => sigma > SAFETY * Math.max(m, n) * EPS * s[0]).length).toBe(r);
      expect(reconstructionError(A, U, s, V)).toBeLessThan(SAFETY * Math.max(m, n) * EPS * normFrobenius(A));
      expect(orthonormalityError(U)).toBeLessThan(SAFETY * Math.max(m, n) * EPS);
      expect(orthonormalityError(V)).toBeLessThan(SAFETY * Math.max(m, n) * EPS);
    }
    const zero = svd([[0, 0, 0], [0, 0, 0]]);
    expect(zero.s).toEqual([0, 0]);
    expect(orthonormalityError(zero.U)).toBeLessThan(10 * EPS);
    expect(orthonormalityError(zero.V)).toBeLessThan(10 * EPS);
  });

  it('keeps repeated singular values of a scaled orthogonal matrix', () => {
    const Q = qrDecomposition(seededMatrix(25, 25, 5)).Q;
    const s = singularValues(Q.map((row) => row.map((value) => 3 * value)));
    s.forEach((sigma) => expect(Math.abs(sigma - 3)).toBeLessThan(SAFETY * 25 * EPS * 3));
  });

  it('gives every singular value of a graded bidiagonal matrix to high relative accuracy', () => {
    // For an upper bidiagonal B, Π σ_i = |det B| = Π |d_i| exactly, and the zero-shift QR of
    // Demmel & Kahan (1990) determines each σ_i to a relative error of about n²·ε; an absolute
    // error of ε·σ_max in the tiny values would break the product by orders of magnitude.
    const n = 12;
    const d = Array.from({ length: n }, (_, i) => 10 ** (-2 * i) * (1 + 0.1 * i));
    const e = Array.from({ length: n - 1 }, (_, i) => 10 ** (-2 * i - 1) * (0.5 + 0.05 * i));
    const B = bidiagonal(d, e);
    const s = singularValues(B);
    const logProduct = s.reduce((sum, sigma) => sum + Math.log(sigma), 0);
    const logDeterminant = d.reduce((sum, value) => sum + Math.log(Math.abs(value)), 0);
    expect(Math.abs(logProduct - logDeterminant)).toBeLessThan(SAFETY * n * n * EPS);
    // One-sided Jacobi is also relatively accurate on this matrix (Demmel & Veselić 1992).
    const jacobi = singularValues(B, { method: 'jacobi' });
    s.forEach((sigma, i) => expect(Math.abs(sigma - jacobi[i]) / jacobi[i]).toBeLessThan(SAFETY * n * EPS));
  });

  it('has the closed-form singular values 2·cos(kπ/(2n+1)) for the bidiagonal of ones', () => {
    // BᵀB is the second-difference matrix with one free end, eigenvalues 4·cos²(kπ/(2n+1)),
    // k = 1…n (from memory; checked here also by σ_max² + … = ‖B‖_F² = 2n − 1).
    const n = 9;
    const s = singularValues(bidiagonal(new Array(n).fill(1), new Array(n - 1).fill(1)));
    s.forEach((sigma, i) => expect(Math.abs(sigma - 2 * Math.cos(((i + 1) * Math.PI) / (2 * n + 1)))).toBeLessThan(SAFETY * n * EPS));
    expect(Math.abs(s.reduce((sum, sigma) => sum + sigma * sigma, 0) - (2 * n - 1))).toBeLessThan(SAFETY * n * EPS);
  });

  it('scales entries near overflow and underflow exactly', () => {
    const A = seededMatrix(6, 4, 8);
    const reference = singularValues(A);
    for (const factor of [2 ** 1000, 2 ** -1000]) {
      const scaled = singularValues(A.map((row) => row.map((value) => value * factor)));
      scaled.forEach((sigma, i) => expect(Math.abs(sigma / factor - reference[i])).toBeLessThan(SAFETY * 6 * EPS * reference[0]));
    }
    // Subnormal entries (2^-1040) lose bits on input but must neither overflow the scaling nor give NaN.
    const subnormal = singularValues(A.map((row) => row.map((value) => value * 2 ** -1040)));
    subnormal.forEach((sigma, i) => expect(Math.abs(sigma / 2 ** -1040 - reference[i])).toBeLessThan(1e-6 * reference[0]));
  });

  it('reports non-finite input with NaN values and converged = false, without throwing', () => {
    for (const bad of [NaN, Infinity, -Infinity]) {
      const A = seededMatrix(5, 3, 2);
      A[2][1] = bad;
      const result = bidiagonalSvdDense(denseFromRows(A), true);
      expect(result.converged).toBe(false);
      expect(Array.from(result.s).every(Number.isNaN)).toBe(true);
      expect([result.U!.rows, result.U!.cols, result.V!.rows, result.V!.cols]).toEqual([5, 3, 3, 3]);
      expect(singularValues(transpose(A)).every(Number.isNaN)).toBe(true);
    }
  });

  it('terminates, converges and reconstructs matrices of zeros, subnormals and huge entries', () => {
    // Mixed magnitudes exercise the power-of-two scaling, dlarfg's subnormal rescaling and the
    // deflation logic; before those guards such inputs gave NaN factors and a non-terminating loop.
    const entry = fc.constantFrom(0, 0, 1, -1, 3, 1e-8, 1e-300, -1e-300, 1e300, 8.095e-320);
    const matrix = fc
      .record({ m: fc.integer({ min: 1, max: 9 }), n: fc.integer({ min: 1, max: 9 }) })
      .chain(({ m, n }) => fc.array(fc.array(entry, { minLength: n, maxLength: n }), { minLength: m, maxLength: m }));
    fc.assert(
      fc.property(matrix, (A) => {
        const m = A.length;
        const n = A[0].length;
        const { U, s, V, converged } = svd(A);
        expect(converged).toBe(true);
        for (let i = 1; i < s.length; i++) expect(s[i]).toBeLessThanOrEqual(s[i - 1]);
        const largest = Math.max(...A.flat().map(Math.abs));
        const USigma = U.map((row) => row.map((value, j) => value * s[j]));
        const residual = subtract(multiply(USigma, transpose(V)), A);
        const worst = Math.max(...residual.flat().map(Math.abs));
        expect(worst).toBeLessThanOrEqual(SAFETY * Math.max(m, n) * EPS * largest);
      }),
      { numRuns: 300, seed: 20261202 },
    );
  });
});
