import { describe, expect, it } from 'vitest';
import { setpointGains, squareSetpointPrescaler } from '../../server/src/control/setpoint';
import { placePoles } from '../../server/src/control/placement';
import { analyzeModes } from '../../server/src/control/modes';
import { defaultSettings } from '../../server/src/control/settings';
import { seededRandom } from '../../server/src/control/placementRobust';
import { singularValuesOf } from '../../server/src/control/controlLinearAlgebra';
import fixture from '../fixtures/reference/control_placement.json';

const real = (...values: number[]) => values.map((re) => ({ re, im: 0 }));

// A cart (position, velocity) driven by force: ẋ₁ = x₂, ẋ₂ = −0.5·x₂ + u.
const cartA = [[0, 1], [0, -0.5]];
const cartB = [[0], [1]];

describe('set-point gains', () => {
  it('position output: unique prescaler, equals 1/G_dc, and the closed-loop DC gain times N is 1', () => {
    const K = placePoles(cartA, cartB, real(-2, -3), defaultSettings).K;
    const result = setpointGains(cartA, cartB, [[1, 0]], [[0]], [0], K, 'continuous');
    expect(result.feasibility).toBe('unique');
    expect(result.dcGainDefined).toBe(true);
    // Hand computation: (s+2)(s+3) = s² + 5s + 6 → K = [6, 4.5]; G_dc = 1/6 → N = 6.
    expect(result.prescaler![0][0]).toBeCloseTo(6, 10);
    expect(result.prescalerFromDcGain![0][0]).toBeCloseTo(result.prescaler![0][0], 10);
    expect(result.closedLoopDcGain![0][0] * result.prescaler![0][0]).toBeCloseTo(1, 12);
    expect(result.illConditioned).toBe(false);
  });

  it('velocity measured by a differentiating sensor: invariant zero at s = 0 → zero-at-dc by rank, also perturbed', () => {
    // Output y = velocity = derivative of position: with force input the steady state of the
    // velocity is fixed by the damping, but set-point on position rate with an integrator plant
    // ẋ₁ = x₂, ẋ₂ = u, y = x₂ … is feasible; the zero sits in a plant whose output is ẋ of an
    // integrating state: ẋ₁ = u, y = ẋ₁ − … Use the classical form G(s) = s/(s + 1): A = −1,
    // B = 1, C = −1, D = 1 (G = D + C(s − A)⁻¹B = 1 − 1/(s + 1) = s/(s + 1), hand algebra).
    const K = [[2]];
    const exact = setpointGains([[-1]], [[1]], [[-1]], [[1]], [0], K, 'continuous');
    expect(exact.feasibility).toBe('zero-at-dc');
    expect(exact.prescaler).toBeNull();
    expect(exact.singularCombination).toEqual([1]);
    // Perturb by a few ulps: the rank decision (with its scaled tolerance) is unchanged.
    const tiny = 4 * Number.EPSILON;
    const perturbed = setpointGains([[-1 + tiny]], [[1]], [[-1]], [[1 + tiny]], [0], K, 'continuous');
    expect(perturbed.feasibility).toBe('zero-at-dc');
  });

  it('two outputs, two inputs: one invariant zero at 0 in a combination; singularCombination names it', () => {
    // Two decoupled first-order lags and a third output … here y₁ = x₁ + x₂, y₂ = 2x₁ + 2x₂ + … make
    // outputs y₁ = x₁, y₂ = x₁ (same signal): combination y₁ − y₂ ≡ 0 can never equal (1, 0).
    const A = [[-1, 0], [0, -2]];
    const B = [[1, 0], [0, 1]];
    const C = [[1, 0], [1, 0]];
    const D = [[0, 0], [0, 0]];
    const result = setpointGains(A, B, C, D, [0, 1], [[0, 0], [0, 0]], 'continuous');
    expect(result.feasibility).toBe('zero-at-dc');
    const w = result.singularCombination!;
    expect(Math.abs(w[0] + w[1])).toBeLessThan(1e-12);
    expect(Math.abs(Math.abs(w[0]) - Math.SQRT1_2)).toBeLessThan(1e-12);
  });

  it('minimum-norm with more inputs than tracked outputs; infeasible with more outputs', () => {
    const A = [[-1, 0], [0, -2]];
    const B = [[1, 0], [0, 1]];
    const C = [[1, 1], [1, -1], [0, 1]];
    const D = [[0, 0], [0, 0], [0, 0]];
    const K = [[0, 0], [0, 0]];
    const one = setpointGains(A, B, C, D, [0], K, 'continuous');
    expect(one.feasibility).toBe('minimum-norm');
    // Identity: the steady state reaches the set-point, C_t·Nx + D_t·Nu = 1, A·Nx + B·Nu = 0.
    expect(one.Nx![0][0] + one.Nx![1][0]).toBeCloseTo(1, 12);
    expect(setpointGains(A, B, C, D, [0, 1, 2], K, 'continuous').feasibility).toBe('infeasible');
  });

  it('an uncontrollable integrator left in the loop: DC gain undefined (not zero)', () => {
    const A = [[0, 0], [0, -1]];
    const B = [[0], [1]];
    const result = setpointGains(A, B, [[0, 1]], [[0]], [0], [[0, 1]], 'continuous');
    expect(result.dcGainDefined).toBe(false);
    expect(result.closedLoopDcGain).toBeNull();
  });

  it('a pole within rounding of s = 0 makes the DC gain undefined; a small but clear pole does not', async () => {
    const { steadyStateGain } = await import('../../server/src/control/dcGain');
    // G = 1/(−a) for the first state: a = −1e−12 is a genuine slow pole (κ = 1e12 < 1/(10·n·ε) ≈ 2e14);
    // a = −1e−16 is a pole at the DC point to working accuracy.
    const gainOf = (a: number) => steadyStateGain([[a, 0], [0, -1]], [[1], [1]], [[1, 0]], [[0]], 'continuous');
    expect(gainOf(-1e-12)![0][0]).toBeCloseTo(1e12, 0);
    expect(gainOf(-1e-16)).toBeNull();
    // Discrete: I − A singular at z = 1.
    expect(steadyStateGain([[1 - 1e-17]], [[1]], [[1]], [[0]], 'discrete')).toBeNull();
    expect(steadyStateGain([[0.5]], [[1]], [[1]], [[0]], 'discrete')![0][0]).toBeCloseTo(2, 14);
  });

  it('discrete domain uses z = 1: a discrete accumulator plant x[k+1] = x[k] + u, y = x', () => {
    const result = setpointGains([[1]], [[1]], [[1]], [[0]], [0], [[0.5]], 'discrete');
    expect(result.feasibility).toBe('unique');
    // Closed loop x⁺ = 0.5x + N r → DC gain N/(0.5) → N = 0.5 (hand computation).
    expect(result.prescaler![0][0]).toBeCloseTo(0.5, 12);
  });

  it('nearly-singular DC: huge prescaler is reported ill-conditioned', () => {
    // G(s) = (s + δ)/(s + 1)² with δ = 1e-9: feasible but the DC gain is δ.
    const delta = 1e-9;
    const A = [[0, 1], [-1, -2]];
    const B = [[0], [1]];
    const C = [[delta, 1]];
    const result = setpointGains(A, B, C, [[0]], [0], [[0, 0]], 'continuous');
    expect(result.feasibility).toBe('unique');
    expect(result.illConditioned).toBe(true);
    // Computed to ~ε/δ relative accuracy only, which is what ill-conditioned means here.
    expect(Math.abs(result.prescaler![0][0] * delta - 1)).toBeLessThan(1e-6);
  });

  it('square case of 40 states and 3 inputs: closed-loop DC gain × N = I, and [Nx; Nu] solves the Rosenbrock system', () => {
    const random = seededRandom(20261205);
    const n = 40;
    const m = 3;
    const A = Array.from({ length: n }, (_, i) => Array.from({ length: n }, (_, j) => (random() - 0.5) / Math.sqrt(n) - (i === j ? 2 : 0)));
    const B = Array.from({ length: n }, () => Array.from({ length: m }, () => random() - 0.5));
    const C = Array.from({ length: m }, () => Array.from({ length: n }, () => random() - 0.5));
    const D = C.map(() => new Array<number>(m).fill(0));
    const K = Array.from({ length: m }, () => Array.from({ length: n }, () => 0.1 * (random() - 0.5)));
    const result = setpointGains(A, B, C, D, [0, 1, 2], K, 'continuous');
    expect(result.feasibility).toBe('unique');
    // Identities (no reference needed): G_dc·N = I and A·Nx + B·Nu = 0, C·Nx = I, to ~cond·n·ε.
    const scale = 1e3 * n * Number.EPSILON * result.conditionNumber;
    const product = result.closedLoopDcGain!.map((row) => result.prescaler![0].map((_, j) => row.reduce((sum, g, c) => sum + g * result.prescaler![c][j], 0)));
    product.forEach((row, i) => row.forEach((v, j) => expect(Math.abs(v - (i === j ? 1 : 0))).toBeLessThan(scale)));
    for (let i = 0; i < n; i++) {
      for (let j = 0; j < m; j++) {
        const value = A[i].reduce((sum, a, c) => sum + a * result.Nx![c][j], 0) + B[i].reduce((sum, b, c) => sum + b * result.Nu![c][j], 0);
        expect(Math.abs(value)).toBeLessThan(scale);
      }
    }
    C.forEach((row, i) => result.Nx![0].forEach((_, j) => expect(Math.abs(row.reduce((sum, c, k) => sum + c * result.Nx![k][j], 0) - (i === j ? 1 : 0))).toBeLessThan(scale)));
  });

  it('takes rank [A B] = n from a full-rank Rosenbrock matrix: the top rows\' own SVD agrees, on 300 random and graded systems', () => {
    // Interlacing (from memory): deleting q rows keeps σ_n(top) ≥ σ_(n+q)(M). Checked here against
    // the decomposition the shortcut skips, on well-scaled and badly graded matrices alike.
    const centred = seededRandom(20261203); // uniform on [−0.5, 0.5)
    const random = () => centred() + 0.5;
    for (let trial = 0; trial < 300; trial++) {
      const n = 1 + Math.floor(random() * 12);
      const m = 1 + Math.floor(random() * 3);
      const q = 1 + Math.floor(random() * m);
      const grade = 10 ** (8 * random());
      const A = Array.from({ length: n }, (_, i) => Array.from({ length: n }, () => (random() - 0.5) * grade ** (i / n)));
      const B = Array.from({ length: n }, () => Array.from({ length: m }, () => random() - 0.5));
      const C = Array.from({ length: q }, () => Array.from({ length: n }, () => random() - 0.5));
      const D = C.map(() => new Array<number>(m).fill(0));
      const K = Array.from({ length: m }, () => new Array<number>(n).fill(0));
      const outputs = C.map((_, i) => i);
      const domain = trial % 2 ? 'continuous' : 'discrete';
      const result = setpointGains(A, B, C, D, outputs, K, domain);
      const top = A.map((row, i) => [...row.map((v, j) => v - (domain === 'discrete' && i === j ? 1 : 0)), ...B[i]]);
      const s = singularValuesOf(top);
      const rankTop = s.filter((v) => v > 10 * (n + m) * Number.EPSILON * s[0]).length;
      expect(result.rankInfo.expected).toBe(rankTop + q);
    }
  });

  it('an uncontrollable mode at s = 0 lowers rank [A B] and the expected rank with it', () => {
    // ẋ₁ = 0 (a level no input reaches), ẋ₂ = −x₂ + u, y = x₂: [A B] = [0 0 0; 0 −1 1] has rank 1.
    const result = setpointGains([[0, 0], [0, -1]], [[0], [1]], [[0, 1]], [[0]], [0], [[0, 0]], 'continuous');
    expect(result.rankInfo.expected).toBe(2);
    expect(result.rankInfo.rank).toBe(2);
  });

  it('SciPy fixture: DC gains of random stable closed loops match a direct solve', () => {
    for (const c of fixture.dcGain) {
      const result = setpointGains(c.A, c.B, c.C, c.D, c.C.map((_: number[], i: number) => i), c.K, 'continuous');
      c.dcGain.forEach((row: number[], i: number) =>
        row.forEach((v: number, j: number) => expect(Math.abs(result.closedLoopDcGain![i][j] - v)).toBeLessThan(1e-10 * Math.max(1, Math.abs(v)) * c.condition)),
      );
    }
  });
});

describe('modes', () => {
  it('damping, natural frequency, time constant of s = −1 ± 2j and an integrator', () => {
    const result = analyzeModes([[-1, 2, 0], [-2, -1, 0], [0, 0, 0]], 'continuous');
    expect(result.stability).toBe('marginal');
    const pair = result.modes.find((m) => m.value.im > 0)!;
    expect(pair.naturalFrequency).toBeCloseTo(Math.sqrt(5), 12);
    expect(pair.dampingRatio).toBeCloseTo(1 / Math.sqrt(5), 12);
    expect(pair.timeConstant).toBeCloseTo(1, 12);
    const integrator = result.modes.find((m) => m.value.im === 0)!;
    expect(integrator.timeConstant).toBeNull();
    expect(integrator.stability).toBe('marginal');
  });

  it('an eigenvalue computed as 1e-17 is marginal; a perturbed double integrator is marginal, not unstable', () => {
    expect(analyzeModes([[-1, 0], [0, 1e-17]], 'continuous').stability).toBe('marginal');
    const random = seededRandom(3);
    const A = [[0, 1], [0, 0]].map((row) => row.map((v) => v + random() * 1e-16));
    expect(analyzeModes(A, 'continuous').stability).toBe('marginal');
    expect(analyzeModes([[0.1]], 'continuous').stability).toBe('unstable');
  });

  it('discrete: |z| vs 1 and s = log(z)/T', () => {
    const result = analyzeModes([[0.5, 0], [0, 1]], 'discrete', 0.1);
    expect(result.stability).toBe('marginal');
    const fast = result.modes.find((m) => m.value.re === 0.5)!;
    expect(fast.timeConstant).toBeCloseTo(0.1 / Math.log(2), 12);
    expect(analyzeModes([[0]], 'discrete').modes[0].timeConstant).toBe(0);
  });
});

describe('the square prescaler computed ahead of the rank decision', () => {
  it('is exactly the prescaler setpointGains returns for full-rank square equations', () => {
    const K = [[2, 1.5]];
    const early = squareSetpointPrescaler(cartA, cartB, [[1, 0]], [[0]], [0], K, 'continuous');
    const decided = setpointGains(cartA, cartB, [[1, 0]], [[0]], [0], K, 'continuous');
    expect(decided.feasibility).toBe('unique');
    expect(early).not.toBeNull();
    expect(early).toEqual(decided.prescaler);
    early!.forEach((row, i) => row.forEach((value, j) => expect(Object.is(value, decided.prescaler![i][j])).toBe(true)));
  });

  it('is withheld for a zero at s = 0 that rounding leaves without an exact zero pivot', () => {
    // C orthogonal to the computed A⁻¹B: C·A⁻¹·B = 0, a zero at s = 0, up to rounding. The LU
    // factorisation of [A B; C 0] meets no exactly zero pivot here (its condition estimate is
    // about 4e-19), so only the condition guard keeps the early study from starting.
    const A = [[-11, 4.21, -2.11], [-2.89, -3.71, 0.33], [-1.71, 2.52, -3.45]];
    const B = [[0.43], [1.85], [1.36]];
    const C = [[-0.4905577549527457, 0.09116014015463376, 0]];
    const K = [[0.1, 0.2, 0.3]];
    expect(setpointGains(A, B, C, [[0]], [0], K, 'continuous').feasibility).toBe('zero-at-dc');
    expect(squareSetpointPrescaler(A, B, C, [[0]], [0], K, 'continuous')).toBeNull();
  });
});

