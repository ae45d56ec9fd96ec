// The engine's verdicts on the bundled samples, through analyze(): the product's acceptance points.
import { readFileSync } from 'node:fs';
import { join } from 'node:path';
import { describe, expect, it } from 'vitest';
import { analyze } from '../../server/src/analyze';

const sample = (name: string) => analyze(readFileSync(join(__dirname, '..', '..', 'samples', name), 'utf8'));
const codes = (analysis: ReturnType<typeof analyze>) => analysis.diagnostics.map((d) => d.code);

describe('design verdicts on the samples', () => {
  it('the prescaler design drifts under 10 % parameter error and a disturbance; integral action does not', () => {
    const prescaler = sample('dosing-tank.plant').controllers[0];
    const fragility = prescaler.details.fragility as { worstTrackingError: number; percent: number };
    const disturbance = prescaler.details.disturbanceRejection as { worstPrescalerError: number };
    expect(fragility.percent).toBe(10);
    // Steady state of the level loop: a 10 % error in the pump gain kp moves the settled level by
    // kp·N·G / (1 + …) — at least a few percent of the set-point (the fragility warning's threshold is 2 %).
    expect(fragility.worstTrackingError).toBeGreaterThan(0.02);
    expect(disturbance.worstPrescalerError).toBeGreaterThan(0);
    expect(codes(sample('dosing-tank.plant'))).toContain('control/fragile-prescaler');

    const integral = sample('dosing-tank-integral.plant');
    const withIntegral = integral.controllers[0];
    const integralFragility = withIntegral.details.fragility as { worstIntegralError: number; box: { integralAllStable: boolean } };
    const integralDisturbance = withIntegral.details.disturbanceRejection as { worstIntegralError: number };
    expect(integralFragility.box.integralAllStable).toBe(true);
    expect(integralFragility.worstIntegralError).toBeLessThan(64 * Number.EPSILON);
    expect(integralDisturbance.worstIntegralError).toBeLessThan(64 * Number.EPSILON * 100);
    expect(codes(integral)).not.toContain('control/fragile-prescaler');
    expect(withIntegral.Ki).not.toBeNull();
  });

  it('the sampled maglev design places z = e^{sT} of the requested poles', () => {
    const analysis = sample('maglev-rig.plant');
    const controller = analysis.controllers[0];
    const T = 1e-3;
    const requested = [
      { re: -60, im: 45 },
      { re: -60, im: -45 },
      { re: -150, im: 0 },
    ].map((s) => ({ re: Math.exp(s.re * T) * Math.cos(s.im * T), im: Math.exp(s.re * T) * Math.sin(s.im * T) }));
    for (const target of requested) {
      const nearest = Math.min(...controller.closedLoopPoles.map((z) => Math.hypot(z.re - target.re, z.im - target.im)));
      expect(nearest).toBeLessThan(1e-9);
    }
    expect(controller.domain).toBe('discrete');
    expect(controller.step[0].metrics.steadyStateError).toBeLessThan(1e-9);
  });

  it('says why no prescaler exists for the zero-DC-gain plant, and why placement fails on the uncontrollable one', () => {
    const table = sample('isolation-table.plant');
    const zero = table.diagnostics.find((d) => d.code === 'control/zero-dc-gain');
    expect(zero?.severity).toBe('error');
    expect(zero?.message).toContain('invariant zero at s = 0');
    expect(table.controllers[0].prescaler).toBeNull();

    const oven = sample('twin-lamp-oven.plant');
    expect(codes(oven)).toEqual(expect.arrayContaining(['control/uncontrollable', 'control/placement-impossible']));
    expect(oven.plants[0].uncontrollableModes[0].value.re).toBeCloseTo(-0.05, 12);
    expect(oven.controllers[0].K).toBeNull();
  });
});
