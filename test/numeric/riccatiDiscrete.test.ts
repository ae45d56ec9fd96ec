import { describe, expect, it } from 'vitest';
import fixture from '../fixtures/reference/numeric_solvers.json';
import { discreteRiccatiConditionEstimate, solveDiscreteRiccati } from '../../server/src/numeric/riccatiDiscrete';
import { eigenvaluesWithStatus } from '../../server/src/numeric/eigenvectors';
import { EPS, checkWarmStartsNearReference, add, eye, frob, maxAbsDiff, mul, randomMatrix, scale, seededRandom, sub, tr } from './solverTestMatrices';

/** One step of the Riccati difference equation X ↦ AᵀXA − AᵀXB(R + BᵀXB)⁻¹BᵀXA + Q (scalar R only). */
function riccatiMap(A: number[][], B: number[][], Q: number[][], r: number, X: number[][]): number[][] {
  const BtXA = mul(mul(tr(B), X), A);
  const s = r + mul(mul(tr(B), X), B)[0][0];
  return add(mul(mul(tr(A), X), A), scale(mul(tr(BtXA), BtXA), -1 / s), Q);
}

describe('solveDiscreteRiccati (structure-preserving doubling + Newton)', () => {
  it('DAREX #1: X = φ·Q with φ = (1 + √5)/2', () => {
    // Benner, Laub & Mehrmann, "A collection of benchmark examples for the numerical solution of
    // algebraic Riccati equations II: discrete-time case", TU Chemnitz report SPC 95-23 (number from memory), 1995, example 1
    // (the continuous example's data in discrete time); checked by substitution (residual ≈ 1e-15).
    const Q = [[9, 6], [6, 4]];
    const s = solveDiscreteRiccati([[4, 3], [-4.5, -3.5]], [[1], [-1]], Q, [[1]]);
    expect(s.ok).toBe(true);
    const exact = scale(Q, (1 + Math.sqrt(5)) / 2);
    expect(maxAbsDiff(s.X, exact)).toBeLessThan(100 * EPS * s.conditionEstimate * frob(exact));
    expect(s.residual).toBeLessThan(10 * EPS);
    expect(s.closedLoopEigenvalues.every((l) => Math.hypot(l.re, l.im) < 1)).toBe(true);
  });

  it('agrees with SciPy on problems with a cross term N (fixture, argument s)', () => {
    for (const c of fixture.crossTerm) {
      const s = solveDiscreteRiccati(c.A, c.B, c.Q, c.R, c.N);
      expect(s.ok, `n=${c.n} m=${c.m}`).toBe(true);
      expect(s.residual).toBeLessThan(10 * c.n * EPS);
      expect(maxAbsDiff(s.X, c.dareX)).toBeLessThan(10 * c.n * EPS * s.conditionEstimate * frob(c.dareX));
    }
  });

  it('agrees with scipy.linalg.solve_discrete_are on seeded stabilisable systems (fixture)', () => {
    for (const c of fixture.cases) {
      const s = solveDiscreteRiccati(c.A, c.B, c.Q, c.R);
      expect(s.ok, `n=${c.n} m=${c.m}`).toBe(true);
      expect(s.residual).toBeLessThan(10 * c.n * EPS);
      // Gap within c·n·ε·κ·‖X‖, κ = our condition estimate, c = 10.
      expect(maxAbsDiff(s.X, c.dareX), `n=${c.n} m=${c.m}`).toBeLessThan(10 * c.n * EPS * s.conditionEstimate * frob(c.dareX));
    }
  });

  it('the condition estimate left out and computed apart is the same number; X and K are unchanged (fixture)', () => {
    for (const c of fixture.cases) {
      const whole = solveDiscreteRiccati(c.A, c.B, c.Q, c.R);
      const gainsFirst = solveDiscreteRiccati(c.A, c.B, c.Q, c.R, undefined, { conditionEstimate: false });
      expect(gainsFirst.conditionEstimate).toBeNaN();
      expect(gainsFirst.ok).toBe(whole.ok);
      expect(gainsFirst.X).toEqual(whole.X);
      expect(gainsFirst.gain).toEqual(whole.gain);
      expect(discreteRiccatiConditionEstimate(c.A, c.B, c.Q, c.R, undefined, gainsFirst.X)).toBe(whole.conditionEstimate);
    }
  });

  it('warm start: Hewer\'s Newton steps from a start 10⁻⁵ away reach SciPy\'s solution (fixture), in at most 3 steps', () => {
    const warm = checkWarmStartsNearReference(
      fixture.cases,
      (c) => c.dareX,
      (c, start) => solveDiscreteRiccati(c.A, c.B, c.Q, c.R, undefined, { start }),
      78,
      (actual, label) => expect(actual, label),
    );
    expect(warm).toBeGreaterThan(fixture.cases.length / 2);
  });

  it('warm start: a start that does not stabilise or has the wrong shape falls back to the doubling; a far one never misleads (fixture)', () => {
    let unstable = 0;
    for (const c of fixture.cases) {
      const cold = solveDiscreteRiccati(c.A, c.B, c.Q, c.R);
      // X₀ = 0 leaves the closed loop at A: a stabilising start only when A is Schur stable.
      const fromZero = solveDiscreteRiccati(c.A, c.B, c.Q, c.R, undefined, { start: scale(c.dareX, 0) });
      if (!eigenvaluesWithStatus(c.A).values.every((l) => Math.hypot(l.re, l.im) < 1)) {
        unstable++;
        expect(fromZero.warmStarted, `n=${c.n} m=${c.m}`).toBe(false);
        expect(fromZero.X).toEqual(cold.X);
      }
      const wrongShape = solveDiscreteRiccati(c.A, c.B, c.Q, c.R, undefined, { start: eye(c.n + 1) });
      expect(wrongShape.warmStarted).toBe(false);
      expect(wrongShape.X).toEqual(cold.X);
      // 10³·X: Newton may or may not converge fast from there; either way the answer is SciPy's.
      const far = solveDiscreteRiccati(c.A, c.B, c.Q, c.R, undefined, { start: scale(c.dareX, 1e3) });
      expect(far.ok).toBe(true);
      expect(maxAbsDiff(far.X, c.dareX), `n=${c.n} m=${c.m}`).toBeLessThan(10 * c.n * EPS * cold.conditionEstimate * frob(c.dareX));
      if (!far.warmStarted) expect(far.X).toEqual(cold.X);
    }
    expect(unstable).toBeGreaterThan(0);
  });

  it('converges on the raw doubling alone (no Newton steps) to a small residual', () => {
    for (const c of fixture.cases.slice(0, 10)) {
      const s = solveDiscreteRiccati(c.A, c.B, c.Q, c.R, undefined, { maxNewtonSteps: 0 });
      expect(s.ok).toBe(true);
      expect(s.newtonSteps).toBe(0);
      expect(s.residual).toBeLessThan(1e3 * c.n * EPS);
    }
  });

  it('solves a plant with a computation-delay state (singular A) without inverting A', () => {
    // x₁⁺ = 1.05·x₁ + 0.4·x₂ (an unstable mode driven by the delayed input), x₂⁺ = u: A has a zero row.
    const A = [[1.05, 0.4], [0, 0]];
    const B = [[0], [1]];
    const Q = [[1, 0], [0, 0.1]];
    const s = solveDiscreteRiccati(A, B, Q, [[0.5]]);
    expect(s.ok).toBe(true);
    expect(s.residual).toBeLessThan(10 * EPS);
    // Independent check: the Riccati difference equation from X₀ = Q converges to the same X
    // (value iteration; contraction for a stabilisable, detectable pair).
    let X = Q;
    for (let k = 0; k < 500; k++) X = riccatiMap(A, B, Q, 0.5, X);
    expect(maxAbsDiff(s.X, X)).toBeLessThan(100 * EPS * frob(X));
    expect(s.closedLoopEigenvalues.every((l) => Math.hypot(l.re, l.im) < 1)).toBe(true);
  });

  it('handles the cross term N (unfolded residual and gain definition)', () => {
    const random = seededRandom(31);
    const n = 4;
    const A = randomMatrix(n, n, random);
    const B = randomMatrix(n, 2, random);
    const Q = add(eye(n), scale(mul(tr(A), A), 0.1));
    const R = [[1.5, 0.2], [0.2, 1]];
    const N = scale(randomMatrix(n, 2, random), 0.1);
    const s = solveDiscreteRiccati(A, B, Q, R, N);
    expect(s.ok).toBe(true);
    const S = add(R, mul(mul(tr(B), s.X), B));
    // (R + BᵀXB)·K = BᵀXA + Nᵀ
    expect(maxAbsDiff(mul(S, s.gain), add(mul(mul(tr(B), s.X), A), tr(N)))).toBeLessThan(1e3 * EPS * frob(S) * frob(s.gain));
    // X = AᵀXA − (AᵀXB + N)K + Q
    const res = sub(add(mul(mul(tr(A), s.X), A), scale(mul(add(mul(mul(tr(A), s.X), B), N), s.gain), -1), Q), s.X);
    expect(frob(res)).toBeLessThan(1e3 * n * EPS * frob(s.X) * (1 + frob(A) ** 2));
  });

  it('reports an uncontrollable mode outside the unit circle as a failure', () => {
    const s = solveDiscreteRiccati([[1.5, 0], [0, 0.5]], [[0], [1]], eye(2), [[1]]);
    expect(s.ok).toBe(false);
    expect(['not-stabilisable', 'unit-circle-eigenvalues']).toContain(s.failure);
  });

  it('reports unit-circle eigenvalues (undamped rotation, no input effect, Q = 0)', () => {
    const c = Math.cos(0.3);
    const sn = Math.sin(0.3);
    const s = solveDiscreteRiccati([[c, sn], [-sn, c]], [[0], [0]], [[0, 0], [0, 0]], [[1]]);
    expect(s.ok).toBe(false);
    expect(s.failure).toBe('unit-circle-eigenvalues');
  });

  it('rejects an indefinite R', () => {
    expect(solveDiscreteRiccati([[0.5]], [[1]], [[1]], [[-1]]).failure).toBe('r-not-positive-definite');
  });
});
