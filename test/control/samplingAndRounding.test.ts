import { describe, expect, it } from 'vitest';
import { adviseSamplePeriod, pathologicalEigenvaluePairs } from '../../server/src/control/samplingAdvice';
import { float32ClosedLoopCheck } from '../../server/src/control/float32Check';
import { discretiseZeroOrderHold } from '../../server/src/control/discretise';
import { analyzeControllability } from '../../server/src/control/structure';
import { analyze } from '../../server/src/analyze';

describe('bandwidth rule on a designed sampled loop', () => {
  it('finds the −3 dB bandwidth of a first-order sampled loop from its closed form', () => {
    // Plant x' = −x + u, y = x; closed-loop pole s = −5 sampled at T = 20 ms: z-pole a = e^{−5T}.
    // With the prescaler the loop is y/r = (1 − a)/(z − a); |H(e^{jωT})| = (1 − a)/√2 where
    // 1 − 2a·cos ωT + a² = 2(1 − a)², i.e. ωb = acos((1 + a² − 2(1 − a)²)/(2a))/T (closed form).
    const T = 0.02;
    const a = Math.exp(-5 * T);
    const bandwidth = Math.acos((1 + a * a - 2 * (1 - a) ** 2) / (2 * a)) / T;
    const text = 'plant lag {\n  states x\n  inputs u\n  outputs y\n  A = [-1]\n  B = [1]\n  C = [1]\n}\n' +
      'controller hold for lag {\n  poles = [-5]\n  sample 20 ms\n  track y\n}\n';
    const sampling = analyze(text).controllers[0].details.sampling as { bandwidthPeriodRange: [number, number] | null };
    expect(sampling.bandwidthPeriodRange).not.toBeNull();
    expect(sampling.bandwidthPeriodRange![0]).toBeCloseTo((2 * Math.PI) / (30 * bandwidth), 10);
    expect(sampling.bandwidthPeriodRange![1]).toBeCloseTo((2 * Math.PI) / (10 * bandwidth), 10);
  });
});

describe('sample-period advice', () => {
  // Undamped oscillator at ω0 = 10 rad/s (a hoist rope's sway, say): eigenvalues ±10j.
  const A = [[0, 1], [-100, 0]];
  const B = [[0], [1]];
  const oscillator = [{ re: 0, im: 10 }, { re: 0, im: -10 }];

  it('flags pathological sampling T = π/ω0, and the sampled pair really loses controllability', () => {
    // Kalman, Ho & Narendra (1963): Im(λ1 − λ2) = 20 = 2π/T for T = π/10.
    const T = Math.PI / 10;
    const pairs = pathologicalEigenvaluePairs(oscillator, T);
    expect(pairs).toHaveLength(1);
    expect(pairs[0].multiple).toBe(1);
    const { Phi, Gamma } = discretiseZeroOrderHold(A, B, T);
    expect(analyzeControllability(A, B, 'continuous').controllable).toBe(true);
    // PBH measure min σ_min([Φ − zI, Γ])/‖[Φ Γ]‖: at rounding level (the exponential's own
    // error, ~ε·‖A‖T) for the pathological period, order one for a period 1 % longer.
    const lost = analyzeControllability(Phi, Gamma, 'discrete').margin as number;
    expect(lost).toBeLessThan(100 * Number.EPSILON * 100 * T);
    const shifted = discretiseZeroOrderHold(A, B, T * 1.01);
    expect(analyzeControllability(shifted.Phi, shifted.Gamma, 'discrete').margin as number).toBeGreaterThan(1e-3);
    expect(pathologicalEigenvaluePairs(oscillator, T * 1.01)).toHaveLength(0);
  });

  it('advises T from the fastest closed-loop pole and the bandwidth, and flags T below 1 ns', () => {
    const poles = [{ re: -20, im: 0 }, { re: -4, im: 3 }, { re: -4, im: -3 }];
    const advice = adviseSamplePeriod(0.1, poles, oscillator, { samplesPerTimeConstant: 10, closedLoopBandwidth: 5 });
    expect(advice.advisedMaximumPeriod).toBeCloseTo(1 / 200, 14);
    expect(advice.tooLongForFastestPole).toBe(true); // |λ|T = 2 > 1
    expect(advice.bandwidthPeriodRange![1]).toBeCloseTo((2 * Math.PI) / 50, 14);
    expect(advice.tooLongForBandwidth).toBe(false);
    const fine = adviseSamplePeriod(0.004, poles, oscillator, { samplesPerTimeConstant: 10 });
    expect(fine.tooLongForFastestPole).toBe(false);
    expect(adviseSamplePeriod(1e-10, poles, [], { samplesPerTimeConstant: 10 }).belowNanosecond).toBe(true);
    expect(adviseSamplePeriod(-1, poles, [], { samplesPerTimeConstant: 10 }).invalid).toBe(true);
  });
});

describe('32-bit rounding check', () => {
  it('passes a well-conditioned design', () => {
    const check = float32ClosedLoopCheck([[0, 1], [-2, -3]], [[0], [1]], [[4, 2]], 'continuous');
    expect(check.ok).toBe(true);
    expect(check.largestRelativeMove).toBeLessThan(check.bound);
  });

  it('flags a deliberately fragile design: a chain of 10 integrators in companion form, poles −1.1…−11', () => {
    // A − BK is the companion matrix of Π(s + 1.1k), k = 1…10, with coefficients up to ~3e7 that
    // are not representable in single precision (with poles −1…−10 they would be integers < 2²⁴);
    // the roots of such polynomials are notoriously sensitive to coefficient rounding
    // (Wilkinson, Rounding Errors in Algebraic Processes, 1963).
    const n = 10;
    let coefficients = [1]; // highest power first
    for (let k = 1; k <= n; k++) {
      const next = new Array(coefficients.length + 1).fill(0);
      coefficients.forEach((c, i) => {
        next[i] += c;
        next[i + 1] += c * 1.1 * k;
      });
      coefficients = next;
    }
    const A = Array.from({ length: n }, (_, i) => Array.from({ length: n }, (_, j) => (j === i + 1 ? 1 : 0)));
    const B = Array.from({ length: n }, (_, i) => [i === n - 1 ? 1 : 0]);
    // Last row of A − BK = −[a_n, …, a_1].
    const K = [Array.from({ length: n }, (_, j) => coefficients[n - j])];
    const check = float32ClosedLoopCheck(A, B, K, 'continuous');
    expect(check.ok).toBe(false);
    expect(check.flagged.length).toBeGreaterThan(0);
    expect(check.largestRelativeMove).toBeGreaterThan(check.bound);
  });

  it('reports a discrete pole that leaves the unit circle in single precision', () => {
    // Pole at 1 − 1e-9: rounding the gain 1e-9·(1 + tiny) is harmless, but 1 − 1e-9 itself is
    // not representable in single precision and rounds to 1.
    const check = float32ClosedLoopCheck([[1 - 1e-9]], [[1]], [[0]], 'discrete');
    expect(check.flagged.some((move) => move.leftStabilityRegion)).toBe(true);
  });
});

describe('32-bit rounding check of an observer', () => {
  it('checks eig(A − LC) through the transpose and agrees with the double-precision poles', async () => {
    const { float32ObserverCheck } = await import('../../server/src/control/float32Check');
    const check = float32ObserverCheck([[0, 1], [-2, -3]], [[1, 0]], [[7], [10]], 'continuous');
    // A − LC = [[−7, 1], [−12, −3]]: s² + 10s + 33 = 0, s = −5 ± 2√2 j.
    expect(check.ok).toBe(true);
    const pole = check.doublePoles.find((p) => p.im > 0)!;
    expect(pole.re).toBeCloseTo(-5, 12);
    expect(pole.im).toBeCloseTo(2 * Math.SQRT2, 12);
  });
});
