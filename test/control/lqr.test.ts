import { describe, expect, it } from 'vitest';
import { designLqr } from '../../server/src/control/lqr';
import { discretiseZeroOrderHold, sampledCostWeights } from '../../server/src/control/discretise';
import { augmentComputationDelay } from '../../server/src/control/delayAugment';
import { loopMargins, stateFeedbackLoop } from '../../server/src/control/margins';
import { EPS, frobenius, multiply, reference, relativeError, subtract, transpose } from './controlTestHelpers';

describe('LQR closed-loop poles', () => {
  it('double integrator, Q = I, R = 1: K = [1, √3], poles −√3/2 ± j/2, listed by real then imaginary part', () => {
    // Closed form (from memory, verified by substitution): X = [[√3, 1], [1, √3]] solves
    // AᵀX + XA − XBBᵀX + I = 0; K = BᵀX = [1, √3]; s² + √3·s + 1 = 0.
    const result = designLqr([[0, 1], [0, 0]], [[0], [1]], [[1, 0], [0, 1]], [[1]], undefined, 'continuous');
    expect(result.ok).toBe(true);
    expect(result.K![0][0]).toBeCloseTo(1, 12);
    expect(result.K![0][1]).toBeCloseTo(Math.sqrt(3), 12);
    const poles = result.closedLoopPoles;
    expect(poles).toHaveLength(2);
    expect(poles[0].re).toBeCloseTo(-Math.sqrt(3) / 2, 12);
    expect(poles[0].im).toBeCloseTo(-0.5, 12);
    expect(poles[1].im).toBeCloseTo(0.5, 12);
  });
});

describe('LQR against SciPy', () => {
  it('matches solve_continuous_are / solve_discrete_are gains (with and without cross weight N)', () => {
    // Reference: test/reference/control_response.py (scipy.linalg solve_*_are, s = N).
    for (const c of reference.lqr) {
      for (const domain of ['continuous', 'discrete'] as const) {
        const result = designLqr(c.A, c.B, c.Q, c.R, c.N ?? undefined, domain);
        expect(result.ok, `${domain} n=${c.n}`).toBe(true);
        const expectedK = domain === 'continuous' ? c.continuousK : c.discreteK;
        const expectedX = domain === 'continuous' ? c.continuousX : c.discreteX;
        // c·n·ε·κ with κ the solver's condition estimate and c = 100.
        const tolerance = 100 * c.n * EPS * Math.max(1, result.conditionEstimate);
        expect(relativeError(result.X!, expectedX)).toBeLessThan(tolerance);
        expect(relativeError(result.K!, expectedK)).toBeLessThan(tolerance * Math.max(1, frobenius(c.A)));
        expect(result.classicalMarginsApply).toBe(domain === 'continuous' && c.N === null && c.m === 1);
      }
    }
  });
});

describe('LQR failures carry reasons', () => {
  const A = [[0, 1], [2, -1]];
  const B = [[0], [1]];
  it('rejects R that is not positive definite', () => {
    const result = designLqr(A, B, [[1, 0], [0, 1]], [[0]], undefined, 'continuous');
    expect(result.failure).toBe('r-not-positive-definite');
    expect(result.ok).toBe(false);
  });
  it('rejects Q − N R⁻¹ Nᵀ with a negative eigenvalue', () => {
    // Q = I, N = [1; 0], R = 0.5 ⇒ Q − N R⁻¹ Nᵀ = diag(−1, 1).
    const result = designLqr(A, B, [[1, 0], [0, 1]], [[0.5]], [[1], [0]], 'continuous');
    expect(result.failure).toBe('q-not-positive-semidefinite');
    expect(result.smallest).toBeCloseTo(-1, 12);
  });
  it('rejects an unstable mode the input cannot move', () => {
    // The first state grows at rate 1 and is not driven by the input.
    const result = designLqr([[1, 0], [0, -1]], [[0], [1]], [[1, 0], [0, 1]], [[1]], undefined, 'continuous');
    expect(result.failure).toBe('not-stabilisable');
    expect(result.mode?.re).toBeCloseTo(1, 12);
  });
  it('rejects an oscillation on the imaginary axis that Q does not weight', () => {
    // Undamped oscillator ±2j, Q = 0: the Hamiltonian keeps eigenvalues on the axis.
    const result = designLqr([[0, 2], [-2, 0]], [[0], [1]], [[0, 0], [0, 0]], [[1]], undefined, 'continuous');
    expect(result.failure).toBe('not-detectable-on-axis');
    expect(Math.abs(result.mode!.im)).toBeCloseTo(2, 10);
  });
});

describe('LQR properties', () => {
  it('has the guaranteed margins of continuous LQR with diagonal R (Safonov & Athans 1977)', () => {
    // Gain margin [½, ∞) and phase margin ≥ 60° at each input, checked with margins.ts.
    for (const c of reference.lqr.filter((c) => c.N === null)) {
      const R = c.R.map((row, i) => row.map((v, j) => (i === j ? v : 0)));
      const result = designLqr(c.A, c.B, c.Q, R, undefined, 'continuous');
      expect(result.classicalMarginsApply).toBe(true);
      const margins = loopMargins(stateFeedbackLoop(c.A, c.B, result.K!), 'continuous');
      expect(margins.closedLoopStable).toBe(true);
      for (const loop of margins.perInput) {
        if (c.m === 1) {
          // Single input: the return-difference inequality |1 + L| ≥ 1 gives exactly these bounds.
          if (loop.phaseMarginDeg !== null) expect(loop.phaseMarginDeg).toBeGreaterThanOrEqual(60 - 1e-6);
          expect(loop.lowerGainMarginDb).toBeLessThanOrEqual(20 * Math.log10(0.5) + 1e-6);
          expect(loop.upperGainMarginDb).toBe(Infinity);
          expect(loop.peakSensitivity).toBeLessThanOrEqual(1 + 1e-6);
        }
      }
    }
  });

  it('solves the delay-augmented discrete problem although Φ_aug is singular', () => {
    const c = reference.lqr[2];
    const T = 0.1;
    const zoh = discretiseZeroOrderHold(c.A, c.B, T);
    const aug = augmentComputationDelay(zoh.Phi, zoh.Gamma, [c.A[0]], [new Array(c.m).fill(0)]);
    const n = c.n + c.m;
    const Q = Array.from({ length: n }, (_, i) => Array.from({ length: n }, (_, j) => (i === j ? 1 : 0)));
    const result = designLqr(aug.Phi, aug.Gamma, Q, c.R, undefined, 'discrete');
    expect(result.ok).toBe(true);
    expect(result.closedLoopPoles.every((z) => Math.hypot(z.re, z.im) < 1)).toBe(true);
    // Riccati residual X − (ΦᵀXΦ − ΦᵀXΓ(R + ΓᵀXΓ)⁻¹ΓᵀXΦ + Q) via K: ΦᵀX(Φ − ΓK) + Q − X = 0.
    const X = result.X!;
    const closed = subtract(aug.Phi, multiply(aug.Gamma, result.K!));
    const residual = subtract(multiply(multiply(transpose(aug.Phi), X), closed), X).map((row, i) => row.map((v, j) => v + Q[i][j]));
    expect(frobenius(residual) / frobenius(X)).toBeLessThan(1e3 * n * EPS * Math.max(1, result.conditionEstimate));
  });

  it('with sampled-cost weights the discrete gain approaches the continuous gain as T → 0', () => {
    const A = [[0, 1], [-1, -0.2]];
    const B = [[0], [1]];
    const Q = [[4, 0], [0, 1]];
    const R = [[0.5]];
    const continuous = designLqr(A, B, Q, R, undefined, 'continuous');
    const differences = [0.2, 0.05, 0.0125].map((T) => {
      const { Phi, Gamma } = discretiseZeroOrderHold(A, B, T);
      const w = sampledCostWeights(A, B, Q, R, T);
      const discrete = designLqr(Phi, Gamma, w.Qd, w.Rd, w.Nd, 'discrete');
      expect(discrete.ok).toBe(true);
      return relativeError(discrete.K!, continuous.K!);
    });
    // The difference shrinks with T (first order in T for the hold's half-sample delay).
    expect(differences[1]).toBeLessThan(differences[0]);
    expect(differences[2]).toBeLessThan(differences[1]);
    // First order in T: a 16-fold shorter period shrinks the difference at least 8-fold.
    expect(differences[2]).toBeLessThan(differences[0] / 8);
  });
});
