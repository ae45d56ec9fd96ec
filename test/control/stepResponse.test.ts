import { describe, expect, it } from 'vitest';
import { simulateStepResponses } from '../../server/src/control/stepResponse';
import { reference } from './controlTestHelpers';

describe('exact linear step response', () => {
  it.each([
    ['small loops, stepped state by state', 'stepResponse'],
    ['30- and 64-state loops, by blocks of the recursion', 'stepResponseLarge'],
  ] as const)('matches scipy.signal.lsim of the closed loop (A − BK, B·Nr, C): %s', (_, section) => {
    // Reference: test/reference/control_response.py; both are exact for a step input.
    expect(reference[section].length).toBeGreaterThan(1);
    for (const c of reference[section]) {
      const result = simulateStepResponses({
        domain: 'continuous',
        A: c.A,
        B: c.B,
        C: c.C,
        D: [[0]],
        K: c.K,
        prescaler: [[c.Nr]],
        tracked: [0],
        points: 801,
        duration: 8,
        maxReturnedPoints: 801,
      });
      expect(result.ok).toBe(true);
      const y = result.experiments[0].linear.outputs[0];
      const time = result.experiments[0].linear.time;
      c.t.forEach((t, k) => {
        const index = Math.round(t / 0.01);
        expect(time[index]).toBeCloseTo(t, 12);
        expect(Math.abs(y[index] - c.y[k])).toBeLessThan(1e-9 * Math.max(1, Math.abs(c.y[k])));
      });
      // Prescaler designed for unit DC gain: the exact final value is the set-point.
      expect(result.experiments[0].linear.metrics.steadyStateError).toBeCloseTo(0, 10);
      // The random loops are far from defective: the large ones are summed modally.
      if (section === 'stepResponseLarge') expect(result.methods.linear).toContain('modal');
    }
  });

  it('a defective 30-state loop (one Jordan chain) is stepped, not summed modally, and matches the closed form', () => {
    // x_i' = −x_i + x_{i+1}, u drives x_30, y = x_1: Y/U = 1/(s + 1)^30, whose unit step response
    // is the Erlang distribution function 1 − e^{−t}·Σ_{k<30} t^k/k! (closed form).
    const n = 30;
    const A = Array.from({ length: n }, (_, i) => Array.from({ length: n }, (_, j) => (j === i ? -1 : j === i + 1 ? 1 : 0)));
    const result = simulateStepResponses({
      domain: 'continuous',
      A,
      B: A.map((_, i) => [i === n - 1 ? 1 : 0]),
      C: [A.map((_, j) => (j === 0 ? 1 : 0))],
      D: [[0]],
      K: [new Array(n).fill(0)],
      prescaler: [[1]],
      tracked: [0],
      points: 801,
      duration: 80,
      maxReturnedPoints: 801,
    });
    expect(result.methods.linear).toBe('exact zero-order-hold transition of the closed loop');
    const { time, outputs } = result.experiments[0].linear;
    time.forEach((t, k) => {
      let term = 1;
      let sum = 1;
      for (let j = 1; j < n; j++) {
        term *= t / j;
        sum += term;
      }
      const erlang = 1 - Math.exp(-t) * sum;
      expect(Math.abs(outputs[0][k] - erlang)).toBeLessThan(1e-9);
    });
  });

  it('runs a discrete loop by its recursion: x[k+1] = 0.5x + u, u = r gives y[k] = 2(1 − 0.5^k)', () => {
    const result = simulateStepResponses({
      domain: 'discrete',
      samplePeriod: 0.1,
      A: [[0.5]],
      B: [[1]],
      C: [[1]],
      D: [[0]],
      K: [[0]],
      prescaler: [[1]],
      tracked: [0],
      points: 100,
    });
    const y = result.experiments[0].linear.outputs[0];
    y.slice(0, 20).forEach((value, k) => expect(value).toBeCloseTo(2 * (1 - Math.pow(0.5, k)), 14));
    expect(result.experiments[0].linear.metrics.finalValue).toBeCloseTo(2, 12);
    expect(result.step).toBe(0.1);
  });

  it('chooses the duration from the slowest closed-loop pole (6 time constants)', () => {
    const result = simulateStepResponses({
      domain: 'continuous', A: [[-0.5]], B: [[1]], C: [[1]], D: [[0]], K: [[0]], prescaler: [[0.5]], tracked: [0], points: 500,
    });
    expect(result.duration).toBeCloseTo(12, 12);
    expect(result.experiments[0].linear.time.length).toBeLessThanOrEqual(500);
  });
});

describe('saturation, windup and the nonlinear plant', () => {
  // Hoist-like plant: first-order lag 1/(s + 1) with integral action on the output.
  const plant = { A: [[-1]], B: [[1]], C: [[1]], D: [[0]] };
  const integral = { outputs: [0], Ki: [[-4]] }; // u = −Kx − Ki ξ with ξ' = r − y

  it('keeps saturated inputs within limits and shows windup that clamping removes', () => {
    const result = simulateStepResponses({
      domain: 'continuous',
      ...plant,
      K: [[1]],
      tracked: [0],
      integral,
      limits: [{ low: -1.2, high: 1.2 }],
      points: 4000,
      duration: 20,
    });
    const experiment = result.experiments[0];
    expect(experiment.linear.metrics.inputs[0].exceedsLimit).toBe(true);
    const saturated = experiment.saturated!;
    for (const u of saturated.inputs[0]) {
      expect(u).toBeLessThanOrEqual(1.2);
      expect(u).toBeGreaterThanOrEqual(-1.2);
    }
    const antiWindup = experiment.antiWindup!;
    expect(antiWindup.metrics.overshootPercent as number).toBeLessThan(saturated.metrics.overshootPercent as number);
    expect(experiment.windup?.windupSignificant).toBe(true);
    // Both reach the set-point: integral action removes the steady-state error.
    expect(Math.abs(saturated.outputs[0][saturated.outputs[0].length - 1] - 1)).toBeLessThan(1e-3);
  });

  it('runs the controller on nonlinear equations that equal the linear model, to RK4 accuracy', () => {
    const x0 = [2];
    const u0 = [2];
    const model = {
      derivatives: (x: number[], u: number[]) => [-(x[0] - x0[0]) + (u[0] - u0[0])],
      outputs: (x: number[]) => [x[0]],
    };
    const result = simulateStepResponses({
      domain: 'continuous',
      ...plant,
      K: [[1]],
      tracked: [0],
      integral,
      points: 2000,
      nonlinear: { model, states: x0, inputs: u0, disturbances: [], outputs: [2] },
    });
    const experiment = result.experiments[0];
    const linear = experiment.linear.outputs[0];
    const nonlinear = experiment.nonlinear!.outputs[0];
    // RK4 global error O(h⁴): h·|λ|max ≈ 0.005 here, far below 1e-8 relative.
    linear.forEach((value, k) => expect(Math.abs(nonlinear[k] - value)).toBeLessThan(1e-8));
    expect(experiment.nonlinear!.divergedAt).toBeNull();
  });

  it('steps one tracked output at a time', () => {
    const result = simulateStepResponses({
      domain: 'continuous',
      A: [[-1, 0], [0, -2]],
      B: [[1, 0], [0, 2]],
      C: [[1, 0], [0, 1]],
      D: [[0, 0], [0, 0]],
      K: [[0, 0], [0, 0]],
      prescaler: [[1, 0], [0, 1]],
      tracked: [0, 1],
      stepSizes: [2, 3],
      points: 1000,
    });
    expect(result.experiments).toHaveLength(2);
    const [first, second] = result.experiments;
    expect(first.linear.metrics.finalValue).toBeCloseTo(2, 12);
    expect(Math.max(...first.linear.outputs[1].map(Math.abs))).toBe(0);
    expect(second.linear.metrics.finalValue).toBeCloseTo(3, 12);
  });
});

describe('discrete controller on a nonlinear plant, and the spec pipeline', () => {
  it('holds the input over each sample: RK4 substeps on linear equations reproduce the ZOH model', async () => {
    const { discretiseZeroOrderHold } = await import('../../server/src/control/discretise');
    const A = [[0, 1], [-2, -0.4]];
    const B = [[0], [1]];
    const T = 0.05;
    const { Phi, Gamma } = discretiseZeroOrderHold(A, B, T);
    const model = {
      derivatives: (x: number[], u: number[]) => [x[1], -2 * x[0] - 0.4 * x[1] + u[0]],
      outputs: (x: number[]) => [x[0]],
    };
    const result = simulateStepResponses({
      domain: 'discrete',
      samplePeriod: T,
      A: Phi,
      B: Gamma,
      C: [[1, 0]],
      D: [[0]],
      K: [[1, 0.8]],
      prescaler: [[3]],
      tracked: [0],
      points: 400,
      nonlinear: { model, states: [0, 0], inputs: [0], disturbances: [], outputs: [0], substeps: 20 },
    });
    const experiment = result.experiments[0];
    // RK4 local error (hT)^5/120 per substep with h = T/20, |λ| ≈ 1.7: far below 1e-9.
    experiment.linear.outputs[0].forEach((value, k) => expect(Math.abs(experiment.nonlinear!.outputs[0][k] - value)).toBeLessThan(1e-9));
  });

  it('meets a settling/overshoot spec on a double integrator when the poles come from the formulas', async () => {
    const { polesFromSpec, checkSpec } = await import('../../server/src/control/specToPoles');
    const spec = { settlingSeconds: 2, overshootPercent: 10 };
    const design = polesFromSpec(spec, 2, { fastPoleFactor: 4, domain: 'continuous' });
    const wn = design.naturalFrequency as number;
    const zeta = design.dampingRatio as number;
    // Double integrator: A − BK has characteristic s² + k2 s + k1, so K = [ωn², 2ζωn]; Nr = ωn².
    const result = simulateStepResponses({
      domain: 'continuous', A: [[0, 1], [0, 0]], B: [[0], [1]], C: [[1, 0]], D: [[0]],
      K: [[wn * wn, 2 * zeta * wn]], prescaler: [[wn * wn]], tracked: [0], points: 4000,
    });
    const metrics = result.experiments[0].linear.metrics;
    expect(metrics.overshootPercent as number).toBeCloseTo(10, 3);
    // 4/(ζωn) is an approximation of the 2 % settling time: allow 5 %.
    expect(checkSpec(metrics, spec, 0.05)).toEqual([]);
    expect(checkSpec(metrics, { overshootPercent: 5 })).toHaveLength(1);
  });
});

describe('unstable loops', () => {
  it('stops an unstable response after six growth time constants, finite throughout', () => {
    const result = simulateStepResponses({
      domain: 'continuous', A: [[2, 0], [0, -0.01]], B: [[1], [1]], C: [[1, 1]], D: [[0]], K: [[0, 0]], prescaler: [[1]], tracked: [0], points: 500,
    });
    expect(result.closedLoopStable).toBe(false);
    expect(result.duration).toBeCloseTo(3, 12);
    expect(result.experiments[0].linear.outputs[0].every(Number.isFinite)).toBe(true);
  });
});

describe('discrete saturation and nonlinear divergence', () => {
  it('clamps a discrete integrator while the input is saturated (ξ[k+1] = ξ[k] + T(r − y))', () => {
    // Sampled 1/(s + 1) at T = 0.1: Φ = e^{−0.1}, Γ = 1 − e^{−0.1}.
    const T = 0.1;
    const result = simulateStepResponses({
      domain: 'discrete', samplePeriod: T,
      A: [[Math.exp(-T)]], B: [[1 - Math.exp(-T)]], C: [[1]], D: [[0]],
      K: [[1]], tracked: [0], integral: { outputs: [0], Ki: [[-4]] },
      limits: [{ low: -1.2, high: 1.2 }], points: 400,
    });
    const experiment = result.experiments[0];
    expect(experiment.saturated!.inputs[0].every((u) => u <= 1.2 && u >= -1.2)).toBe(true);
    expect(experiment.antiWindup!.metrics.overshootPercent as number).toBeLessThan(experiment.saturated!.metrics.overshootPercent as number);
  });

  it('reports when the nonlinear plant diverges (x′ = x² escapes in finite time) and stays finite', () => {
    const model = { derivatives: (x: number[], u: number[]) => [x[0] * x[0] + u[0]], outputs: (x: number[]) => [x[0]] };
    const result = simulateStepResponses({
      domain: 'continuous', A: [[0]], B: [[1]], C: [[1]], D: [[0]], K: [[0.1]], prescaler: [[50]], tracked: [0],
      points: 2000, duration: 200, stepSizes: [1],
      nonlinear: { model, states: [0], inputs: [0], disturbances: [], outputs: [0] },
    });
    const run = result.experiments[0].nonlinear!;
    expect(run.divergedAt).not.toBeNull();
    expect(run.outputs[0].every(Number.isFinite)).toBe(true);
  });
});
