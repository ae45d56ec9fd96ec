import { describe, expect, it } from 'vitest';
import { identity, multiply, normFrobenius, subtract, transpose } from '../../server/src/numeric/dense';
import { applyQFromRight, applyQTranspose, formQ, householderQrDense, qrDecomposition, qrWithPivoting } from '../../server/src/numeric/qr';
import { denseFromRows, denseToRows } from '../../server/src/numeric/dense';
import { minimumSingularValue, nullSpace, numericalRank, orthonormalBasis } from '../../server/src/numeric/rank';
import { conditionNumber2, norm2, singularValues, svd } from '../../server/src/numeric/svd';
import type { Rows } from '../../server/src/numeric/types';
import { seededMatrix } from './coreTestMatrices';

const EPS = Number.EPSILON;

function orthonormalityError(Q: Rows): number {
  const k = Q[0]?.length ?? 0;
  return normFrobenius(subtract(multiply(transpose(Q), Q), identity(k)));
}

/** m×n matrix of exact rank r: product of seeded m×r and r×n factors. */
function rankDeficient(m: number, n: number, r: number, seed: number): Rows {
  return multiply(seededMatrix(m, r, seed), seededMatrix(r, n, seed + 1));
}

describe('Householder QR', () => {
  it.each([[5, 5], [9, 4], [4, 9]])('gives Q·R = A with orthonormal Q (%i×%i)', (m, n) => {
    const A = seededMatrix(m, n, 40 + m * n);
    const { Q, R } = qrDecomposition(A);
    expect(normFrobenius(subtract(multiply(Q, R), A))).toBeLessThan(20 * Math.max(m, n) * EPS * normFrobenius(A));
    expect(orthonormalityError(Q)).toBeLessThan(20 * m * EPS);
    R.forEach((row, i) => row.forEach((value, j) => j < i && expect(value).toBe(0)));
    const complete = qrDecomposition(A, { complete: true });
    expect(complete.Q.length).toBe(m);
    expect(complete.Q[0].length).toBe(m);
    expect(orthonormalityError(complete.Q)).toBeLessThan(20 * m * EPS);
    expect(normFrobenius(subtract(multiply(complete.Q, complete.R), A))).toBeLessThan(20 * Math.max(m, n) * EPS * normFrobenius(A));
  });

  it.each([[12, 3], [7, 7], [5, 9]])('applies Qᵀ from the left and Q from the right as the formed Q does (%i×%i factor)', (m, n) => {
    // Identity: the reflectors applied one by one equal products with the explicit Q (formQ).
    const factor = householderQrDense(denseFromRows(seededMatrix(m, n, 90 + m)), true);
    const Q = denseToRows(formQ(factor, m));
    const left = seededMatrix(m, 4, 91);
    const right = seededMatrix(6, m, 92);
    const tolerance = 20 * m * EPS * Math.max(normFrobenius(left), normFrobenius(right));
    expect(normFrobenius(subtract(denseToRows(applyQTranspose(factor, denseFromRows(left))), multiply(transpose(Q), left)))).toBeLessThan(tolerance);
    expect(normFrobenius(subtract(denseToRows(applyQFromRight(denseFromRows(right), factor)), multiply(right, Q)))).toBeLessThan(tolerance);
    expect(() => applyQTranspose(factor, denseFromRows(right))).toThrow();
  });

  it('pivoted QR reveals the rank and satisfies A·P = Q·R', () => {
    const A = rankDeficient(8, 6, 3, 5);
    const { Q, R, permutation, rank } = qrWithPivoting(A);
    expect(rank).toBe(3);
    const AP = A.map((row) => permutation.map((j) => row[j]));
    expect(normFrobenius(subtract(multiply(Q, R), AP))).toBeLessThan(50 * EPS * normFrobenius(A));
    for (let k = 1; k < R.length; k++) expect(Math.abs(R[k][k])).toBeLessThanOrEqual(Math.abs(R[k - 1][k - 1]) * (1 + 1e-12));
  });
});

describe('singular value decomposition', () => {
  it.each([[1, 1], [3, 3], [7, 4], [4, 7], [20, 20], [60, 45]])('gives U·Σ·Vᵀ = A with orthonormal factors (%i×%i)', (m, n) => {
    const A = seededMatrix(m, n, 900 + m + n);
    const { U, s, V, converged } = svd(A);
    expect(converged).toBe(true);
    const k = Math.min(m, n);
    expect(s.length).toBe(k);
    for (let i = 1; i < k; i++) expect(s[i]).toBeLessThanOrEqual(s[i - 1]);
    const USigma = U.map((row) => row.map((value, j) => value * s[j]));
    expect(normFrobenius(subtract(multiply(USigma, transpose(V)), A))).toBeLessThan(20 * Math.max(m, n) * EPS * normFrobenius(A));
    expect(orthonormalityError(U)).toBeLessThan(20 * Math.max(m, n) * EPS);
    expect(orthonormalityError(V)).toBeLessThan(20 * Math.max(m, n) * EPS);
  });

  it('has exact singular values for a diagonal matrix and orthonormal factors when rank deficient', () => {
    expect(singularValues([[3, 0], [0, -4]])).toEqual([4, 3]);
    const A = rankDeficient(6, 6, 2, 17);
    const { U, s, V } = svd(A);
    expect(s[2]).toBeLessThan(10 * 6 * EPS * s[0]);
    expect(orthonormalityError(U)).toBeLessThan(1e-13);
    expect(orthonormalityError(V)).toBeLessThan(1e-13);
  });

  it('computes tiny singular values to high relative accuracy for a graded matrix', () => {
    // D·B with D = diag(1, 1e-5, 1e-10, 1e-15) and B well conditioned: one-sided Jacobi keeps
    // relative accuracy in each σ (Demmel & Veselić 1992); compare with the exact values of the
    // diagonal scaling of an orthogonal matrix, whose singular values are exactly the d_i.
    const orthogonal = qrDecomposition(seededMatrix(4, 4, 3)).Q;
    const d = [1, 1e-5, 1e-10, 1e-15];
    const A = orthogonal.map((row, i) => row.map((value) => value * d[i]));
    const s = singularValues(A, { method: 'jacobi' });
    d.forEach((value, i) => expect(Math.abs(s[i] - value) / value).toBeLessThan(100 * EPS));
  });

  it('norm2, conditionNumber2, numericalRank and minimumSingularValue agree with the SVD', () => {
    const A = [[2, 0], [0, 0.5]];
    expect(norm2(A)).toBe(2);
    expect(conditionNumber2(A)).toBe(4);
    expect(conditionNumber2([[1, 1], [1, 1]])).toBeGreaterThan(1 / EPS);
    expect(minimumSingularValue(A)).toBe(0.5);
    expect(numericalRank(rankDeficient(7, 9, 4, 23))).toBe(4);
    expect(numericalRank([[0, 0], [0, 0]])).toBe(0);
    expect(numericalRank([[1, 0], [0, 1e-3]], 1e-2)).toBe(1);
  });
});

describe('fundamental subspaces', () => {
  it.each([[7, 5, 3], [4, 9, 2], [6, 6, 6]])('range and null space of a %i×%i matrix of rank %i', (m, n, r) => {
    const A = rankDeficient(m, n, r, 60 + m);
    const range = orthonormalBasis(A);
    expect(range[0].length).toBe(r);
    expect(orthonormalityError(range)).toBeLessThan(1e-13);
    // Projecting A onto its range leaves it unchanged.
    const projected = multiply(range, multiply(transpose(range), A));
    expect(normFrobenius(subtract(projected, A))).toBeLessThan(100 * n * EPS * normFrobenius(A));
    const kernel = nullSpace(A);
    expect(kernel.length).toBe(n);
    const nullity = n - r;
    if (nullity === 0) {
      expect(kernel[0].length).toBe(0);
    } else {
      expect(kernel[0].length).toBe(nullity);
      expect(orthonormalityError(kernel)).toBeLessThan(1e-13);
      expect(normFrobenius(multiply(A, kernel))).toBeLessThan(100 * n * EPS * normFrobenius(A));
    }
  });
});
