import { describe, expect, it } from 'vitest';
import { checkSpec, dampingFromOvershoot, overshootFromDamping, polesFromSpec } from '../../server/src/control/specToPoles';

describe('specification to poles', () => {
  it('inverts the second-order overshoot formula Mp = exp(−πζ/√(1−ζ²))', () => {
    // Closed form: ζ = 0.5 gives 100·exp(−π·0.5/√0.75) = 16.303 %.
    expect(overshootFromDamping(0.5)).toBeCloseTo(16.303, 3);
    for (const zeta of [0.1, 0.3, 0.5, 0.7, 0.9]) {
      expect(dampingFromOvershoot(overshootFromDamping(zeta))).toBeCloseTo(zeta, 12);
    }
  });

  it('puts the dominant pair at ζωn = 4/ts and the rest fastPoleFactor times faster, distinct and real', () => {
    const result = polesFromSpec({ settlingSeconds: 2, overshootPercent: 10 }, 5, { fastPoleFactor: 4, domain: 'continuous' });
    expect(result.ok).toBe(true);
    expect(result.poles).toHaveLength(5);
    const zeta = dampingFromOvershoot(10);
    expect(result.poles[0].re).toBeCloseTo(-2, 12); // ζωn = 4/ts
    expect(Math.atan2(result.poles[0].im, -result.poles[0].re)).toBeCloseTo(Math.acos(zeta), 12);
    const fast = result.poles.slice(2);
    for (const pole of fast) {
      expect(pole.im).toBe(0);
      expect(pole.re).toBeLessThanOrEqual(-8 * (1 - 4 * Number.EPSILON));
    }
    expect(new Set(fast.map((pole) => pole.re)).size).toBe(fast.length);
    expect(result.formulas).toContain('settling-2-percent: wn = 4/(zeta*ts)');
  });

  it('maps to z = e^{sT} for discrete designs and refuses specs without a time requirement', () => {
    const discrete = polesFromSpec({ settlingSeconds: 1, overshootPercent: 5 }, 2, { fastPoleFactor: 4, domain: 'discrete', samplePeriod: 0.01 });
    expect(Math.hypot(discrete.poles[0].re, discrete.poles[0].im)).toBeCloseTo(Math.exp(-4 * 0.01), 12);
    expect(polesFromSpec({ overshootPercent: 5 }, 2, { fastPoleFactor: 4, domain: 'continuous' }).failure).toBe('no-time-requirement');
    expect(polesFromSpec({ settlingSeconds: 1, overshootPercent: 120 }, 2, { fastPoleFactor: 4, domain: 'continuous' }).failure).toBe('overshoot-out-of-range');
  });

  it('reports violations of the simulated metrics', () => {
    const violations = checkSpec({ settlingTime: 2.5, overshootPercent: 3, riseTime: null }, { settlingSeconds: 2, overshootPercent: 5, riseSeconds: 1 });
    expect(violations.map((v) => v.kind)).toEqual(['settling', 'rise']);
    expect(checkSpec({ settlingTime: 1.9, overshootPercent: 4, riseTime: 0.5 }, { settlingSeconds: 2, overshootPercent: 5, riseSeconds: 1 })).toEqual([]);
  });
});
