// Open- or closed-loop modes: eigenvalues with natural frequency, damping and time constant, and
// stability with a tolerance scaled to ‖A‖. For a cluster of k computed eigenvalues (a possibly
// defective eigenvalue, computed only to ~(ε‖A‖)^(1/k)) the tolerance widens accordingly, so a
// double integrator computed as ±1e-9 is 'marginal', not 'unstable'.
import type { Complex, Rows } from '../numeric/types';
import { EPS, eigenvaluesOf, frobenius } from './controlLinearAlgebra';
import type { Domain } from './structure';

export type Stability = 'stable' | 'marginal' | 'unstable';

export interface Mode {
  value: Complex;
  /** |s| (rad per time unit); discrete modes mapped by s = log(z)/T. null for z = 0. */
  naturalFrequency: number | null;
  /** −Re(s)/|s|; null when |s| = 0 or z = 0. */
  dampingRatio: number | null;
  /** 1/|Re s|; null for |Re s| within tolerance (and 0 for z = 0, a dead-beat mode). */
  timeConstant: number | null;
  stability: Stability;
}

export interface ModesResult {
  eigenvalues: Complex[];
  modes: Mode[];
  stability: Stability;
  /** Absolute tolerance on Re s (continuous) or on |z| − 1 (discrete) for an isolated eigenvalue. */
  stabilityTolerance: number;
}

/**
 * @param samplePeriod discrete domain only: T for s = log(z)/T (default 1: frequencies per sample).
 */
export function analyzeModes(A: Rows, domain: Domain, samplePeriod = 1): ModesResult {
  const n = A.length;
  const eigenvalues = eigenvaluesOf(A);
  const scale = domain === 'continuous' ? frobenius(A) : Math.max(frobenius(A), 1);
  const stabilityTolerance = 10 * Math.max(1, n) * EPS * scale;
  const clusterRadius = Math.sqrt(EPS) * Math.max(scale, Number.MIN_VALUE) * 10;
  const modes = eigenvalues.map((value): Mode => {
    const cluster = eigenvalues.filter((other) => Math.hypot(other.re - value.re, other.im - value.im) <= clusterRadius).length;
    // Perturbation of a k-fold defective eigenvalue: (ε‖A‖)^(1/k)·‖A‖^(1 − 1/k).
    const tolerance = cluster <= 1 ? stabilityTolerance : 10 * Math.max(1, n) * Math.pow(EPS, 1 / cluster) * scale;
    const distance = domain === 'continuous' ? value.re : Math.hypot(value.re, value.im) - 1;
    const stability: Stability = distance < -tolerance ? 'stable' : distance > tolerance ? 'unstable' : 'marginal';
    let s: Complex | null;
    if (domain === 'continuous') s = value;
    else {
      const magnitude = Math.hypot(value.re, value.im);
      s = magnitude === 0 ? null : { re: Math.log(magnitude) / samplePeriod, im: Math.atan2(value.im, value.re) / samplePeriod };
    }
    if (!s) return { value, naturalFrequency: null, dampingRatio: null, timeConstant: 0, stability };
    const naturalFrequency = Math.hypot(s.re, s.im);
    const realTolerance = domain === 'continuous' ? tolerance : tolerance / samplePeriod;
    return {
      value,
      naturalFrequency,
      dampingRatio: naturalFrequency === 0 ? null : -s.re / naturalFrequency,
      timeConstant: Math.abs(s.re) <= realTolerance ? null : 1 / Math.abs(s.re),
      stability,
    };
  });
  const stability: Stability = modes.some((m) => m.stability === 'unstable')
    ? 'unstable'
    : modes.some((m) => m.stability === 'marginal')
      ? 'marginal'
      : 'stable';
  return { eigenvalues, modes, stability, stabilityTolerance };
}
