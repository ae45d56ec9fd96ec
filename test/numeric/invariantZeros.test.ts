import { describe, expect, it } from 'vitest';
import fixture from '../fixtures/reference/numeric_solvers.json';
import { invariantZeros } from '../../server/src/numeric/invariantZeros';
import type { Complex } from '../../server/src/numeric/types';
import { EPS, frob } from './solverTestMatrices';

function sorted(values: Complex[]): Complex[] {
  return [...values].sort((a, b) => a.re - b.re || a.im - b.im);
}
function closeSets(a: Complex[], b: Complex[], tolerance: number): boolean {
  if (a.length !== b.length) return false;
  const used = new Array(a.length).fill(false);
  return b.every((target) => {
    let best = -1;
    let bestDistance = Infinity;
    a.forEach((value, i) => {
      const d = Math.hypot(value.re - target.re, value.im - target.im);
      if (!used[i] && d < bestDistance) {
        bestDistance = d;
        best = i;
      }
    });
    if (best < 0 || bestDistance > tolerance * Math.max(1, Math.hypot(target.re, target.im))) return false;
    used[best] = true;
    return true;
  });
}

describe('invariantZeros (Emami-Naeini & Van Dooren reduction + QZ)', () => {
  it('finds the zero of (s + 2)/((s + 1)(s + 3)) in controllable canonical form', () => {
    const { zeros, normalRank } = invariantZeros([[0, 1], [-3, -4]], [[0], [1]], [[2, 1]], [[0]]);
    expect(normalRank).toBe(1);
    expect(closeSets(zeros, [{ re: -2, im: 0 }], 100 * EPS)).toBe(true);
  });

  it('finds a zero at s = 0 for s/(s + 1) (D ≠ 0)', () => {
    const { zeros } = invariantZeros([[-1]], [[1]], [[-1]], [[1]]);
    expect(zeros).toHaveLength(1);
    expect(Math.hypot(zeros[0].re, zeros[0].im)).toBeLessThan(10 * EPS);
  });

  it('gives no finite zeros for a relative-degree-n SISO chain (triple integrator)', () => {
    const { zeros, normalRank } = invariantZeros([[0, 1, 0], [0, 0, 1], [0, 0, 0]], [[0], [0], [1]], [[1, 0, 0]], [[0]]);
    expect(normalRank).toBe(1);
    expect(zeros).toHaveLength(0);
  });

  it('a 30-state conduction chain heated at one end, measured at node 20: zeros are the eigenvalues of the last 10 nodes', () => {
    // For a tridiagonal A, G(s) = c₁·…·c₁₉ · det(sI − A₂₁..₃₀)/det(sI − A), so the zeros are the
    // eigenvalues of the trailing 10 × 10 block; with diagonal −2 and off-diagonals 1 those are
    // −2 + 2·cos(jπ/11), j = 1…10 (eigenvalues of a Toeplitz tridiagonal matrix, closed form).
    // Nineteen reduction passes, one state removed each.
    const n = 30;
    const A = Array.from({ length: n }, (_, i) => Array.from({ length: n }, (_, j) => (i === j ? -2 : Math.abs(i - j) === 1 ? 1 : 0)));
    const B = A.map((_, i) => [i === 0 ? 1 : 0]);
    const C = [A.map((_, j) => (j === 19 ? 1 : 0))];
    const { zeros, normalRank } = invariantZeros(A, B, C, [[0]]);
    expect(normalRank).toBe(1);
    const expected = Array.from({ length: 10 }, (_, j) => ({ re: -2 + 2 * Math.cos(((j + 1) * Math.PI) / 11), im: 0 }));
    expect(closeSets(zeros, expected, 1e3 * n * EPS)).toBe(true);
  });

  it('non-square: two outputs sharing the factor (s + 2) keep the zero; independent outputs have none', () => {
    const A = [[0, 1], [-3, -4]];
    const B = [[0], [1]];
    // Outputs (s + 2)/den and 2(s + 2)/den: the common factor is a zero of the 2×1 system.
    const shared = invariantZeros(A, B, [[2, 1], [4, 2]], [[0], [0]]);
    expect(shared.normalRank).toBe(1);
    expect(closeSets(shared.zeros, [{ re: -2, im: 0 }], 1e3 * EPS)).toBe(true);
    // Outputs (s + 2)/den and (s + 5)/den: no common root, so no invariant zero.
    const independent = invariantZeros(A, B, [[2, 1], [5, 1]], [[0], [0]]);
    expect(independent.normalRank).toBe(1);
    expect(independent.zeros).toHaveLength(0);
  });

  it('square MIMO with invertible D: zeros = eig(A − B·D⁻¹·C) (fixture Rosenbrock pencils, SciPy QZ)', () => {
    for (const pencil of fixture.pencils.filter((item) => item.kind === 'rosenbrock')) {
      const size = pencil.A.length;
      const n = pencil.B.reduce((count, row, i) => count + (row[i] === 1 ? 1 : 0), 0);
      const m = size - n;
      const A = pencil.A.slice(0, n).map((row) => row.slice(0, n));
      const B = pencil.A.slice(0, n).map((row) => row.slice(n));
      const C = pencil.A.slice(n).map((row) => row.slice(0, n));
      const D = pencil.A.slice(n).map((row) => row.slice(n));
      const { zeros, normalRank } = invariantZeros(A, B, C, D);
      expect(normalRank).toBe(m);
      const expected = pencil.finite.map(([re, im]) => ({ re, im }));
      expect(closeSets(sorted(zeros), expected, 1e4 * size * EPS * frob(pencil.A)), `n=${n} m=${m}`).toBe(true);
    }
  });

  it('non-square: a dependent extra output or input leaves the zeros and the normal rank unchanged', () => {
    // Adding row αᵀ[C D] (or column [B; D]·β) to the Rosenbrock matrix does not change its rank at
    // any s, so the invariant zeros of the fixture's square systems must persist; a generic
    // independent extra output, in contrast, removes them (tall systems generically have none).
    for (const pencil of fixture.pencils.filter((item) => item.kind === 'rosenbrock')) {
      const size = pencil.A.length;
      const n = pencil.B.reduce((count, row, i) => count + (row[i] === 1 ? 1 : 0), 0);
      const m = size - n;
      const A = pencil.A.slice(0, n).map((row) => row.slice(0, n));
      const B = pencil.A.slice(0, n).map((row) => row.slice(n));
      const C = pencil.A.slice(n).map((row) => row.slice(0, n));
      const D = pencil.A.slice(n).map((row) => row.slice(n));
      const expected = pencil.finite.map(([re, im]) => ({ re, im }));
      const tolerance = 1e5 * size * EPS * frob(pencil.A);
      const alpha = C.map((_, i) => 0.5 + i);
      const extraRow = C[0].map((_, j) => C.reduce((sum, row, i) => sum + alpha[i] * row[j], 0));
      const extraD = D[0].map((_, j) => D.reduce((sum, row, i) => sum + alpha[i] * row[j], 0));
      const tall = invariantZeros(A, B, [...C, extraRow], [...D, extraD]);
      expect(tall.normalRank).toBe(m);
      expect(closeSets(tall.zeros, expected, tolerance), `tall n=${n} m=${m}`).toBe(true);
      const beta = B[0].map((_, j) => 1 - 0.3 * j);
      const wideB = B.map((row) => [...row, row.reduce((sum, v, j) => sum + beta[j] * v, 0)]);
      const wideD = D.map((row) => [...row, row.reduce((sum, v, j) => sum + beta[j] * v, 0)]);
      const wide = invariantZeros(A, wideB, C, wideD);
      expect(wide.normalRank).toBe(m);
      expect(closeSets(wide.zeros, expected, tolerance), `wide n=${n} m=${m}`).toBe(true);
      const independentRow = A[0].map((_, j) => Math.cos(1 + 3 * j));
      const generic = invariantZeros(A, B, [...C, independentRow], [...D, D[0].map((_, j) => Math.sin(j))]);
      expect(generic.zeros, `generic tall n=${n} m=${m}`).toHaveLength(0);
    }
  });

  it('finds no zeros for a state-transformed integrator chain (infinite zero of high index)', () => {
    // A 4-integrator chain has a single infinite zero of order 4. After a non-structured similarity
    // transform, QZ on the raw Rosenbrock pencil perturbs such infinite eigenvalues to |λ| ≈ ε^(−1/4)
    // and cannot tell them from finite ones; the reduction removes them exactly.
    const c = Math.cos(0.7);
    const s = Math.sin(0.7);
    const T = [[c, s, 0, 0], [-s, c, 0, 0], [0, 0, c, -s], [0, 0, s, c]]; // orthogonal
    const mul = (a: number[][], b: number[][]) => a.map((row) => b[0].map((_, j) => row.reduce((t, v, k) => t + v * b[k][j], 0)));
    const tr = (a: number[][]) => a[0].map((_, j) => a.map((row) => row[j]));
    const A = mul(mul(T, [[0, 1, 0, 0], [0, 0, 1, 0], [0, 0, 0, 1], [0, 0, 0, 0]]), tr(T));
    const B = mul(T, [[0], [0], [0], [1]]);
    const C = mul([[1, 0, 0, 0]], tr(T));
    const { zeros, normalRank } = invariantZeros(A, B, C, [[0]]);
    expect(normalRank).toBe(1);
    expect(zeros).toHaveLength(0);
    // With output y = x₁ + 3x₂ (numerator 3s + 1) the single zero −1/3 survives the same transform.
    const withZero = invariantZeros(A, B, mul([[1, 3, 0, 0]], tr(T)), [[0]]);
    expect(closeSets(withZero.zeros, [{ re: -1 / 3, im: 0 }], 1e3 * EPS)).toBe(true);
  });

  it('reports normal rank 0 (no zeros) for a system whose input never reaches the output', () => {
    const { zeros, normalRank } = invariantZeros([[-1, 0], [0, -2]], [[1], [0]], [[0, 1]], [[0]]);
    expect(normalRank).toBe(0);
    expect(zeros).toHaveLength(0);
  });
});
