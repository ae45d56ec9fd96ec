import { describe, expect, it } from 'vitest';
import { uncontrollableDiagnostic } from '../../server/src/control/diagnostics/uncontrollable';
import { unobservableDiagnostic } from '../../server/src/control/diagnostics/unobservable';
import { zeroDcGainDiagnostic } from '../../server/src/control/diagnostics/zero-dc-gain';
import { dcGainUndefinedDiagnostic } from '../../server/src/control/diagnostics/dc-gain-undefined';
import { illConditionedSetpointDiagnostic } from '../../server/src/control/diagnostics/ill-conditioned-setpoint';
import { fragilePrescalerDiagnostic } from '../../server/src/control/diagnostics/fragile-prescaler';
import { fragilePlacementDiagnostic } from '../../server/src/control/diagnostics/fragile-placement';
import { defectiveClosedLoopDiagnostic } from '../../server/src/control/diagnostics/defective-closed-loop';
import { placementImpossibleDiagnostic } from '../../server/src/control/diagnostics/placement-impossible';
import { openLoopUnstableDiagnostic } from '../../server/src/control/diagnostics/open-loop-unstable';
import { fullStateWithoutObserverDiagnostic } from '../../server/src/control/diagnostics/full-state-without-observer';
import { integralInfeasibleDiagnostic } from '../../server/src/control/diagnostics/integral-infeasible';
import { isNearlyUncontrollable, nearlyUncontrollableDiagnostic } from '../../server/src/control/diagnostics/nearly-uncontrollable';
import { analyzeControllability } from '../../server/src/control/structure';
import { defaultSettings } from '../../server/src/control/settings';

const range = { start: { line: 3, character: 2 }, end: { line: 3, character: 9 } };
const related = [{ message: 'declared here', range }];

describe('tracking, placement and structure diagnostics', () => {
  it('zero-dc-gain: error, names output and input, and the singular combination for several outputs', () => {
    const single = zeroDcGainDiagnostic(range, { outputs: ['speed'], inputs: ['force'] }, related);
    expect(single.code).toBe('control/zero-dc-gain');
    expect(single.severity).toBe('error');
    expect(single.message).toContain('invariant zero at s = 0');
    expect(single.message).toContain('`speed` with `force`');
    expect(single.related).toEqual(related);
    const several = zeroDcGainDiagnostic(range, { outputs: ['left', 'right'], inputs: ['u1', 'u2'], singularCombination: [Math.SQRT1_2, -Math.SQRT1_2] });
    expect(several.message).toContain('0.7071·`left` − 0.7071·`right`');
  });

  it('severity follows stability for structure findings', () => {
    expect(uncontrollableDiagnostic(range, { mode: { re: 2, im: 0 }, stable: false }).severity).toBe('error');
    expect(uncontrollableDiagnostic(range, { mode: { re: -2, im: 1 }, stable: true }).message).toContain('s = −2 ± 1j');
    expect(unobservableDiagnostic(range, { mode: { re: 0, im: 0 }, stable: false, observerNeeded: true }).severity).toBe('error');
    expect(unobservableDiagnostic(range, { mode: { re: 0, im: 0 }, stable: false }).severity).toBe('warning');
  });

  it('fragile prescaler offers the integral-action fix only when feasible', () => {
    const withFix = fragilePrescalerDiagnostic(range, { percent: 10, parameter: 'efficiency', trackingError: 0.073, outputs: ['temperature'], integralError: 1e-15, integralFeasible: true });
    expect(withFix.data?.fix).toBe('add-integral-action');
    expect(withFix.message).toContain('7.3 % steady-state error');
    expect(withFix.message).toContain('integral action: 0 %');
    const without = fragilePrescalerDiagnostic(range, { percent: 10, parameter: 'B', trackingError: 0.05, outputs: ['y'], integralFeasible: false });
    expect(without.data?.fix).toBeUndefined();
  });

  it('a nearly uncontrollable pair is reported with its margin (never a silent huge gain)', () => {
    const delta = 1e-10;
    const result = analyzeControllability([[-1, 0], [0, -2]], [[1], [delta]], 'continuous');
    expect(result.controllable).toBe(true);
    expect(isNearlyUncontrollable(result.margin, defaultSettings.placementConditionLimit)).toBe(true);
    const diagnostic = nearlyUncontrollableDiagnostic(range, { mode: result.marginMode!, margin: result.margin! });
    expect(diagnostic.code).toBe('control/nearly-uncontrollable');
    expect(diagnostic.message).toContain('s = −2');
  });

  it('remaining factories: codes and key facts', () => {
    expect(dcGainUndefinedDiagnostic(range, { domain: 'discrete' }).message).toContain('z = 1');
    expect(illConditionedSetpointDiagnostic(range, { relativeGain: 1.2e8, conditionNumber: 3.4e9 }).code).toBe('control/ill-conditioned-setpoint');
    expect(fragilePlacementDiagnostic(range, { eigenvectorCondition: 3.2e9, maxRelativePoleError: 4e-5, gainNorm: 1.7e10 }).message).toContain('3.20e9');
    expect(defectiveClosedLoopDiagnostic(range, { pole: { re: -2, im: 0 }, multiplicity: 3, inputRank: 1 }).message).toContain('3 times with 1 independent input');
    expect(placementImpossibleDiagnostic(range, { reason: 'uncontrollable-mode-not-requested', mode: { re: -3, im: 0 }, requested: 2, states: 2 }).message).toContain('s = −3 is uncontrollable');
    expect(placementImpossibleDiagnostic(range, { reason: 'pole-count', requested: 1, states: 2 }).message).toContain('1 given for 2 states');
    expect(openLoopUnstableDiagnostic(range, { mode: { re: 1.5, im: 0 }, marginal: false, timeConstant: 1 / 1.5 }).severity).toBe('info');
    expect(fullStateWithoutObserverDiagnostic(range, { states: 4, measuredRank: 2 }).data?.fix).toBe('add-observer');
    expect(integralInfeasibleDiagnostic(range, { reason: 'more-outputs-than-inputs', outputs: ['a', 'b'], inputs: ['u'] }).message).toContain('2 integrated outputs but only 1 input');
  });
});

describe('stability over the parameter box', () => {
  // ẋ = p·q·x + u, y = x with p = q = 1 and the closed-loop pole placed at −c (K = 1 + c). Hand
  // computation: one parameter +10 % gives 1.1 − (1 + c), both give 1.21 − (1 + c), and B −10 %
  // gives 1 − 0.9·(1 + c). With c = 0.15 every single move stays stable and the corner
  // p = q = 1.1 has its pole at s = +0.06; with c = 0.3 the whole box is stable; with c = 0.05 a
  // single parameter already destabilises the loop (the fragile-prescaler warning says so).
  const model = (c: number, integral = '') => `plant pair {
  param p = 1
  param q = 1
  states x
  inputs u
  outputs y
  A = [p*q]
  B = [1]
  C = [1]
}

controller hold for pair {
  poles = [${-c}]
  track y${integral}
}
`;
  const findings = async (text: string) => {
    const { analyze } = await import('../../server/src/analyze');
    return analyze(text).diagnostics.filter((d) => d.code === 'control/unstable-under-parameter-error' || d.code === 'control/fragile-prescaler');
  };

  it('names the corner and its pole when only moving the parameters together destabilises the loop', async () => {
    const found = await findings(model(0.15));
    const box = found.find((d) => d.code === 'control/unstable-under-parameter-error');
    expect(box?.severity).toBe('warning');
    expect(box?.message).toBe('the loop loses stability within ±10 % parameter error: at `p` = 1.1, `q` = 1.1 it has a pole at s = 0.06');
    expect(box?.related?.map((entry) => entry.message)).toContain('parameter p is declared here');
  });

  it('checks the integral loop of an integral design (no prescaler warning there)', async () => {
    // States [x; ξ]: the characteristic polynomial is s² + (k_x − a)·s + (positive constant) with
    // k_x − a = 0.05 + 0.1 by design (poles −0.05, −0.1). a = p·q = 1.21 at the corner leaves
    // 0.15 − 0.21 < 0 (unstable); a single parameter leaves 0.05, B −10 % leaves 0.9·1.15 − 1 > 0.
    const found = await findings(model(0.05, '\n  integral y pole -0.1'));
    expect(found.map((d) => d.code)).toEqual(['control/unstable-under-parameter-error']);
    expect(found[0].message).toBe('the loop with integral action loses stability within ±10 % parameter error');
    const robust = await findings(model(0.5, '\n  integral y pole -1'));
    expect(robust).toEqual([]);
  });

  it('is silent when the whole box is stable, and leaves a single destabilising parameter to the fragile-prescaler warning', async () => {
    expect((await findings(model(0.3))).map((d) => d.code)).not.toContain('control/unstable-under-parameter-error');
    // A design that asks for an unstable pole is unstable already at the nominal parameters.
    expect((await findings(model(-0.5))).map((d) => d.code)).not.toContain('control/unstable-under-parameter-error');
    expect((await findings(model(0.5, '\n  integral y pole 0.2'))).map((d) => d.code)).not.toContain('control/unstable-under-parameter-error');
    const single = await findings(model(0.05));
    expect(single.map((d) => d.code)).toEqual(['control/fragile-prescaler']);
    expect(single[0].message).toContain('an unstable loop');
  });
});
