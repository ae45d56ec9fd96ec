import { describe, expect, it } from 'vitest';
import { computeStepMetrics } from '../../server/src/control/stepMetrics';

// Closed form of the unit step response of ωn²/(s² + 2ζωn s + ωn²), 0 < ζ < 1:
// y(t) = 1 − e^{−ζωn t}/√(1−ζ²) · sin(ωd t + acos ζ), ωd = ωn√(1−ζ²).
function secondOrder(t: number, zeta: number, wn: number): number {
  const root = Math.sqrt(1 - zeta * zeta);
  return 1 - (Math.exp(-zeta * wn * t) / root) * Math.sin(wn * root * t + Math.acos(zeta));
}

function solveRising(f: (t: number) => number, level: number, low: number, high: number): number {
  for (let k = 0; k < 200; k++) {
    const middle = 0.5 * (low + high);
    if (f(middle) < level) low = middle;
    else high = middle;
  }
  return 0.5 * (low + high);
}

describe('step metrics', () => {
  const zeta = 0.5;
  const wn = 1;
  const time = Array.from({ length: 20001 }, (_, k) => k * 0.001);
  const values = time.map((t) => secondOrder(t, zeta, wn));
  const metrics = computeStepMetrics(time, values, 1, { finalValue: 1 });

  it('measures the closed-form overshoot 100·exp(−πζ/√(1−ζ²)) = 16.30 % and peak time π/(ωn√(1−ζ²))', () => {
    expect(metrics.overshootPercent).toBeCloseTo(100 * Math.exp((-Math.PI * zeta) / Math.sqrt(1 - zeta * zeta)), 4);
    expect(metrics.peakTime).toBeCloseTo(Math.PI / (wn * Math.sqrt(1 - zeta * zeta)), 2);
    expect(metrics.undershootPercent).toBe(0);
    expect(metrics.steadyStateError).toBe(0);
  });

  it('measures the 10–90 % rise time found by bisection on the closed form', () => {
    const f = (t: number): number => secondOrder(t, zeta, wn);
    const peak = Math.PI / Math.sqrt(1 - zeta * zeta);
    const rise = solveRising(f, 0.9, 0, peak) - solveRising(f, 0.1, 0, peak);
    expect(metrics.riseTime).not.toBeNull();
    expect(Math.abs((metrics.riseTime as number) - rise)).toBeLessThan(1e-5);
  });

  it('puts the 2 % settling time between the second extremum and the envelope bound', () => {
    // Extremum k of the closed form at kπ/ωd deviates by e^{−ζωn kπ/ωd}: 2.66 % at k = 2, so the
    // response leaves the band after 2π/ωd = 7.255 s; the envelope e^{−ζωn t}/√(1−ζ²) is inside
    // the band after ln(1/(0.02√(1−ζ²)))/(ζωn) = 8.11 s.
    const wd = wn * Math.sqrt(1 - zeta * zeta);
    const envelope = Math.log(1 / (0.02 * Math.sqrt(1 - zeta * zeta))) / (zeta * wn);
    expect(metrics.settled).toBe(true);
    expect(metrics.settlingTime as number).toBeGreaterThan((2 * Math.PI) / wd);
    expect(metrics.settlingTime as number).toBeLessThan(envelope);
  });

  it('measures the undershoot of a right-half-plane zero: (1 − s)/(s + 1)² dips to 1 − 2e^{−1/2}', () => {
    // Partial fractions: y(t) = 1 − e^{−t} − 2t e^{−t}; minimum at t = 1/2.
    const t = Array.from({ length: 12001 }, (_, k) => k * 0.001);
    const y = t.map((s) => 1 - Math.exp(-s) - 2 * s * Math.exp(-s));
    const m = computeStepMetrics(t, y, 1, { finalValue: 1 });
    expect(m.undershootPercent as number).toBeCloseTo(100 * (2 * Math.exp(-0.5) - 1), 4);
  });

  it('compares input peaks with their limits and flags an unmeasurable change', () => {
    const t = [0, 1, 2, 3];
    const m = computeStepMetrics(t, [0, 0.5, 1, 1], 1, { inputs: [[3, 2, 1, 1]], limits: [{ low: -2, high: 2 }] });
    expect(m.inputs[0].peak).toBe(3);
    expect(m.inputs[0].exceedsLimit).toBe(true);
    const flat = computeStepMetrics(t, [0, 0, 0, 0], 1);
    expect(flat.measurable).toBe(false);
    expect(flat.steadyStateError).toBe(1);
  });

  it('shows a steady-state error in the last bits of the values as 0, and keeps a real one', () => {
    const t = [0, 1, 2, 3];
    const setPoint = 0.0095;
    const lastBit = setPoint * (1 + 2 * Number.EPSILON); // one or two units in the last place
    expect(computeStepMetrics(t, [0, 0.005, 0.009, setPoint], setPoint, { finalValue: lastBit }).steadyStateError).toBe(0);
    const real = computeStepMetrics(t, [0, 0.005, 0.009, setPoint], setPoint, { finalValue: setPoint * (1 - 1e-9) });
    expect(real.steadyStateError / (setPoint * 1e-9)).toBeCloseTo(1, 6);
  });
});
