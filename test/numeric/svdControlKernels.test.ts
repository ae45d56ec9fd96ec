// The Rows-level kernels of server/src/control/controlLinearAlgebra.ts now run on the numeric layer
// (Golub–Kahan–Reinsch SVD, Hessenberg–QR eigenvectors, LU): their contracts, checked by identities.
import { describe, expect, it } from 'vitest';
import {
  conditionNumber2,
  eigenvaluesOf,
  norm2,
  realEigenvectors,
  singularValuesOf,
  solveRows,
  thinSvd,
} from '../../server/src/control/controlLinearAlgebra';
import { identity, multiply, normFrobenius, subtract, transpose } from '../../server/src/numeric/dense';
import type { Rows } from '../../server/src/numeric/types';
import { seededMatrix } from './coreTestMatrices';

const EPS = Number.EPSILON;
/** Safety factor over the backward-error bound n·ε·‖A‖ (common practice: 10–100). */
const SAFETY = 100;

describe('control kernels on the numeric layer', () => {
  it.each([[7, 3], [3, 7], [6, 6]])('thinSvd gives thin factors, descending σ and U·Σ·Vᵀ = M (%i×%i)', (p, q) => {
    const M = seededMatrix(p, q, 500 + p * q);
    const { U, s, V } = thinSvd(M);
    const k = Math.min(p, q);
    expect([U.length, U[0].length, V.length, V[0].length, s.length]).toEqual([p, k, q, k, k]);
    for (let i = 1; i < k; i++) expect(s[i]).toBeLessThanOrEqual(s[i - 1]);
    const USigma = U.map((row) => row.map((value, j) => value * s[j]));
    expect(normFrobenius(subtract(multiply(USigma, transpose(V)), M))).toBeLessThan(SAFETY * Math.max(p, q) * EPS * normFrobenius(M));
    expect(normFrobenius(subtract(multiply(transpose(U), U), identity(k)))).toBeLessThan(SAFETY * Math.max(p, q) * EPS);
    expect(normFrobenius(subtract(multiply(transpose(V), V), identity(k)))).toBeLessThan(SAFETY * Math.max(p, q) * EPS);
    singularValuesOf(M).forEach((sigma, i) => expect(Math.abs(sigma - s[i])).toBeLessThan(SAFETY * EPS * s[0]));
  });

  it('keeps the empty and non-finite conventions', () => {
    expect(singularValuesOf([])).toEqual([]);
    expect(thinSvd([[], []])).toEqual({ U: [[], []], s: [], V: [] });
    const bad = [[1, NaN, 0], [0, 1, 2]];
    expect(singularValuesOf(bad).every(Number.isNaN)).toBe(true);
    const factors = thinSvd(bad);
    expect(factors.s.length).toBe(2);
    expect(factors.s.every(Number.isNaN)).toBe(true);
    expect(factors.U).toEqual([[0, 0], [0, 0]]);
    expect(factors.V).toEqual([[0, 0], [0, 0], [0, 0]]);
    expect(realEigenvectors([[Infinity]]).values[0].re).toBeNaN();
    expect(eigenvaluesOf([[NaN, 0], [0, 1]]).every((value) => Number.isNaN(value.re))).toBe(true);
  });

  it('norm2 and conditionNumber2 are σ_max and σ_max/σ_min', () => {
    expect(norm2([[0, -5], [2, 0]])).toBeCloseTo(5, 14);
    expect(conditionNumber2([[0, -5], [2, 0]])).toBeCloseTo(2.5, 14);
    expect(conditionNumber2([[1, 2], [2, 4]])).toBeGreaterThan(1 / (SAFETY * EPS));
  });

  it('realEigenvectors gives A·V = V·D in real block form, a pair listed as (a + iω, a − iω)', () => {
    for (const seed of [1, 2, 3]) {
      const A = seededMatrix(9, 9, 80 + seed);
      const { values, V, blockD } = realEigenvectors(A);
      expect(normFrobenius(subtract(multiply(A, V), multiply(V, blockD)))).toBeLessThan(SAFETY * 9 * EPS * normFrobenius(A) * normFrobenius(V));
      let pairs = 0;
      for (let j = 0; j < 9; j++) {
        if (values[j].im === 0) {
          expect(blockD[j][j]).toBe(values[j].re);
          continue;
        }
        pairs++;
        expect(values[j].im).toBeGreaterThan(0);
        expect(values[j + 1]).toEqual({ re: values[j].re, im: -values[j].im });
        expect([blockD[j][j], blockD[j][j + 1], blockD[j + 1][j], blockD[j + 1][j + 1]]).toEqual([values[j].re, values[j].im, -values[j].im, values[j].re]);
        j++;
      }
      expect(pairs).toBeGreaterThan(0); // a random real 9×9 has complex pairs for these seeds
      // Same spectrum as eigenvaluesOf.
      const sorted = [...values].sort((x, y) => x.re - y.re || x.im - y.im);
      eigenvaluesOf(A).forEach((value, i) => expect(Math.hypot(value.re - sorted[i].re, value.im - sorted[i].im)).toBeLessThan(SAFETY * 9 * EPS * normFrobenius(A)));
    }
  });

  it('solveRows solves A·X = B and flags an exactly singular A', () => {
    const A = seededMatrix(6, 6, 44);
    const B = seededMatrix(6, 2, 45);
    const { X, singular } = solveRows(A, B);
    expect(singular).toBe(false);
    expect(normFrobenius(subtract(multiply(A, X), B))).toBeLessThan(SAFETY * 6 * EPS * normFrobenius(A) * normFrobenius(X));
    const singularCase: Rows = [[1, 2], [2, 4]];
    expect(solveRows(singularCase, [[1], [1]])).toEqual({ X: [[0], [0]], singular: true });
  });
});
