import { describe, expect, it } from 'vitest';
import { compareObserverSpeed, defaultObserverPoles, designObserverByPlacement } from '../../server/src/control/observer';
import { steadyStateKalmanGain } from '../../server/src/control/kalman';
import { combinedClosedLoop } from '../../server/src/control/combinedClosedLoop';
import { eigenvaluesOf } from '../../server/src/control/controlLinearAlgebra';
import { discretiseZeroOrderHold } from '../../server/src/control/discretise';
import { defaultSettings } from '../../server/src/control/settings';
import { EPS, frobenius, multiply, poleSetDistance, reference, relativeError, subtract, transpose } from './controlTestHelpers';

// A levitation-rig-like plant: unstable position mode, measured position only.
const A = [[0, 1, 0], [900, 0, -12], [0, 0, -50]];
const B = [[0], [0], [50]];
const C = [[1, 0, 0]];
const D = [[0]];

describe('observer by placement on the dual pair', () => {
  it('places eig(A − LC) at the requested poles', () => {
    const poles = [{ re: -120, im: 0 }, { re: -100, im: 40 }, { re: -100, im: -40 }];
    const result = designObserverByPlacement(A, C, poles, defaultSettings);
    expect(result.ok).toBe(true);
    expect(result.L).toHaveLength(3);
    expect(result.L![0]).toHaveLength(1);
    const closed = subtract(A, multiply(result.L!, C));
    // Achieved ≈ requested within c·n·ε·κ·‖A‖ (κ the eigenvector condition the placement reports).
    const tolerance = 100 * 3 * EPS * Math.max(1, result.eigenvectorCondition) * (frobenius(A) + frobenius(result.L!));
    expect(poleSetDistance(eigenvaluesOf(closed), poles)).toBeLessThan(tolerance);
  });

  it('fails with the mode when an unstable mode is unobservable', () => {
    // The second state grows and never reaches the measured output.
    const result = designObserverByPlacement([[-1, 0], [0, 2]], [[1, 0]], [{ re: -5, im: 0 }, { re: -6, im: 0 }], defaultSettings);
    expect(result.ok).toBe(false);
    expect(result.failure?.mode?.re).toBeCloseTo(2, 10);
  });

  it('defaults to poles a stated factor faster (s ↦ factor·s, z ↦ z^factor) and compares speeds', () => {
    const controller = [{ re: -2, im: 1 }, { re: -2, im: -1 }, { re: -5, im: 0 }];
    const observer = defaultObserverPoles(controller, 4);
    expect(observer[0]).toEqual({ re: -8, im: 4 });
    const T = 0.05;
    const discreteController = controller.map((s) => ({ re: Math.exp(s.re * T) * Math.cos(s.im * T), im: Math.exp(s.re * T) * Math.sin(s.im * T) }));
    const discreteObserver = defaultObserverPoles(discreteController, 4, 'discrete');
    // z^4 = e^{4sT}.
    expect(discreteObserver[0].re).toBeCloseTo(Math.exp(-8 * T) * Math.cos(4 * T), 14);
    expect(discreteObserver[1].im).toBeCloseTo(-Math.exp(-8 * T) * Math.sin(4 * T), 14);
    expect(compareObserverSpeed(controller, observer, 'continuous').observerSlower).toBe(false);
    expect(compareObserverSpeed(controller, [{ re: -1, im: 0 }], 'continuous').observerSlower).toBe(true);
    expect(compareObserverSpeed(discreteController, discreteObserver, 'discrete', T).observerSlower).toBe(false);
  });
});

describe('steady-state Kalman gains against SciPy (by duality)', () => {
  it('matches the continuous gain P Cᵀ V⁻¹ and the discrete predictor and current gains', () => {
    // Reference: test/reference/control_response.py; the generator adds stateNoiseExtra·I on the
    // states, so the noise on the states is G W Gᵀ + εI, passed here with G = I.
    for (const c of reference.kalman) {
      const GWGt = multiply(multiply(c.G, c.W), transpose(c.G)).map((row, i) => row.map((v, j) => v + (i === j ? c.stateNoiseExtra : 0)));
      const continuous = steadyStateKalmanGain({ A: c.A, C: c.C, W: GWGt, V: c.V, domain: 'continuous' });
      expect(continuous.ok).toBe(true);
      const tolerance = 100 * c.n * EPS * Math.max(1, continuous.conditionEstimate) * Math.max(1, frobenius(c.A));
      expect(relativeError(continuous.gain!, c.continuousL)).toBeLessThan(tolerance);
      expect(relativeError(continuous.P!, c.continuousP)).toBeLessThan(tolerance);
      const predictor = steadyStateKalmanGain({ A: c.A, C: c.C, W: GWGt, V: c.V, domain: 'discrete', form: 'predictor' });
      const current = steadyStateKalmanGain({ A: c.A, C: c.C, W: GWGt, V: c.V, domain: 'discrete', form: 'current' });
      const discreteTolerance = 100 * c.n * EPS * Math.max(1, predictor.conditionEstimate) * Math.max(1, frobenius(c.A) ** 2);
      expect(predictor.form).toBe('predictor');
      expect(relativeError(predictor.gain!, c.predictorL)).toBeLessThan(discreteTolerance);
      expect(relativeError(current.gain!, c.currentM)).toBeLessThan(discreteTolerance);
      expect(relativeError(predictor.P!, c.discreteP)).toBeLessThan(discreteTolerance);
    }
  });

  it('takes the noise on disturbance inputs through G (G W Gᵀ) and reports failures', () => {
    const c = reference.kalman[0];
    const GWGt = multiply(multiply(c.G, c.W), transpose(c.G));
    const viaG = steadyStateKalmanGain({ A: c.A, C: c.C, W: c.W, G: c.G, V: c.V, domain: 'continuous' });
    const onStates = steadyStateKalmanGain({ A: c.A, C: c.C, W: GWGt, V: c.V, domain: 'continuous' });
    expect(viaG.ok).toBe(onStates.ok);
    if (viaG.ok) expect(relativeError(viaG.gain!, onStates.gain!)).toBeLessThan(1e-10);
    const badV = steadyStateKalmanGain({ A: c.A, C: c.C, W: GWGt, V: c.V.map((row) => row.map(() => 0)), domain: 'continuous' });
    expect(badV.failure).toBe('v-not-positive-definite');
    const undetectable = steadyStateKalmanGain({ A: [[-1, 0], [0, 2]], C: [[1, 0]], W: [[1, 0], [0, 1]], V: [[1]], domain: 'continuous' });
    expect(undetectable.failure).toBe('not-detectable');
  });
});

describe('separation principle, checked numerically', () => {
  const K = [[30, 1, -0.1]];
  it('continuous: eig of the composite loop = eig(A − BK) ∪ eig(A − LC)', () => {
    const L = designObserverByPlacement(A, C, [{ re: -120, im: 0 }, { re: -100, im: 40 }, { re: -100, im: -40 }], defaultSettings).L!;
    const loop = combinedClosedLoop(A, B, C, D, K, L, 'continuous');
    const union = [...loop.controllerPoles, ...loop.observerPoles];
    const scale = frobenius(loop.A);
    expect(poleSetDistance(loop.combinedPoles, union)).toBeLessThan(1e-6 * scale);
    expect(loop.controller.B).toEqual(L);
  });

  it('discrete current form: eig = eig(Φ − ΓK) ∪ eig(Φ − ΦMC)', () => {
    const T = 0.002;
    const zoh = discretiseZeroOrderHold(A, B, T);
    const kalman = steadyStateKalmanGain({ A: zoh.Phi, C, W: [[0, 0, 0], [0, 1, 0], [0, 0, 1]], V: [[1e-4]], domain: 'discrete', form: 'current' });
    expect(kalman.ok).toBe(true);
    const loop = combinedClosedLoop(zoh.Phi, zoh.Gamma, C, D, K, kalman.gain!, 'discrete', 'current');
    expect(poleSetDistance(loop.combinedPoles, [...loop.controllerPoles, ...loop.observerPoles])).toBeLessThan(1e-6);
    // Observer poles of the current form equal those of the predictor form (L_p = Φ M).
    expect(poleSetDistance(loop.observerPoles, kalman.observerPoles)).toBeLessThan(1e-8);
  });
});
