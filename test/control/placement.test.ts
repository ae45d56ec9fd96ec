import { describe, expect, it } from 'vitest';
import { placePoles } from '../../server/src/control/placement';
import { ackermannGain } from '../../server/src/control/ackermann';
import { defaultSettings } from '../../server/src/control/settings';
import { seededRandom } from '../../server/src/control/placementRobust';
import type { Complex } from '../../server/src/numeric/types';

const real = (...values: number[]): Complex[] => values.map((re) => ({ re, im: 0 }));
const sortPoles = (p: Complex[]) => p.slice().sort((a, b) => a.re - b.re || a.im - b.im);
function expectPoles(achieved: Complex[], requested: Complex[], relative: number) {
  const a = sortPoles(achieved);
  const r = sortPoles(requested);
  expect(a).toHaveLength(r.length);
  a.forEach((value, i) => {
    const scale = Math.max(1, Math.hypot(r[i].re, r[i].im));
    expect(Math.hypot(value.re - r[i].re, value.im - r[i].im)).toBeLessThan(relative * scale);
  });
}

describe('single-input placement', () => {
  it('third-order companion plant, poles −2 ± 4j, −10 → K = [199 55 8]', () => {
    // From memory of a standard textbook example, verified by hand:
    // (s + 10)(s² + 4s + 20) = s³ + 14s² + 60s + 200; open loop s³ + 6s² + 5s + 1, so in
    // companion form K = [200 − 1, 60 − 5, 14 − 6] = [199, 55, 8].
    const A = [[0, 1, 0], [0, 0, 1], [-1, -5, -6]];
    const B = [[0], [0], [1]];
    const poles = [{ re: -2, im: 4 }, { re: -2, im: -4 }, { re: -10, im: 0 }];
    const result = placePoles(A, B, poles, defaultSettings);
    expect(result.ok).toBe(true);
    expect(result.method).toBe('single-input');
    [199, 55, 8].forEach((value, j) => expect(result.K[0][j]).toBeCloseTo(value, 9));
    expectPoles(result.achievedPoles, poles, 1e-12);
    expect(result.backwardError).toBeLessThan(1e-13);
    expect(result.fragile).toBe(false);
  });

  it('agrees with Ackermann on random well-scaled plants (n = 2…6)', () => {
    const random = seededRandom(11);
    for (let n = 2; n <= 6; n++) {
      const A = Array.from({ length: n }, () => Array.from({ length: n }, () => random() * 2));
      const b = Array.from({ length: n }, () => random() * 2);
      const poles = real(...Array.from({ length: n }, (_, i) => -1 - i));
      const result = placePoles(A, b.map((v) => [v]), poles, defaultSettings);
      const reference = ackermannGain(A, b, poles);
      const scale = Math.max(...reference.map(Math.abs));
      result.K[0].forEach((value, j) => expect(Math.abs(value - reference[j])).toBeLessThan(1e-8 * scale));
    }
  });

  it('repeated poles with one input: placed, flagged defective', () => {
    const A = [[0, 1, 0], [0, 0, 1], [0, 0, 0]];
    const result = placePoles(A, [[0], [0], [1]], real(-2, -2, -2), defaultSettings);
    expect(result.ok).toBe(true);
    // (s + 2)³ = s³ + 6s² + 12s + 8 → K = [8 12 6] for the triple integrator (hand computation).
    [8, 12, 6].forEach((value, j) => expect(result.K[0][j]).toBeCloseTo(value, 10));
    expect(result.warnings).toContain('defective-closed-loop');
  });
});

describe('failures and uncontrollable modes', () => {
  it('rejects wrong pole count, unpaired complex pole, no input', () => {
    const A = [[0, 1], [0, 0]];
    expect(placePoles(A, [[0], [1]], real(-1), defaultSettings).failure?.reason).toBe('pole-count');
    expect(placePoles(A, [[0], [1]], [{ re: -1, im: 1 }, { re: -1, im: 2 }], defaultSettings).failure?.reason).toBe('not-conjugate-closed');
    expect(placePoles(A, [[], []], real(-1, -2), defaultSettings).failure?.reason).toBe('no-input');
  });

  it('an uncontrollable mode not requested → failure naming the mode; requested → kept', () => {
    const A = [[-3, 0], [0, 1]];
    const B = [[0], [1]];
    const bad = placePoles(A, B, real(-1, -2), defaultSettings);
    expect(bad.ok).toBe(false);
    expect(bad.failure?.reason).toBe('uncontrollable-mode-not-requested');
    expect(bad.failure?.mode?.re).toBeCloseTo(-3, 12);
    const good = placePoles(A, B, real(-3, -5), defaultSettings);
    expect(good.ok).toBe(true);
    expect(good.warnings).toContain('uncontrollable-modes-kept');
    expectPoles(good.achievedPoles, real(-3, -5), 1e-12);
  });
});

describe('multi-input robust eigenstructure assignment', () => {
  it('Kautsky, Nichols & Van Dooren (1985), Example 1 plant (from memory)', () => {
    // The 4-state, 2-input plant of KNV 1985 as reproduced in SciPy's place_poles documentation
    // (from memory), poles −0.2, −0.5, −5.0566, −8.6659.
    const A = [
      [1.38, -0.2077, 6.715, -5.676],
      [-0.5814, -4.29, 0, 0.675],
      [1.067, 4.273, -6.654, 5.893],
      [0.048, 4.273, 1.343, -2.104],
    ];
    const B = [[0, 0], [5.679, 0], [1.136, -3.146], [1.136, 0]];
    const poles = real(-0.2, -0.5, -5.0566, -8.6659);
    const result = placePoles(A, B, poles, defaultSettings);
    expect(result.ok).toBe(true);
    expect(result.method).toBe('robust-eigenstructure');
    expectPoles(result.achievedPoles, poles, 1e-10);
    expect(result.eigenvectorCondition).toBeGreaterThanOrEqual(1);
    // SciPy 1.17 place_poles on the same data: κ₂(V) = 4.28 (KNV0), 4.51 (YT); ours ≈ 4.4.
    expect(result.eigenvectorCondition).toBeLessThan(5);
    expect(result.backwardError).toBeLessThan(1e-13);
  });

  it('complex pairs with two inputs', () => {
    const random = seededRandom(5);
    const n = 6;
    const A = Array.from({ length: n }, () => Array.from({ length: n }, () => random() * 4));
    const B = Array.from({ length: n }, () => [random(), random()]);
    const poles = [
      { re: -1, im: 2 }, { re: -1, im: -2 }, { re: -3, im: 0.5 }, { re: -3, im: -0.5 }, { re: -4, im: 0 }, { re: -6, im: 0 },
    ];
    const result = placePoles(A, B, poles, defaultSettings);
    expect(result.method).toBe('robust-eigenstructure');
    expectPoles(result.achievedPoles, poles, 1e-9);
    expect(result.backwardError).toBeLessThan(1e-12);
  });

  it('a pole repeated more often than rank B falls back and warns', () => {
    const A = [[0, 1, 0, 0], [0, 0, 1, 0], [0, 0, 0, 1], [1, 0, 0, 0]];
    const B = [[0, 0], [1, 0], [0, 0], [0, 1]];
    const result = placePoles(A, B, real(-1, -1, -1, -2), defaultSettings);
    expect(result.ok).toBe(true);
    expect(result.method).toBe('defective-fallback');
    expect(result.warnings).toContain('defective-closed-loop');
    expectPoles(result.achievedPoles, real(-1, -1, -1, -2), 1e-4); // a triple root is only accurate to ~ε^(1/3)
  });

  it('a pole repeated rank-B times is assigned non-defectively (A = 0, B = I₂)', () => {
    const result = placePoles([[0, 0], [0, 0]], [[1, 0], [0, 1]], real(-3, -3), defaultSettings);
    expect(result.method).toBe('robust-eigenstructure');
    expectPoles(result.achievedPoles, real(-3, -3), 1e-12);
    expect(result.eigenvectorCondition).toBeLessThan(10);
  });

  it(
    '100 states, 10 inputs, poles −1 … −100 (slow: not timed; plant entries uniform in ±10 — with ±1 the problem itself is ill-posed, κ₂(V) ≈ 1e9 for SciPy\'s KNV too)',
    () => {
      const random = seededRandom(100);
      const n = 100;
      const m = 10;
      const A = Array.from({ length: n }, () => Array.from({ length: n }, () => random() * 20));
      const B = Array.from({ length: n }, () => Array.from({ length: m }, () => random() * 20));
      const poles = real(...Array.from({ length: n }, (_, i) => -1 - i));
      const result = placePoles(A, B, poles, defaultSettings);
      expect(result.ok).toBe(true);
      expect(result.backwardError).toBeLessThan(1e-10);
      expectPoles(result.achievedPoles, poles, 1e-6);
    },
    600_000,
  );
});

import fixture from '../fixtures/reference/control_placement.json';
import { analyzeControllability } from '../../server/src/control/structure';

describe('SciPy reference (test/reference/control_placement.py)', () => {
  it('place_poles: achieved poles agree (several inputs: poles, not gains; one input: the unique gain too)', () => {
    for (const c of fixture.placement) {
      const poles = c.poles.map(([re, im]: number[]) => ({ re, im }));
      const result = placePoles(c.A, c.B, poles, defaultSettings);
      expect(result.ok).toBe(true);
      // Tolerance c·n·ε·κ with κ our own reported condition and c = 1e4 (eigenvalue sensitivity
      // also scales with ‖B‖‖K‖/|λ|, up to ~1e2 here).
      const tolerance = 1e4 * c.A.length * Number.EPSILON * Math.max(result.eigenvectorCondition, c.eigenvectorCondition);
      expect(result.maxRelativePoleError).toBeLessThan(tolerance);
      if (c.B[0].length === 1) {
        const scale = Math.max(...c.gain[0].map(Math.abs));
        c.gain[0].forEach((v: number, j: number) => expect(Math.abs(result.K[0][j] - v)).toBeLessThan(tolerance * scale));
      }
    }
  });

  it('controllable subspace dimension matches the numerical rank of the controllability matrix', () => {
    for (const c of fixture.structure) {
      expect(analyzeControllability(c.A, c.B, 'continuous', { computeMargin: false }).controllableDimension).toBe(c.controllableDimension);
    }
  });
});

import fc from 'fast-check';
import { frobenius } from '../../server/src/control/controlLinearAlgebra';

describe('property: achieved poles within the first-order perturbation bound', () => {
  it('random plants n = 2…7, m = 1…3, real poles and conjugate pairs', () => {
    fc.assert(
      fc.property(fc.integer({ min: 2, max: 7 }), fc.integer({ min: 1, max: 3 }), fc.integer({ min: 1, max: 1_000_000 }), (n, m, seed) => {
        const random = seededRandom(seed);
        const A = Array.from({ length: n }, () => Array.from({ length: n }, () => random() * 4));
        const B = Array.from({ length: n }, () => Array.from({ length: m }, () => random() * 4));
        const poles: Complex[] = [];
        while (poles.length < n) {
          if (n - poles.length >= 2 && random() > 0) {
            const re = -1 - 3 * (random() + 0.5);
            const im = 0.2 + 2 * (random() + 0.5);
            poles.push({ re, im }, { re, im: -im });
          } else poles.push({ re: -0.5 - 5 * (random() + 0.5), im: 0 });
        }
        const result = placePoles(A, B, poles, defaultSettings);
        expect(result.ok).toBe(true);
        // |δλ| ≲ κ₂(V)·ε·(‖A‖ + ‖B‖‖K‖) to first order (Bauer–Fike); c = 1e3·n.
        const smallest = Math.min(...poles.map((p) => Math.hypot(p.re, p.im)));
        const bound = 1e3 * n * Number.EPSILON * result.eigenvectorCondition * (frobenius(A) + frobenius(B) * result.gainNorm) / smallest;
        expect(result.maxRelativePoleError).toBeLessThanOrEqual(Math.max(bound, 1e3 * n * Number.EPSILON));
      }),
      { numRuns: 150, seed: 42 },
    );
  });
});

describe('multi-input special structure', () => {
  it('uncontrollable stable mode kept while two inputs place the rest (staircase + KNV)', () => {
    // diag(−3, 1, 2) mixed by an orthogonal rotation; inputs reach only the last two modes.
    const c = Math.cos(0.7);
    const s = Math.sin(0.7);
    const R = [[c, -s, 0], [s, c, 0], [0, 0, 1]];
    const Rt = R[0].map((_, j) => R.map((row) => row[j]));
    const mul = (X: number[][], Y: number[][]) => X.map((row) => Y[0].map((_, j) => row.reduce((sum, v, k) => sum + v * Y[k][j], 0)));
    const A = mul(mul(R, [[-3, 0, 0], [0, 1, 1], [0, 0, 2]]), Rt);
    const B = mul(R, [[0, 0], [1, 0], [0.5, 1]]);
    const result = placePoles(A, B, real(-1, -3, -2), defaultSettings);
    expect(result.ok).toBe(true);
    expect(result.controllableDimension).toBe(2);
    expectPoles(result.achievedPoles, real(-1, -2, -3), 1e-12);
  });

  it('two identical input columns (rank B = 1): compressed to one input, gain of minimum norm', () => {
    const A = [[0, 1], [-2, -0.3]];
    const result = placePoles(A, [[0, 0], [1, 1]], real(-2, -3), defaultSettings);
    expect(result.method).toBe('single-input');
    expectPoles(result.achievedPoles, real(-2, -3), 1e-12);
    // Minimum norm splits the effort equally between the two identical inputs.
    expect(result.K[0][0]).toBeCloseTo(result.K[1][0], 12);
    expect(result.K[0][1]).toBeCloseTo(result.K[1][1], 12);
  });
});
