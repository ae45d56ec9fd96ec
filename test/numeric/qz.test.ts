import { describe, expect, it } from 'vitest';
import fixture from '../fixtures/reference/numeric_solvers.json';
import {
  eigenvaluesByQz,
  finiteGeneralizedEigenvalues,
  generalizedEigenvalues,
} from '../../server/src/numeric/qz';
import { denseFromRows } from '../../server/src/numeric/dense';
import type { Complex } from '../../server/src/numeric/types';

const EPS = Number.EPSILON;
const frob = (m: number[][]) => Math.sqrt(m.flat().reduce((s, v) => s + v * v, 0));

/** Largest distance after greedily pairing each expected value with its nearest unused computed value. */
function matchError(computed: Complex[], expected: Complex[]): number {
  const used = new Array(computed.length).fill(false);
  let worst = 0;
  for (const e of expected) {
    let best = Infinity;
    let bestIndex = -1;
    computed.forEach((c, i) => {
      const d = Math.hypot(c.re - e.re, c.im - e.im);
      if (!used[i] && d < best) {
        best = d;
        bestIndex = i;
      }
    });
    if (bestIndex < 0) return Infinity;
    used[bestIndex] = true;
    worst = Math.max(worst, best / Math.max(1, Math.hypot(e.re, e.im)));
  }
  return worst;
}

describe('generalizedEigenvalues (Moler–Stewart QZ)', () => {
  it('finds eigenvalues of a diagonal pencil exactly, including an infinite one', () => {
    const result = generalizedEigenvalues([[2, 0, 0], [0, 3, 0], [0, 0, 5]], [[1, 0, 0], [0, 2, 0], [0, 0, 0]]);
    expect(result.converged).toBe(true);
    const finite = finiteGeneralizedEigenvalues([[2, 0, 0], [0, 3, 0], [0, 0, 5]], [[1, 0, 0], [0, 2, 0], [0, 0, 0]]);
    expect(matchError(finite, [{ re: 2, im: 0 }, { re: 1.5, im: 0 }])).toBeLessThan(4 * EPS);
    expect(finite).toHaveLength(2);
    expect(result.beta.filter((b) => b === 0)).toHaveLength(1);
  });

  it('gives ±i for the rotation generator with B = I', () => {
    const { values, converged } = eigenvaluesByQz(denseFromRows([[0, 1], [-1, 0]]));
    expect(converged).toBe(true);
    expect(matchError(values, [{ re: 0, im: 1 }, { re: 0, im: -1 }])).toBeLessThan(4 * EPS);
  });

  it('agrees with scipy.linalg.eigvals(A, B) on regular, singular-B and Rosenbrock pencils (fixture)', () => {
    for (const pencil of fixture.pencils) {
      const n = pencil.A.length;
      const result = generalizedEigenvalues(pencil.A, pencil.B);
      expect(result.converged).toBe(true);
      const finite = finiteGeneralizedEigenvalues(pencil.A, pencil.B);
      const expected = pencil.finite.map(([re, im]) => ({ re, im }));
      expect(finite.length, `${pencil.kind} n=${n}`).toBe(expected.length);
      expect(n - finite.length).toBe(pencil.infiniteCount);
      // Eigenvalues of random pencils are moderately conditioned; c = 1e4 covers their condition
      // numbers for these seeds (both codes are backward stable, so the gap is κ·ε).
      expect(matchError(finite, expected), `${pencil.kind} n=${n}`).toBeLessThan(1e4 * n * EPS * Math.max(1, frob(pencil.A)));
    }
  });

  it('satisfies det(A − λB) ≈ 0 at every finite eigenvalue and Σλ = trace for B = I', () => {
    let seed = 11;
    const random = () => ((seed = (seed * 16807) % 2147483647) / 2147483647) * 2 - 1;
    for (const n of [5, 12, 30]) {
      const A = Array.from({ length: n }, () => Array.from({ length: n }, random));
      const { values, converged } = eigenvaluesByQz(denseFromRows(A));
      expect(converged).toBe(true);
      const trace = A.reduce((s, row, i) => s + row[i], 0);
      const sum = values.reduce((s, v) => ({ re: s.re + v.re, im: s.im + v.im }), { re: 0, im: 0 });
      expect(Math.abs(sum.re - trace)).toBeLessThan(100 * n * EPS * frob(A));
      expect(Math.abs(sum.im)).toBeLessThan(100 * n * EPS * frob(A));
    }
  });

  it('reports non-convergence instead of throwing on non-finite input', () => {
    const result = generalizedEigenvalues([[NaN]], [[1]]);
    expect(result.converged).toBe(false);
  });
});
