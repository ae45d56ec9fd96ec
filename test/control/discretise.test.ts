import { describe, expect, it } from 'vitest';
import { discretiseZeroOrderHold, mapPolesToContinuous, mapPolesToDiscrete, sampledCostWeights } from '../../server/src/control/discretise';
import { augmentComputationDelay } from '../../server/src/control/delayAugment';
import { eigenvaluesOf } from '../../server/src/control/controlLinearAlgebra';
import { EPS, frobenius, poleSetDistance, reference, relativeError } from './controlTestHelpers';

describe('zero-order hold', () => {
  it('discretises the double integrator 1/s² to its closed form Φ = [1 T; 0 1], Γ = [T²/2; T]', () => {
    // Closed form: e^{AT} = I + AT for nilpotent A, ∫₀ᵀ e^{Aτ}dτ B = [T²/2; T].
    const T = 0.37;
    const { Phi, Gamma } = discretiseZeroOrderHold([[0, 1], [0, 0]], [[0], [1]], T);
    expect(relativeError(Phi, [[1, T], [0, 1]])).toBeLessThan(10 * EPS);
    expect(relativeError(Gamma, [[(T * T) / 2], [T]])).toBeLessThan(10 * EPS);
  });

  it('matches scipy.signal.cont2discrete (zoh) for random systems n = 2…12', () => {
    // Reference: test/reference/control_response.py, scipy.signal.cont2discrete(method='zoh').
    for (const c of reference.zeroOrderHold) {
      const { Phi, Gamma } = discretiseZeroOrderHold(c.A, c.B, c.T);
      // κ: the exponential's condition is bounded by e^{‖A‖T}·‖A‖T (Van Loan 1977); c = 100.
      const scaledNorm = frobenius(c.A) * c.T;
      const tolerance = 100 * c.n * EPS * Math.max(1, scaledNorm) * Math.exp(scaledNorm);
      expect(relativeError(Phi, c.Phi)).toBeLessThan(tolerance);
      expect(relativeError(Gamma, c.Gamma)).toBeLessThan(tolerance);
    }
  });

  it('discretises disturbance inputs with the same exponential', () => {
    const c = reference.zeroOrderHold[3];
    const both = discretiseZeroOrderHold(c.A, c.B, c.T, c.B);
    expect(relativeError(both.GammaDisturbance, both.Gamma)).toBeLessThan(10 * EPS);
  });

  it('maps poles by z = e^{sT}, the eigenvalues of e^{AT}', () => {
    // Identity: eig(e^{AT}) = e^{eig(A)·T}.
    const c = reference.zeroOrderHold[5];
    const mapped = mapPolesToDiscrete(eigenvaluesOf(c.A), c.T);
    expect(poleSetDistance(mapped, eigenvaluesOf(c.Phi))).toBeLessThan(1e3 * c.n * EPS * Math.exp(frobenius(c.A) * c.T));
    const back = mapPolesToContinuous(mapped, c.T);
    expect(poleSetDistance(back, eigenvaluesOf(c.A))).toBeLessThan(1e3 * c.n * EPS * frobenius(c.A));
  });
});

describe('sampled continuous cost (Van Loan 1978)', () => {
  it('matches the SciPy expm computation, itself cross-checked by quadrature in the generator', () => {
    for (const c of reference.sampledCost) {
      const weights = sampledCostWeights(c.A, c.B, c.Q, c.R, c.T, c.N);
      const scaledNorm = (frobenius(c.A) + frobenius(c.B)) * c.T;
      const tolerance = 100 * (c.n + c.m) * EPS * Math.max(1, scaledNorm) * Math.exp(2 * scaledNorm);
      expect(relativeError(weights.Qd, c.Qd)).toBeLessThan(tolerance);
      expect(relativeError(weights.Rd, c.Rd)).toBeLessThan(tolerance);
      expect(relativeError(weights.Nd, c.Nd)).toBeLessThan(tolerance);
    }
  });

  it('tends to T·(Q, R, N) as T → 0 (the cost integrand is constant over a short sample)', () => {
    const A = [[0, 1], [-2, -0.5]];
    const B = [[0], [1]];
    const Q = [[3, 0.5], [0.5, 1]];
    const R = [[0.2]];
    const T = 1e-6;
    const { Qd, Rd } = sampledCostWeights(A, B, Q, R, T);
    expect(relativeError(Qd, Q.map((row) => row.map((v) => v * T)))).toBeLessThan(1e-5);
    expect(relativeError(Rd, [[0.2 * T]])).toBeLessThan(1e-5);
  });
});

describe('one-sample computation delay', () => {
  it('adds the held input as states: Φ_aug = [[Φ, Γ], [0, 0]] with eigenvalues eig(Φ) ∪ {0}', () => {
    const c = reference.zeroOrderHold[1];
    const C = [c.A[0].map((_, j) => (j === 0 ? 1 : 0))];
    const D = [new Array(c.m).fill(0)];
    const aug = augmentComputationDelay(c.Phi, c.Gamma, C, D);
    expect(aug.Phi.length).toBe(c.n + c.m);
    expect(aug.addedStates).toBe(c.m);
    expect(aug.Gamma.slice(c.n)).toEqual(Array.from({ length: c.m }, (_, i) => Array.from({ length: c.m }, (_, j) => (i === j ? 1 : 0))));
    const expected = [...eigenvaluesOf(c.Phi), ...new Array(c.m).fill({ re: 0, im: 0 })];
    expect(poleSetDistance(eigenvaluesOf(aug.Phi), expected)).toBeLessThan(1e-6);
    expect(aug.C[0].slice(c.n)).toEqual(D[0]);
  });
});
