import { describe, expect, it } from 'vitest';
import { identity, multiply, normFrobenius, subtract, transpose } from '../../server/src/numeric/dense';
import { hessenbergDecomposition } from '../../server/src/numeric/hessenberg';
import { realSchur } from '../../server/src/numeric/schur';
import { orderedRealSchur } from '../../server/src/numeric/schurReorder';
import type { Complex, Rows } from '../../server/src/numeric/types';
import { seededMatrix } from './coreTestMatrices';

const EPS = Number.EPSILON;

function checkSchurIdentities(A: Rows, T: Rows, Z: Rows): void {
  const n = A.length;
  const scaleA = Math.max(normFrobenius(A), Number.MIN_VALUE);
  // A = Z·T·Zᵀ and ZᵀZ = I to a modest multiple of n·ε.
  expect(normFrobenius(subtract(multiply(multiply(Z, T), transpose(Z)), A))).toBeLessThanOrEqual(20 * n * EPS * scaleA);
  expect(normFrobenius(subtract(multiply(transpose(Z), Z), identity(n)))).toBeLessThan(20 * n * EPS);
  // Quasi-triangular with standardised 2×2 blocks (equal diagonal, off-diagonals of opposite sign).
  let belowSubdiagonal = 0;
  for (let i = 0; i < n; i++) for (let j = 0; j < i - 1; j++) belowSubdiagonal = Math.max(belowSubdiagonal, Math.abs(T[i][j]));
  expect(belowSubdiagonal).toBe(0);
  for (let i = 1; i < n; i++) {
    if (T[i][i - 1] !== 0) {
      if (i + 1 < n) expect(T[i + 1][i]).toBe(0);
      expect(T[i][i]).toBe(T[i - 1][i - 1]);
      expect(Math.sign(T[i][i - 1]) * Math.sign(T[i - 1][i])).toBe(-1);
    }
  }
}

function diagonalEigenvalues(T: Rows): Complex[] {
  const n = T.length;
  const values: Complex[] = [];
  for (let k = 0; k < n; ) {
    if (k + 1 < n && T[k + 1][k] !== 0) {
      const im = Math.sqrt(Math.abs(T[k][k + 1])) * Math.sqrt(Math.abs(T[k + 1][k]));
      values.push({ re: T[k][k], im }, { re: T[k][k], im: -im });
      k += 2;
    } else {
      values.push({ re: T[k][k], im: 0 });
      k++;
    }
  }
  return values;
}

describe('Hessenberg reduction', () => {
  it('gives A = Q·H·Qᵀ with H upper Hessenberg', () => {
    const n = 11;
    const A = seededMatrix(n, n, 21);
    const { H, Q } = hessenbergDecomposition(A);
    expect(normFrobenius(subtract(multiply(multiply(Q, H), transpose(Q)), A))).toBeLessThan(20 * n * EPS * normFrobenius(A));
    for (let i = 0; i < n; i++) for (let j = 0; j < i - 1; j++) expect(H[i][j]).toBe(0);
  });
});

describe('real Schur form', () => {
  it.each([1, 2, 3, 4, 7, 16, 40, 90])('satisfies A = Z·T·Zᵀ for a random matrix of order %i', (n) => {
    const A = seededMatrix(n, n, 100 + n);
    const { T, Z, converged } = realSchur(A);
    expect(converged).toBe(true);
    checkSchurIdentities(A, T, Z);
  });

  it('handles a Jordan block, a zero matrix and a symmetric matrix', () => {
    const jordan = [[2, 1, 0, 0], [0, 2, 1, 0], [0, 0, 2, 1], [0, 0, 0, 2]];
    const zero = [[0, 0, 0], [0, 0, 0], [0, 0, 0]];
    const S = seededMatrix(6, 6, 5);
    const symmetric = multiply(S, transpose(S));
    for (const A of [jordan, zero, symmetric]) {
      const { T, Z, converged } = realSchur(A);
      expect(converged).toBe(true);
      checkSchurIdentities(A, T, Z);
    }
  });

  it('finds the complex pair of a rotation generator in standard form', () => {
    // [[0, 1], [−4, 0]] has eigenvalues ±2i (exact).
    const { T, converged } = realSchur([[0, 1], [-4, 0]]);
    expect(converged).toBe(true);
    const values = diagonalEigenvalues(T);
    expect(values[0].re).toBeCloseTo(0, 14);
    expect(Math.abs(values[0].im)).toBeCloseTo(2, 14);
  });

  it('reports non-convergence instead of iterating forever when the sweep budget is exhausted', () => {
    const A = seededMatrix(30, 30, 9);
    expect(realSchur(A, { maxSweeps: 3 }).converged).toBe(false);
    expect(realSchur(A, { maxSweeps: 0 }).converged).toBe(false);
  });

  it('reports failure for non-finite data', () => {
    expect(realSchur([[NaN, 1], [1, 1]]).converged).toBe(false);
    expect(realSchur([[Infinity, 1], [0, 1]]).converged).toBe(false);
    expect(orderedRealSchur([[NaN]], (lambda) => lambda.re < 0).converged).toBe(false);
  });

  it('converges on the cyclic permutation matrix, a classic stagnation case for unshifted QR', () => {
    const n = 8;
    const P = Array.from({ length: n }, (_, i) => Array.from({ length: n }, (_, j) => (j === (i + 1) % n ? 1 : 0)));
    const { T, Z, converged } = realSchur(P);
    expect(converged).toBe(true);
    checkSchurIdentities(P, T, Z);
    // Eigenvalues are the 8th roots of unity.
    for (const lambda of diagonalEigenvalues(T)) expect(Math.hypot(lambda.re, lambda.im)).toBeCloseTo(1, 12);
  });
});

describe('ordered real Schur form', () => {
  const stable = (lambda: Complex) => lambda.re < 0;

  it.each([5, 12, 33])('puts the stable eigenvalues first and keeps the spectrum (n = %i)', (n) => {
    const A = seededMatrix(n, n, 300 + n);
    const plain = realSchur(A);
    const ordered = orderedRealSchur(A, stable);
    expect(ordered.converged).toBe(true);
    expect(ordered.reordered).toBe(true);
    checkSchurIdentities(A, ordered.T, ordered.Z);
    const before = diagonalEigenvalues(plain.T);
    const after = diagonalEigenvalues(ordered.T);
    const expectedCount = before.filter((lambda) => lambda.re < 0).length;
    expect(ordered.selectedCount).toBe(expectedCount);
    after.forEach((lambda, index) => expect(lambda.re < 0).toBe(index < expectedCount));
    const key = (values: Complex[]) => values.map((v) => [v.re, v.im]).sort((a, b) => a[0] - b[0] || a[1] - b[1]);
    const sortedBefore = key(before);
    const sortedAfter = key(after);
    const tolerance = 1e3 * n * EPS * normFrobenius(A);
    sortedBefore.forEach((value, i) => {
      expect(Math.abs(value[0] - sortedAfter[i][0])).toBeLessThan(tolerance);
      expect(Math.abs(value[1] - sortedAfter[i][1])).toBeLessThan(tolerance);
    });
  });

  it('gives an invariant subspace: A·Z₁ = Z₁·T₁₁ for the leading columns', () => {
    // Hamiltonian-like 2n×2n matrix with n stable and n unstable eigenvalues.
    const n = 4;
    const F = seededMatrix(n, n, 77);
    const G = multiply(F, transpose(F));
    const H = [...F.map((row, i) => [...row, ...G[i].map((v) => -v)]), ...G.map((row, i) => [...row.map((v) => -v), ...F.map((r) => -r[i])])];
    const { T, Z, selectedCount, reordered } = orderedRealSchur(H, stable);
    expect(reordered).toBe(true);
    expect(selectedCount).toBe(n);
    const Z1 = Z.map((row) => row.slice(0, n));
    const T11 = T.slice(0, n).map((row) => row.slice(0, n));
    expect(normFrobenius(subtract(multiply(H, Z1), multiply(Z1, T11)))).toBeLessThan(100 * n * EPS * normFrobenius(H));
  });

  it('swaps equal and nearly equal eigenvalues without failing', () => {
    const A = [[1, 5, 2], [0, -1, 3], [0, 0, 1]];
    const ordered = orderedRealSchur(A, stable);
    expect(ordered.reordered).toBe(true);
    expect(ordered.selectedCount).toBe(1);
    expect(ordered.T[0][0]).toBeCloseTo(-1, 14);
    checkSchurIdentities(A, ordered.T, ordered.Z);
  });

  it('moves real eigenvalues one by one (rotation swaps) in a non-normal matrix of known spectrum', () => {
    // A = Q·(D + U)·Qᵀ: D diagonal with interleaved signs, U strictly upper triangular, Q orthogonal;
    // the spectrum is D's diagonal by construction, every swap is between 1×1 blocks.
    const n = 40;
    const diagonal = Array.from({ length: n }, (_, i) => (i % 2 === 0 ? 1 : -1) * (1 + i / 4));
    const U = seededMatrix(n, n, 41).map((row, i) => row.map((value, j) => (j > i ? value : j === i ? diagonal[i] : 0)));
    const { Z: Q } = realSchur(seededMatrix(n, n, 42));
    const A = multiply(multiply(Q, U), transpose(Q));
    const ordered = orderedRealSchur(A, stable);
    expect(ordered.reordered).toBe(true);
    expect(ordered.selectedCount).toBe(n / 2);
    checkSchurIdentities(A, ordered.T, ordered.Z);
    const leading = diagonalEigenvalues(ordered.T).slice(0, n / 2).map((v) => v.re).sort((a, b) => a - b);
    const expected = diagonal.filter((v) => v < 0).sort((a, b) => a - b);
    leading.forEach((value, i) => expect(Math.abs(value - expected[i])).toBeLessThan(1e3 * n * EPS * normFrobenius(A)));
    const Z1 = ordered.Z.map((row) => row.slice(0, n / 2));
    const T11 = ordered.T.slice(0, n / 2).map((row) => row.slice(0, n / 2));
    expect(normFrobenius(subtract(multiply(A, Z1), multiply(Z1, T11)))).toBeLessThan(100 * n * EPS * normFrobenius(A));
  });

  it('moves complex pairs past complex pairs', () => {
    // Block-diagonal of rotations with growth rates +1, −2, +3, −4 in a random orthogonal basis.
    const blocks = [[1, 3], [-2, 5], [3, 7], [-4, 11]];
    const n = 8;
    const D = Array.from({ length: n }, () => new Array(n).fill(0));
    blocks.forEach(([sigma, omega], b) => {
      D[2 * b][2 * b] = sigma;
      D[2 * b + 1][2 * b + 1] = sigma;
      D[2 * b][2 * b + 1] = omega;
      D[2 * b + 1][2 * b] = -omega;
    });
    const { Z: Q } = realSchur(seededMatrix(n, n, 8)); // any orthogonal matrix
    const A = multiply(multiply(Q, D), transpose(Q));
    const ordered = orderedRealSchur(A, stable);
    expect(ordered.selectedCount).toBe(4);
    checkSchurIdentities(A, ordered.T, ordered.Z);
    const leading = diagonalEigenvalues(ordered.T).slice(0, 4).map((v) => v.re).sort((a, b) => a - b);
    expect(leading[0]).toBeCloseTo(-4, 12);
    expect(leading[3]).toBeCloseTo(-2, 12);
  });
});
