import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import { solveContinuousRiccati } from '../../server/src/numeric/riccatiContinuous';
import { solveDiscreteRiccati } from '../../server/src/numeric/riccatiDiscrete';
import { generalizedEigenvalues } from '../../server/src/numeric/qz';
import { invariantZeros } from '../../server/src/numeric/invariantZeros';
import { solveLyapunovContinuous, solveLyapunovDiscrete } from '../../server/src/numeric/lyapunov';
import { matrixExponential } from '../../server/src/numeric/expm';
import { EPS, frob } from './solverTestMatrices';

// Entries drawn from a small set with many exact zeros and repeats, so degenerate structure
// (uncontrollable modes, singular B, repeated eigenvalues, zero rows) is common.
const entry = fc.constantFrom(0, 0, 0, 1, -1, 2, 0.5, -3, 1e-8, 1e6);
const square = (n: number) => fc.array(fc.array(entry, { minLength: n, maxLength: n }), { minLength: n, maxLength: n });
const rect = (r: number, c: number) => fc.array(fc.array(entry, { minLength: c, maxLength: c }), { minLength: r, maxLength: r });

describe('solvers never throw and report outcomes consistently on degenerate data', () => {
  it('Riccati solvers: ok ⇒ finite X, stable closed loop, small residual; otherwise a failure reason', () => {
    fc.assert(
      fc.property(
        fc.integer({ min: 1, max: 4 }).chain((n) => fc.tuple(fc.constant(n), square(n), rect(n, 1), square(n))),
        ([n, A, B, M]) => {
          const Q = M.map((row, i) => row.map((_, j) => M.reduce((s, r) => s + r[i] * r[j], 0))); // MᵀM ⪰ 0
          for (const solve of [solveContinuousRiccati, solveDiscreteRiccati]) {
            const s = solve(A, B, Q, [[1]]);
            if (s.ok) {
              expect(s.X.flat().every(Number.isFinite)).toBe(true);
              expect(s.residual).toBeLessThan(1e3 * n * EPS * Math.max(1, s.conditionEstimate));
              const stable = solve === solveContinuousRiccati
                ? s.closedLoopEigenvalues.every((l) => l.re < 0)
                : s.closedLoopEigenvalues.every((l) => Math.hypot(l.re, l.im) < 1);
              expect(stable).toBe(true);
            } else {
              expect(s.failure).toBeDefined();
            }
          }
        },
      ),
      { numRuns: 150, seed: 4242 },
    );
  });

  it('QZ converges, invariant zeros, Lyapunov and expm return without throwing', () => {
    fc.assert(
      fc.property(
        fc.integer({ min: 1, max: 5 }).chain((n) => fc.tuple(square(n), square(n), rect(n, 2), rect(2, n), rect(2, 2))),
        ([A, E, B, C, D]) => {
          expect(generalizedEigenvalues(A, E).converged).toBe(true);
          const zeros = invariantZeros(A, B, C, D);
          expect(zeros.zeros.every((z) => Number.isFinite(z.re) && Number.isFinite(z.im))).toBe(true);
          solveLyapunovContinuous(A, E);
          solveLyapunovDiscrete(A, E);
          const expA = matrixExponential(A.map((row) => row.map((v) => v * 1e-6)));
          expect(frob(expA)).toBeGreaterThan(0);
        },
      ),
      { numRuns: 150, seed: 777 },
    );
  });
});
