// Comparison with NumPy 2.4.6 / SciPy 1.17.1 (LAPACK dgeev, dgesdd; numpy.roots) values written by
// test/reference/numeric_core.py into test/fixtures/reference/numeric_core.json.
import { describe, expect, it } from 'vitest';
import reference from '../fixtures/reference/numeric_core.json';
import { eigenvalues } from '../../server/src/numeric/eigenvectors';
import { polynomialRoots } from '../../server/src/numeric/polynomial';
import { numericalRank } from '../../server/src/numeric/rank';
import { singularValues } from '../../server/src/numeric/svd';
import type { Complex } from '../../server/src/numeric/types';

const EPS = Number.EPSILON;
/** Safety factor over the first-order perturbation bound n·ε·‖A‖·κ (common practice: 10–100). */
const SAFETY = 100;

/** Matches each reference value to the nearest not-yet-used computed value; returns the distances. */
function matchedDistances(computed: Complex[], expected: number[][]): number[] {
  const used = new Array(computed.length).fill(false);
  return expected.map(([re, im]) => {
    let best = Infinity;
    let bestIndex = -1;
    computed.forEach((value, index) => {
      if (used[index]) return;
      const distance = Math.hypot(value.re - re, value.im - im);
      if (distance < best) {
        best = distance;
        bestIndex = index;
      }
    });
    used[bestIndex] = true;
    return best;
  });
}

describe('eigenvalues against scipy.linalg.eig (SciPy 1.17.1)', () => {
  it.each(reference.eigen.map((c, i) => [i, c.A.length, c] as const))('case %i (n = %i)', (_index, n, c) => {
    const computed = eigenvalues(c.A);
    expect(computed.length).toBe(n);
    // Same spectrum as a set, within SAFETY·n·ε·‖balanced A‖_F·κ_i for each eigenvalue.
    matchedDistances(computed, c.eigenvalues).forEach((distance, i) => {
      expect(distance).toBeLessThanOrEqual(SAFETY * n * EPS * c.balancedNorm * c.kappa[i]);
    });
  });
});

describe('singular values against numpy.linalg.svd (NumPy 2.4.6)', () => {
  it.each(reference.singular.map((c, i) => [i, c.A.length, c.A[0].length, c] as const))('case %i (%i×%i)', (_index, m, n, c) => {
    const computed = singularValues(c.A);
    expect(computed.length).toBe(Math.min(m, n));
    // Singular values are perfectly conditioned in absolute terms: |Δσ| ≤ ‖ΔA‖₂ (Weyl).
    computed.forEach((sigma, i) => {
      expect(Math.abs(sigma - c.singularValues[i])).toBeLessThanOrEqual(SAFETY * Math.max(m, n) * EPS * c.singularValues[0]);
    });
  });
});

describe('numerical rank against numpy.linalg.matrix_rank (NumPy 2.4.6)', () => {
  it.each(reference.ranks.map((c, i) => [i, c.rank, c] as const))('case %i has rank %i', (_index, rank, c) => {
    expect(numericalRank(c.A)).toBe(rank);
    expect(c.constructedRank).toBe(rank);
  });
});

describe('polynomial roots against numpy.roots (NumPy 2.4.6)', () => {
  it.each(reference.polynomials.map((c, i) => [i, c.coefficients.length - 1, c] as const))('case %i (degree %i)', (_index, degree, c) => {
    const computed = polynomialRoots(c.coefficients);
    expect(computed.length).toBe(degree);
    // Root conditioning measured as companion-matrix eigenvalue conditioning (numpy.roots uses the
    // same companion matrix and LAPACK dgeev).
    matchedDistances(computed, c.roots).forEach((distance, i) => {
      expect(distance).toBeLessThanOrEqual(SAFETY * degree * EPS * c.balancedNorm * Math.max(...c.kappa));
    });
  });
});
