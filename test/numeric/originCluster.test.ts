// Roots at the origin reported as exact zeros only when the computed cloud is within rounding.
import { describe, expect, it } from 'vitest';
import { invariantZeros } from '../../server/src/numeric/invariantZeros';
import { snapOriginCluster } from '../../server/src/numeric/originCluster';

const norm = (...matrices: number[][][]): number => Math.sqrt(matrices.flat(2).reduce((sum, v) => sum + v * v, 0));

describe('zeros at the origin', () => {
  it('force → acceleration of a spring-mass table has the double zero s = 0 of s²/(m s² + c s + k)', () => {
    // Closed form: y = ẍ = (F − c ẋ − k x)/m, so Y/F = s²/(m s² + c s + k): zeros 0, 0.
    const m = 42;
    const k = 9000;
    const c = 120;
    const A = [[0, 1], [-k / m, -c / m]];
    const B = [[0], [1 / m]];
    const C = [[-k / m, -c / m]];
    const D = [[1 / m]];
    const computed = invariantZeros(A, B, C, D).zeros;
    expect(computed).toHaveLength(2);
    const snapped = snapOriginCluster(computed, norm(A, B, C, D));
    expect(snapped.atOrigin).toBe(2);
    for (const zero of snapped.values) expect(Math.hypot(zero.re, zero.im)).toBe(0);
  });

  it('a triple zero of s³/(s³ + 2s² + 3s + 4) (controllable canonical form) snaps to three zeros', () => {
    // Closed form: C = [−4, −3, −2], D = [1] gives numerator s³ (D·den + C·adj·B).
    const A = [[0, 1, 0], [0, 0, 1], [-4, -3, -2]];
    const B = [[0], [0], [1]];
    const C = [[-4, -3, -2]];
    const D = [[1]];
    const snapped = snapOriginCluster(invariantZeros(A, B, C, D).zeros, norm(A, B, C, D));
    expect(snapped.atOrigin).toBe(3);
  });

  it('keeps zeros that are small but real: ±1e-3, a cloud off centre, a single zero at 1e-9', () => {
    expect(snapOriginCluster([{ re: 1e-3, im: 0 }, { re: -1e-3, im: 0 }], 1).atOrigin).toBe(0);
    // Mean 1.5e-9 is far above rounding (ε·scale): not a perturbed multiple zero at 0.
    expect(snapOriginCluster([{ re: 1e-9, im: 0 }, { re: 2e-9, im: 0 }], 1).atOrigin).toBe(0);
    expect(snapOriginCluster([{ re: 1e-9, im: 0 }, { re: -5, im: 0 }], 1).atOrigin).toBe(0);
    // A single root within rounding of 0 is 0; the others keep their values and order.
    const single = snapOriginCluster([{ re: -5, im: 0 }, { re: 3e-16, im: 0 }], 1);
    expect(single.atOrigin).toBe(1);
    expect(single.values).toEqual([{ re: -5, im: 0 }, { re: 0, im: 0 }]);
  });
});
