import { describe, expect, it } from 'vitest';
import fixture from '../fixtures/reference/numeric_solvers.json';
import { matrixExponential, matrixExponentialIntegral } from '../../server/src/numeric/expm';

const EPS = Number.EPSILON;

function maxAbsDifference(a: number[][], b: number[][]): number {
  let worst = 0;
  for (let i = 0; i < a.length; i++) for (let j = 0; j < a[i].length; j++) worst = Math.max(worst, Math.abs(a[i][j] - b[i][j]));
  return worst;
}
function frobenius(a: number[][]): number {
  return Math.sqrt(a.reduce((sum, row) => sum + row.reduce((s, v) => s + v * v, 0), 0));
}
function product(a: number[][], b: number[][]): number[][] {
  return a.map((row) => b[0].map((_, j) => row.reduce((sum, v, k) => sum + v * b[k][j], 0)));
}

describe('matrixExponential', () => {
  it('matches the closed form of Moler & Van Loan 2003, example [−49 24; −64 31]', () => {
    // Moler & Van Loan, "Nineteen dubious ways to compute the exponential of a matrix, twenty-five
    // years later", SIAM Review 45(1), 2003: A = V·diag(−1, −17)·V⁻¹ with V = [1 3; 2 4].
    const a = Math.exp(-1);
    const b = Math.exp(-17);
    const exact = [
      [-2 * a + 3 * b, 1.5 * a - 1.5 * b],
      [-4 * a + 4 * b, 3 * a - 2 * b],
    ];
    const computed = matrixExponential([[-49, 24], [-64, 31]]);
    // The problem is ill conditioned (‖A‖ ≈ 100, eigenvector matrix far from orthogonal): allow κ-sized error.
    expect(maxAbsDifference(computed, exact)).toBeLessThan(1e3 * EPS * frobenius(exact));
  });

  it('gives e·[1 1; 0 1] for the Jordan block [1 1; 0 1] (Moler & Van Loan 2003)', () => {
    const computed = matrixExponential([[1, 1], [0, 1]]);
    const exact = [[Math.E, Math.E], [0, Math.E]];
    expect(maxAbsDifference(computed, exact)).toBeLessThan(8 * EPS * Math.E);
  });

  it('handles a large-norm non-normal matrix by scaling and squaring (triangular closed form)', () => {
    // exp([a b; 0 d]) = [e^a, b·(e^a − e^d)/(a − d); 0, e^d] (direct from the power series).
    const a = -1;
    const d = -2;
    const b = 1000;
    const computed = matrixExponential([[a, b], [0, d]]);
    const exact = [[Math.exp(a), (b * (Math.exp(a) - Math.exp(d))) / (a - d)], [0, Math.exp(d)]];
    expect(maxAbsDifference(computed, exact)).toBeLessThan(100 * EPS * frobenius(exact));
  });

  it('satisfies e^A·e^(−A) = I for every Padé degree and for scaling and squaring', () => {
    let seed = 7;
    const random = () => ((seed = (seed * 16807) % 2147483647) / 2147483647) * 2 - 1;
    // Norms chosen to land in each θ_m band of Higham 2005 and beyond (squaring).
    for (const targetNorm of [0.01, 0.2, 0.9, 2, 5, 40]) {
      const n = 6;
      const raw = Array.from({ length: n }, () => Array.from({ length: n }, random));
      const norm1 = Math.max(...raw[0].map((_, j) => raw.reduce((s, row) => s + Math.abs(row[j]), 0)));
      const A = raw.map((row) => row.map((v) => (v * targetNorm) / norm1));
      const E = matrixExponential(A);
      const Einv = matrixExponential(A.map((row) => row.map((v) => -v)));
      const identity = product(E, Einv);
      const expected = identity.map((row, i) => row.map((_, j) => (i === j ? 1 : 0)));
      const scale = frobenius(E) * frobenius(Einv);
      expect(maxAbsDifference(identity, expected)).toBeLessThan(100 * n * EPS * scale);
    }
  });

  it('agrees with scipy.linalg.expm on seeded random matrices (fixture)', () => {
    for (const c of fixture.cases) {
      const A = c.A.map((row) => row.map((v) => v * c.expmT));
      const computed = matrixExponential(A);
      // Both use [13/13] Padé scaling and squaring; allow c·n·ε relative with c = 100.
      const tolerance = 100 * c.n * EPS * frobenius(c.expmAT) * Math.max(1, frobenius(A));
      expect(maxAbsDifference(computed, c.expmAT)).toBeLessThan(tolerance);
    }
  });

  it('reports NaN instead of throwing on non-finite data', () => {
    const computed = matrixExponential([[NaN, 0], [0, 1]]);
    expect(computed.flat().every(Number.isNaN)).toBe(true);
  });
});

describe('matrixExponentialIntegral (Van Loan 1978 block exponential)', () => {
  it('gives the zero-order hold of 1/s²: Φ = [1 T; 0 1], Γ = [T²/2; T]', () => {
    // Double integrator, exact by the series of e^{AT} that terminates after the linear term.
    for (const T of [0.01, 0.5, 3]) {
      const { Phi, Gamma } = matrixExponentialIntegral([[0, 1], [0, 0]], [[0], [1]], T);
      expect(maxAbsDifference(Phi, [[1, T], [0, 1]])).toBeLessThan(4 * EPS * Math.max(1, T));
      expect(maxAbsDifference(Gamma, [[(T * T) / 2], [T]])).toBeLessThan(4 * EPS * Math.max(1, T * T));
    }
  });

  it('matches A⁻¹(e^{AT} − I)B for an invertible A', () => {
    // Scalar first-order lag a = −2: Γ = (e^{aT} − 1)/a · b.
    const T = 0.3;
    const { Phi, Gamma } = matrixExponentialIntegral([[-2]], [[5]], T);
    expect(Phi[0][0]).toBeCloseTo(Math.exp(-2 * T), 14);
    expect(Math.abs(Gamma[0][0] - ((Math.exp(-2 * T) - 1) / -2) * 5)).toBeLessThan(16 * EPS);
  });
});
