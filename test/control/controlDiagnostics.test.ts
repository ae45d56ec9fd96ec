import { describe, expect, it } from 'vitest';
import type { Range } from '../../server/src/model/types';
import { observerSlowerThanController } from '../../server/src/control/diagnostics/observer-slower-than-controller';
import { samplingTooLong } from '../../server/src/control/diagnostics/sampling-too-long';
import { samplingPathological } from '../../server/src/control/diagnostics/sampling-pathological';
import { float32Rounding } from '../../server/src/control/diagnostics/float32-rounding';
import { lqrNoStabilisingSolution } from '../../server/src/control/diagnostics/lqr-no-stabilising-solution';
import { lqrRNotPositiveDefinite } from '../../server/src/control/diagnostics/lqr-r-not-positive-definite';
import { lqrQNotPositiveSemidefinite } from '../../server/src/control/diagnostics/lqr-q-not-positive-semidefinite';
import { lqrNotDetectableOnAxis } from '../../server/src/control/diagnostics/lqr-not-detectable-on-axis';
import { specViolation } from '../../server/src/control/diagnostics/spec-violation';
import { saturationLimitExceeded } from '../../server/src/control/diagnostics/saturation-limit-exceeded';
import { saturationWindup } from '../../server/src/control/diagnostics/saturation-windup';
import { observerUnobservableUnstable } from '../../server/src/control/diagnostics/observer-unobservable-unstable';
import { marginSmall } from '../../server/src/control/diagnostics/margin-small';

const range: Range = { start: { line: 3, character: 2 }, end: { line: 3, character: 9 } } as Range;

describe('control diagnostics of the analyses', () => {
  it('carry a stable code, the range, related information and a one-line message', () => {
    const related = [{ message: 'controller poles declared here', range }];
    const diagnostic = observerSlowerThanController.create(range, [0.8, 1.2], { related });
    expect(diagnostic.code).toBe('control/observer-slower');
    expect(diagnostic.severity).toBe('warning');
    expect(diagnostic.range).toBe(range);
    expect(diagnostic.related).toEqual(related);
    expect(diagnostic.message).toContain('0.8 1/s');
    expect(diagnostic.message).not.toContain('\n');
  });

  it('word each finding with its numbers', () => {
    expect(samplingTooLong.create(range, [0.5, 8, 0.0125]).message).toContain('0.0125 s');
    expect(samplingPathological.create(range, [0.314, { re: 0, im: 10 }, { re: 0, im: -10 }]).message).toContain('0+10j');
    expect(float32Rounding.create(range, [{ re: -9.5, im: 0 }, { re: -9.2, im: 0.4 }, 0.031, false]).message).toContain('3.1 %');
    expect(float32Rounding.create(range, [{ re: -0.1, im: 0 }, { re: 0.01, im: 0 }, 1.1, true]).message).toContain('unstable');
    expect(lqrNoStabilisingSolution.create(range, ['no-convergence']).code).toBe('control/lqr-no-solution');
    expect(lqrRNotPositiveDefinite.create(range, ['R', -0.1]).message).toContain('-0.1');
    expect(lqrQNotPositiveSemidefinite.create(range, ['Q − N R⁻¹ Nᵀ', -0.5]).severity).toBe('error');
    expect(lqrNotDetectableOnAxis.create(range, [{ re: 0, im: 2 }]).message).toContain('0+2j');
    expect(specViolation.create(range, ['settling', 2, 2.6]).message).toBe('the simulated settling time is 2.6 s, longer than the required 2 s');
    expect(specViolation.create(range, ['overshoot', 5, null]).message).toContain('never meets');
    expect(saturationLimitExceeded.create(range, ['force', 38, -20, 20]).message).toContain('`force`');
    expect(saturationWindup.create(range, [35, 4]).message).toContain('35 % without');
    expect(observerUnobservableUnstable.create(range, [{ re: 1.5, im: 0 }]).message).toContain('1.5');
    expect(marginSmall.create(range, ['u', 'gain-lower', -3]).message).toContain('3 dB of gain decrease');
  });
});
