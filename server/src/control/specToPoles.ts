// Time-domain specification → closed-loop poles, from the classical second-order formulas.
//
//  • Damping from percent overshoot: the step response of ωn²/(s² + 2ζωn s + ωn²) peaks at
//    Mp = exp(−πζ/√(1 − ζ²)) (the second-order overshoot formula); solved for ζ,
//        ζ = −ln(Mp) / √(π² + ln²(Mp)).
//  • Natural frequency from the 2 % settling time: the envelope e^{−ζωn t} falls below 2 % at
//    t = −ln(0.02·√(1 − ζ²))/(ζωn) ≈ 4/(ζωn) (the usual "4 time constants" 2 % approximation),
//        ωn = 4 / (ζ · ts).
//  • Natural frequency from the 10–90 % rise time when no settling time is given: the
//    polynomial fit tr·ωn ≈ 1 − 0.4167ζ + 2.917ζ² (valid 0 < ζ < 0.9; fit quoted from memory).
//  • Without an overshoot requirement the damping defaults to ζ = 0.7 (common practice).
//  • Remaining poles: real, `fastPoleFactor` (settings, common practice 3–5) times faster than
//    the dominant real part ζωn, spread by a few percent so they are distinct (a pole repeated
//    more often than there are inputs cannot be placed: its closed-loop matrix would need a
//    Jordan block). Discrete designs map every pole by z = e^{sT}.
import type { Complex } from '../numeric/types';

export interface TimeSpec {
  /** 2 % settling time, s. */
  settlingSeconds?: number;
  /** Percent overshoot, 0 ≤ OS < 100. */
  overshootPercent?: number;
  /** 10–90 % rise time, s. */
  riseSeconds?: number;
}

export interface SpecPoleOptions {
  /** Non-dominant poles are this many times faster than ζωn (default: settings.fastPoleFactor). */
  fastPoleFactor: number;
  /** Relative spacing between successive fast poles (default 0.05, so 1, 1.05, 1.10 … × the fast rate). */
  fastPoleSpread?: number;
  /** Damping used when no overshoot is specified (default 0.7, common practice). */
  defaultDamping?: number;
  domain: 'continuous' | 'discrete';
  /** Sample period (discrete). */
  samplePeriod?: number;
}

export type SpecFormula =
  | 'overshoot-to-damping: zeta = -ln(OS)/sqrt(pi^2 + ln^2(OS))'
  | 'settling-2-percent: wn = 4/(zeta*ts)'
  | 'rise-10-90-fit: wn = (1 - 0.4167 zeta + 2.917 zeta^2)/tr'
  | 'default-damping'
  | 'first-order-settling: pole = -4/ts'
  | 'fast-poles: factor times zeta*wn'
  | 'discrete-map: z = exp(sT)';

export interface SpecPoleResult {
  ok: boolean;
  failure?: 'no-time-requirement' | 'overshoot-out-of-range' | 'time-not-positive' | 'no-sample-period';
  /** Poles in the design domain (s for continuous, z for discrete). */
  poles: Complex[];
  /** The same poles in s (before any z = e^{sT} map). */
  continuousPoles: Complex[];
  dampingRatio: number | null;
  naturalFrequency: number | null;
  formulas: SpecFormula[];
}

const DEFAULT_SPREAD = 0.05;
const DEFAULT_DAMPING = 0.7;

/** ζ from percent overshoot (OS in percent, 0 < OS < 100); OS = 0 gives ζ = 1. */
export function dampingFromOvershoot(overshootPercent: number): number {
  if (overshootPercent <= 0) return 1;
  const logOs = Math.log(overshootPercent / 100);
  return -logOs / Math.sqrt(Math.PI * Math.PI + logOs * logOs);
}

/** Percent overshoot of the standard second-order step response (0 for ζ ≥ 1). */
export function overshootFromDamping(zeta: number): number {
  if (zeta >= 1) return 0;
  return 100 * Math.exp((-Math.PI * zeta) / Math.sqrt(1 - zeta * zeta));
}

/**
 * Pole list for `stateCount` closed-loop poles meeting `spec`. Never throws; a spec without any
 * time requirement (or with values out of range) returns ok = false with a reason.
 */
export function polesFromSpec(spec: TimeSpec, stateCount: number, options: SpecPoleOptions): SpecPoleResult {
  const formulas: SpecFormula[] = [];
  const fail = (failure: SpecPoleResult['failure']): SpecPoleResult => ({
    ok: false,
    failure,
    poles: [],
    continuousPoles: [],
    dampingRatio: null,
    naturalFrequency: null,
    formulas,
  });
  const { settlingSeconds, riseSeconds, overshootPercent } = spec;
  if (settlingSeconds === undefined && riseSeconds === undefined) return fail('no-time-requirement');
  if ((settlingSeconds !== undefined && !(settlingSeconds > 0)) || (riseSeconds !== undefined && !(riseSeconds > 0))) {
    return fail('time-not-positive');
  }
  if (overshootPercent !== undefined && !(overshootPercent >= 0 && overshootPercent < 100)) {
    return fail('overshoot-out-of-range');
  }
  if (options.domain === 'discrete' && !(options.samplePeriod !== undefined && options.samplePeriod > 0)) {
    return fail('no-sample-period');
  }

  let zeta: number;
  if (overshootPercent !== undefined) {
    zeta = dampingFromOvershoot(overshootPercent);
    formulas.push('overshoot-to-damping: zeta = -ln(OS)/sqrt(pi^2 + ln^2(OS))');
  } else {
    zeta = options.defaultDamping ?? DEFAULT_DAMPING;
    formulas.push('default-damping');
  }

  let wn: number;
  if (settlingSeconds !== undefined) {
    wn = 4 / (zeta * settlingSeconds);
    formulas.push('settling-2-percent: wn = 4/(zeta*ts)');
  } else {
    const z = Math.min(zeta, 0.9);
    wn = (1 - 0.4167 * z + 2.917 * z * z) / (riseSeconds as number);
    formulas.push('rise-10-90-fit: wn = (1 - 0.4167 zeta + 2.917 zeta^2)/tr');
  }

  const sigma = zeta * wn;
  const continuousPoles: Complex[] = [];
  if (stateCount === 1) {
    // A first-order loop settles to 2 % in ≈ 4 time constants.
    const rate = settlingSeconds !== undefined ? 4 / settlingSeconds : wn;
    if (settlingSeconds !== undefined) formulas.push('first-order-settling: pole = -4/ts');
    continuousPoles.push({ re: -rate, im: 0 });
  } else if (stateCount >= 2) {
    if (zeta < 1) {
      const wd = wn * Math.sqrt(1 - zeta * zeta);
      continuousPoles.push({ re: -sigma, im: wd }, { re: -sigma, im: -wd });
    } else {
      // Critically damped: split the double pole slightly so the pair is distinct.
      const spread = options.fastPoleSpread ?? DEFAULT_SPREAD;
      continuousPoles.push({ re: -wn, im: 0 }, { re: -wn * (1 + spread), im: 0 });
    }
  }
  if (stateCount > 2) {
    formulas.push('fast-poles: factor times zeta*wn');
    const spread = options.fastPoleSpread ?? DEFAULT_SPREAD;
    for (let k = 0; k < stateCount - 2; k++) {
      continuousPoles.push({ re: -options.fastPoleFactor * sigma * (1 + spread * k), im: 0 });
    }
  }

  let poles = continuousPoles;
  if (options.domain === 'discrete') {
    const T = options.samplePeriod as number;
    formulas.push('discrete-map: z = exp(sT)');
    poles = continuousPoles.map((s) => {
      const magnitude = Math.exp(s.re * T);
      return { re: magnitude * Math.cos(s.im * T), im: magnitude * Math.sin(s.im * T) };
    });
  }
  return { ok: true, poles, continuousPoles, dampingRatio: zeta, naturalFrequency: wn, formulas };
}

export interface SpecViolation {
  kind: 'settling' | 'overshoot' | 'rise';
  required: number;
  /** Achieved value; null when never reached (e.g. the response never settles). */
  achieved: number | null;
}

export interface SpecMetricsInput {
  settlingTime: number | null;
  overshootPercent: number | null;
  riseTime: number | null;
}

/**
 * Violations of `spec` by simulated metrics. `relativeSlack` (default 0) tolerates a small
 * excess, since the second-order formulas are approximations once other poles are present.
 */
export function checkSpec(metrics: SpecMetricsInput, spec: TimeSpec, relativeSlack = 0): SpecViolation[] {
  const violations: SpecViolation[] = [];
  const exceeds = (achieved: number | null, required: number): boolean =>
    achieved === null || !Number.isFinite(achieved) || achieved > required * (1 + relativeSlack);
  if (spec.settlingSeconds !== undefined && exceeds(metrics.settlingTime, spec.settlingSeconds)) {
    violations.push({ kind: 'settling', required: spec.settlingSeconds, achieved: metrics.settlingTime });
  }
  if (spec.overshootPercent !== undefined) {
    // An overshoot of 0 % is met up to the 2 % settling band's resolution.
    const allowance = spec.overshootPercent === 0 ? 0.1 : 0;
    if (exceeds(metrics.overshootPercent, spec.overshootPercent + allowance)) {
      violations.push({ kind: 'overshoot', required: spec.overshootPercent, achieved: metrics.overshootPercent });
    }
  }
  if (spec.riseSeconds !== undefined && exceeds(metrics.riseTime, spec.riseSeconds)) {
    violations.push({ kind: 'rise', required: spec.riseSeconds, achieved: metrics.riseTime });
  }
  return violations;
}
