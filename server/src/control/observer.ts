// Full-order state observer by pole placement, through duality: the observer error evolves by
// A − LC, whose eigenvalues equal those of (A − LC)ᵀ = Aᵀ − Cᵀ Lᵀ, i.e. a state-feedback
// placement on the dual pair (Aᵀ, Cᵀ) with gain K_dual, and L = K_dualᵀ. The placement's
// conditioning (eigenvector condition, fragility) carries over unchanged.
//
// Default observer poles (common practice): `observerSpeedFactor` (settings, default 4) times
// faster than the controller's. Continuous: s ↦ factor·s (same damping, factor × natural
// frequency). Discrete: through s = ln(z)/T, i.e. z ↦ z^factor on the principal branch
// (z = 0 stays 0; negative real z ↦ −|z|^factor so real poles stay real).
import type { Complex, Rows } from '../numeric/types';
import type { AnalysisSettings } from './settings';
import { placePoles, type PlacementResult } from './placement';
import { transposeRows as transpose } from './controlLinearAlgebra';

export interface ObserverPlacementResult {
  ok: boolean;
  /** Observer gain, n × p: x̂' = A x̂ + B u + L (y − C x̂ − D u). */
  L: Rows | null;
  achievedPoles: Complex[];
  eigenvectorCondition: number;
  backwardError: number;
  gainNorm: number;
  fragile: boolean;
  method: string;
  warnings: PlacementResult['warnings'];
  /** Placement failure on the dual pair, e.g. an unobservable mode (uncontrollable in the dual). */
  failure?: PlacementResult['failure'];
}


export function designObserverByPlacement(
  A: Rows,
  C: Rows,
  poles: Complex[],
  settings: AnalysisSettings,
): ObserverPlacementResult {
  const dual = placePoles(transpose(A), transpose(C), poles, settings);
  return {
    ok: dual.ok,
    L: dual.ok ? transpose(dual.K) : null,
    achievedPoles: dual.achievedPoles ?? [],
    eigenvectorCondition: dual.eigenvectorCondition,
    backwardError: dual.backwardError,
    gainNorm: dual.gainNorm,
    fragile: dual.fragile,
    method: dual.method,
    warnings: dual.warnings ?? [],
    ...(dual.failure !== undefined ? { failure: dual.failure } : {}),
  };
}

export function defaultObserverPoles(
  controllerPoles: Complex[],
  factor: number,
  domain: 'continuous' | 'discrete' = 'continuous',
): Complex[] {
  if (domain === 'continuous') return controllerPoles.map((s) => ({ re: factor * s.re, im: factor * s.im }));
  return controllerPoles.map((z) => {
    const magnitude = Math.hypot(z.re, z.im);
    if (magnitude === 0) return { re: 0, im: 0 };
    const power = Math.pow(magnitude, factor);
    if (z.im === 0) return { re: z.re > 0 ? power : -power, im: 0 };
    const angle = factor * Math.atan2(z.im, z.re);
    // Keep the sign of the imaginary part so conjugate pairs stay conjugate.
    const bounded = Math.max(-Math.PI, Math.min(Math.PI, angle));
    return { re: power * Math.cos(bounded), im: power * Math.sin(bounded) };
  });
}

export interface ObserverSpeedComparison {
  /** True when the slowest observer pole decays more slowly than the slowest controller pole. */
  observerSlower: boolean;
  /** Decay rates (1/s) of the slowest observer and controller poles. */
  slowestObserverRate: number;
  slowestControllerRate: number;
}

/** Decay rate of a pole in 1/s: −Re s, or −ln|z|/T for discrete poles (z = 0 is infinitely fast). */
export function decayRate(pole: Complex, domain: 'continuous' | 'discrete', T = 1): number {
  if (domain === 'continuous') return -pole.re;
  const magnitude = Math.hypot(pole.re, pole.im);
  return magnitude === 0 ? Infinity : -Math.log(magnitude) / T;
}

export function compareObserverSpeed(
  controllerPoles: Complex[],
  observerPoles: Complex[],
  domain: 'continuous' | 'discrete',
  T = 1,
): ObserverSpeedComparison {
  const slowest = (poles: Complex[]): number =>
    poles.reduce((rate, pole) => Math.min(rate, decayRate(pole, domain, T)), Infinity);
  const slowestObserverRate = slowest(observerPoles);
  const slowestControllerRate = slowest(controllerPoles);
  return { observerSlower: slowestObserverRate < slowestControllerRate, slowestObserverRate, slowestControllerRate };
}
