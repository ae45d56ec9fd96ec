import { describe, expect, it } from 'vitest';
import fixture from '../fixtures/reference/numeric_solvers.json';
import { solveLyapunovContinuous, solveLyapunovDiscrete } from '../../server/src/numeric/lyapunov';
import { solveSylvester } from '../../server/src/numeric/sylvester';
import { EPS, add, eye, frob, maxAbsDiff, mul, randomMatrix, scale, seededRandom, sub, tr } from './solverTestMatrices';

describe('solveSylvester (Bartels–Stewart)', () => {
  it('solves A·X + X·B = C for random rectangular data (residual identity)', () => {
    const random = seededRandom(3);
    for (const [n, m] of [[1, 1], [3, 2], [7, 5], [12, 12], [20, 3]]) {
      const A = randomMatrix(n, n, random);
      const B = randomMatrix(m, m, random);
      const C = randomMatrix(n, m, random);
      const { X, ok } = solveSylvester(A, B, C);
      expect(ok).toBe(true);
      const residual = frob(sub(add(mul(A, X), mul(X, B)), C));
      // Backward-stable method: residual ≤ c·(n+m)·ε·(‖A‖+‖B‖)·‖X‖, c = 10.
      expect(residual).toBeLessThan(10 * (n + m) * EPS * (frob(A) + frob(B)) * frob(X) + 10 * EPS * frob(C));
    }
  });

  it('agrees with scipy.linalg.solve_sylvester (fixture)', () => {
    for (const c of fixture.sylvester) {
      const { X, ok } = solveSylvester(c.A, c.B, c.C);
      expect(ok).toBe(true);
      const n = c.A.length + c.B.length;
      // Spectra shifted apart by 2.5 in the generator keep sep(A, −B) moderate; c = 100.
      expect(maxAbsDiff(X, c.X)).toBeLessThan(100 * n * EPS * (frob(c.A) + frob(c.B)) * frob(c.X));
    }
  });

  it('reports a singular operator when λ(A) + λ(B) = 0', () => {
    // λ(A) = {1, 2}, λ(B) = {−2, 5}: 2 + (−2) = 0.
    const { ok } = solveSylvester([[1, 4], [0, 2]], [[-2, 1], [0, 5]], [[1, 0], [0, 1]]);
    expect(ok).toBe(false);
  });
});

describe('solveLyapunovContinuous', () => {
  it('agrees with scipy.linalg.solve_continuous_lyapunov on the fixture', () => {
    for (const c of fixture.cases) {
      const { X, ok } = solveLyapunovContinuous(c.lyapContinuousA, c.Q);
      expect(ok).toBe(true);
      const A = c.lyapContinuousA;
      const residual = frob(add(mul(A, X), mul(X, tr(A)), c.Q));
      expect(residual).toBeLessThan(20 * c.n * EPS * (2 * frob(A) * frob(X) + frob(c.Q)));
      // Both codes are Bartels–Stewart; the gap is bounded by κ·ε with κ ≈ ‖X‖/‖Q‖·‖A‖ (sep⁻¹ estimate), c = 100.
      const kappa = (frob(X) / frob(c.Q)) * frob(A);
      expect(maxAbsDiff(X, c.lyapContinuousX)).toBeLessThan(100 * c.n * EPS * kappa * frob(X));
    }
  });

  it('solves with the symmetric part of a non-symmetric Q on the upper triangle only (residual identity)', () => {
    const random = seededRandom(11);
    for (const n of [1, 2, 5, 17, 40]) {
      // Random A has complex pairs (2×2 Schur blocks); the shift keeps λᵢ + λⱼ away from 0.
      const A = sub(randomMatrix(n, n, random), scale(eye(n), 3));
      const Q = randomMatrix(n, n, random);
      const symmetricQ = scale(add(Q, tr(Q)), 0.5);
      const { X, ok } = solveLyapunovContinuous(A, Q);
      expect(ok).toBe(true);
      for (let i = 0; i < n; i++) for (let j = 0; j < i; j++) expect(X[i][j]).toBe(X[j][i]);
      const residual = frob(add(mul(A, X), mul(X, tr(A)), symmetricQ));
      // Backward-stable method: residual ≤ c·n·ε·(2‖A‖‖X‖ + ‖Q‖), c = 20 as above.
      expect(residual).toBeLessThan(20 * n * EPS * (2 * frob(A) * frob(X) + frob(symmetricQ)));
      // The general Sylvester route (full square, no symmetry used) gives the same X.
      const general = solveSylvester(A, tr(A), scale(symmetricQ, -1)).X;
      const kappa = (frob(X) / frob(symmetricQ)) * frob(A);
      expect(maxAbsDiff(X, general)).toBeLessThan(100 * n * EPS * kappa * frob(X));
    }
  });

  it('returns a symmetric solution and fails on an imaginary-axis pair (λ = ±i)', () => {
    const { X } = solveLyapunovContinuous([[-1, 2], [-3, -4]], [[1, 0], [0, 1]]);
    expect(X[0][1]).toBe(X[1][0]);
    expect(solveLyapunovContinuous([[0, 1], [-1, 0]], eye(2)).ok).toBe(false);
  });
});

describe('solveLyapunovDiscrete (Kitagawa Schur recursion)', () => {
  it('agrees with scipy.linalg.solve_discrete_lyapunov on the fixture', () => {
    for (const c of fixture.cases) {
      const A = c.lyapDiscreteA;
      const { X, ok } = solveLyapunovDiscrete(A, c.Q);
      expect(ok).toBe(true);
      const residual = frob(add(sub(mul(mul(A, X), tr(A)), X), c.Q));
      expect(residual).toBeLessThan(20 * c.n * EPS * ((1 + frob(A) ** 2) * frob(X) + frob(c.Q)));
      const kappa = (frob(X) / frob(c.Q)) * (1 + frob(A) ** 2);
      expect(maxAbsDiff(X, c.lyapDiscreteX)).toBeLessThan(100 * c.n * EPS * kappa * frob(X));
    }
  });

  it('solves for an unstable A when no λᵢλⱼ = 1, and fails when λᵢλⱼ = 1', () => {
    const random = seededRandom(5);
    const A = add(scale(randomMatrix(6, 6, random), 1.2), scale(eye(6), 0.3));
    const Q = eye(6);
    const { X, ok } = solveLyapunovDiscrete(A, Q);
    expect(ok).toBe(true);
    expect(frob(add(sub(mul(mul(A, X), tr(A)), X), Q))).toBeLessThan(200 * EPS * (1 + frob(A) ** 2) * frob(X));
    // λ = {2, 0.5}: 2·0.5 = 1 makes the Stein operator singular.
    expect(solveLyapunovDiscrete([[2, 1], [0, 0.5]], eye(2)).ok).toBe(false);
  });
});
