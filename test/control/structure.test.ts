import { describe, expect, it } from 'vitest';
import { analyzeControllability, analyzeObservability, controllabilityStaircase, measuresAllStates } from '../../server/src/control/structure';
import { multiplyRows, transposeRows } from '../../server/src/control/controlLinearAlgebra';

describe('controllability does not depend on the units of the states', () => {
  // Controllability and the uncontrollable modes are invariant under a state similarity
  // x = S·x' (Kalman rank condition: rank[B', A'B', …] = rank S⁻¹[B, AB, …]); a diagonal S is a
  // change of units (metres to micrometres, newtons to kilonewtons).
  const rescale = (A: number[][], B: number[][], C: number[][], units: number[]) => ({
    A: A.map((row, i) => row.map((v, j) => (v * units[j]) / units[i])),
    B: B.map((row, i) => row.map((v) => v / units[i])),
    C: C.map((row) => row.map((v, j) => v * units[j])),
  });
  // A spring-mass carriage (controllable, observable from position) and the same with a decoupled
  // third state at s = −3 that neither the input reaches nor the output sees.
  const carriage = { A: [[0, 1], [-2, -0.5]], B: [[0], [1]], C: [[1, 0]] };
  const withIdle = { A: [[0, 1, 0], [-2, -0.5, 0], [0, 0, -3]], B: [[0], [1], [0]], C: [[1, 0, 0]] };
  const unitSets = [[1e-8, 1e8], [1e6, 1e-6], [1e-12, 1], [1, 1e12]];

  it('keeps a controllable, observable pair so in any units', () => {
    for (const units of unitSets) {
      const scaled = rescale(carriage.A, carriage.B, carriage.C, units);
      expect(analyzeControllability(scaled.A, scaled.B, 'continuous').controllable).toBe(true);
      expect(analyzeObservability(scaled.A, scaled.C, 'continuous').observable).toBe(true);
    }
  });

  it('still finds the uncontrollable and unobservable mode s = −3 in any units', () => {
    for (const units of unitSets.map((pair) => [...pair, 1e4])) {
      const scaled = rescale(withIdle.A, withIdle.B, withIdle.C, units);
      const controllability = analyzeControllability(scaled.A, scaled.B, 'continuous');
      expect(controllability.controllableDimension).toBe(2);
      expect(controllability.uncontrollableModes[0].value.re).toBeCloseTo(-3, 10);
      const observability = analyzeObservability(scaled.A, scaled.C, 'continuous');
      expect(observability.observableDimension).toBe(2);
      expect(observability.unobservableModes[0].value.re).toBeCloseTo(-3, 10);
    }
  });
});

describe('controllability staircase', () => {
  it('A = 0₂, B = [1; 0] is uncontrollable (two Jordan chains at one eigenvalue)', () => {
    const result = analyzeControllability([[0, 0], [0, 0]], [[1], [0]], 'continuous');
    expect(result.controllable).toBe(false);
    expect(result.controllableDimension).toBe(1);
    expect(result.uncontrollableModes).toHaveLength(1);
    expect(Math.abs(result.uncontrollableModes[0].value.re)).toBeLessThan(1e-12);
    expect(result.stabilisable).toBe(false); // the uncontrollable mode sits on the axis
    expect(result.margin).toBeLessThan(1e-12);
  });

  it('a chain of integrators with input at the end is controllable', () => {
    const A = [[0, 1, 0], [0, 0, 1], [0, 0, 0]];
    const result = analyzeControllability(A, [[0], [0], [1]], 'continuous');
    expect(result.controllable).toBe(true);
    expect(result.margin).toBeGreaterThan(0.1);
  });

  it('identifies a stable uncontrollable mode: diag(−1, 2), B = [0; 1] → stabilisable', () => {
    const result = analyzeControllability([[-1, 0], [0, 2]], [[0], [1]], 'continuous');
    expect(result.controllable).toBe(false);
    expect(result.uncontrollableModes[0].value.re).toBeCloseTo(-1, 12);
    expect(result.uncontrollableModes[0].stable).toBe(true);
    expect(result.stabilisable).toBe(true);
  });

  it('detects an uncontrollable mode hidden by an orthogonal change of basis', () => {
    // diag(−1, 2, 3) with B reaching only the last two states, rotated by a Householder reflector.
    const v = [1, 2, 3];
    const vv = 14;
    const H = v.map((vi, i) => v.map((vj, j) => (i === j ? 1 : 0) - (2 * vi * vj) / vv));
    const A = multiplyRows(multiplyRows(H, [[-1, 0, 0], [0, 2, 1], [0, 0, 3]]), transposeRows(H));
    const B = multiplyRows(H, [[0], [0], [1]]);
    const result = analyzeControllability(A, B, 'continuous');
    expect(result.controllableDimension).toBe(2);
    expect(result.uncontrollableModes[0].value.re).toBeCloseTo(-1, 10);
    const stair = controllabilityStaircase(A, B);
    // Identity: T orthogonal and Tᵀ A T reproduces the block-triangular form.
    const TtT = multiplyRows(transposeRows(stair.T), stair.T);
    TtT.forEach((row, i) => row.forEach((value, j) => expect(value).toBeCloseTo(i === j ? 1 : 0, 12)));
  });

  it('staircase of a 40-state, 2-input pair with a hidden 6-state part: identities TᵀT = I, TᵀAT = Ā, TᵀB = B̄, zero blocks', () => {
    // Block-triangular [[A11, A12], [0, A22]] with B = [B1; 0] (34 reachable states), turned by a
    // random orthogonal Q (product of reflectors): the staircase must find dimension 34 again.
    let seed = 41;
    const random = () => ((seed = (seed * 16807) % 2147483647) / 2147483647) - 0.5;
    const n = 40;
    const reachable = 34;
    const A0 = Array.from({ length: n }, (_, i) => Array.from({ length: n }, (_, j) => (i >= reachable && j < reachable ? 0 : random())));
    const B0 = Array.from({ length: n }, (_, i) => [0, 1].map(() => (i < reachable ? random() : 0)));
    let Q: number[][] = A0.map((_, i) => A0.map((__, j) => (i === j ? 1 : 0)));
    for (let r = 0; r < 3; r++) {
      const v = A0.map(() => random());
      const vv = v.reduce((sum, x) => sum + x * x, 0);
      Q = multiplyRows(Q, v.map((vi, i) => v.map((vj, j) => (i === j ? 1 : 0) - (2 * vi * vj) / vv)));
    }
    const A = multiplyRows(multiplyRows(Q, A0), transposeRows(Q));
    const B = multiplyRows(Q, B0);
    const stair = controllabilityStaircase(A, B);
    expect(stair.controllableDimension).toBe(reachable);
    const tolerance = 1e3 * n * Number.EPSILON * Math.sqrt(n);
    const TtT = multiplyRows(transposeRows(stair.T), stair.T);
    TtT.forEach((row, i) => row.forEach((value, j) => expect(Math.abs(value - (i === j ? 1 : 0))).toBeLessThan(tolerance)));
    const TtAT = multiplyRows(multiplyRows(transposeRows(stair.T), A), stair.T);
    TtAT.forEach((row, i) => row.forEach((value, j) => expect(Math.abs(value - stair.Abar[i][j])).toBeLessThan(tolerance * n)));
    const TtB = multiplyRows(transposeRows(stair.T), B);
    TtB.forEach((row, i) => row.forEach((value, j) => expect(Math.abs(value - stair.Bbar[i][j])).toBeLessThan(tolerance * n)));
    for (let i = reachable; i < n; i++) {
      for (let j = 0; j < reachable; j++) expect(Math.abs(stair.Abar[i][j])).toBeLessThan(tolerance * n);
      for (let j = 0; j < 2; j++) expect(Math.abs(stair.Bbar[i][j])).toBeLessThan(tolerance * n);
    }
  });

  it('a complex uncontrollable pair: PBH margin at a complex eigenvalue is ~0', () => {
    const A = [[0, 1, 0], [-4, 0, 0], [0, 0, -1]];
    const result = analyzeControllability(A, [[0], [0], [1]], 'continuous');
    expect(result.controllableDimension).toBe(1);
    expect(result.uncontrollableModes.map((m) => m.value.im).sort()).toEqual([
      expect.closeTo(-2, 10),
      expect.closeTo(2, 10),
    ]);
    for (const mode of result.uncontrollableModes) expect(mode.margin).toBeLessThan(1e-12);
  });

  it('observability by duality; measuresAllStates', () => {
    const A = [[0, 1], [0, 0]];
    expect(analyzeObservability(A, [[1, 0]], 'continuous').observable).toBe(true);
    const velocityOnly = analyzeObservability(A, [[0, 1]], 'continuous');
    expect(velocityOnly.observable).toBe(false);
    expect(velocityOnly.detectable).toBe(false);
    expect(measuresAllStates([[1, 0]], 2)).toBe(false);
    expect(measuresAllStates([[1, 0], [0, 2]], 2)).toBe(true);
    expect(measuresAllStates([[1, 1], [2, 2], [3, 3]], 2)).toBe(false);
  });

  it('discrete domain: an uncontrollable mode at z = 0.5 is stable, at z = 1 it is not', () => {
    expect(analyzeControllability([[0.5, 0], [0, 2]], [[0], [1]], 'discrete').stabilisable).toBe(true);
    expect(analyzeControllability([[1, 0], [0, 2]], [[0], [1]], 'discrete').stabilisable).toBe(false);
  });
});
