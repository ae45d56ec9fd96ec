// Advice on the sample period T of a digital controller, and checks that make a period unusable.
//
//  • Fastest closed-loop pole: with |λ|max the largest continuous closed-loop pole magnitude
//    (rad/s), the advised period is T ≤ 1/(samplesPerTimeConstant·|λ|max) (settings,
//    common practice). A hard warning fires when |λ|max·T > `maxPoleSampleProduct` (default 1:
//    fewer than one sample per fastest time constant, where the zero-order hold's delay of T/2
//    dominates the fastest mode).
//  • Bandwidth: we advise a sampling frequency ωs = 2π/T of 10–30 times the closed-loop
//    bandwidth ωb (common practice; the faster end for smooth responses), i.e.
//    T ∈ [2π/(30ωb), 2π/(10ωb)].
//  • Pathological sampling (Kalman, Ho & Narendra 1963): two eigenvalues of A with equal real
//    parts whose imaginary parts differ by a non-zero multiple of 2π/T map to the same z, and
//    the sampled pair (Φ, Γ) loses controllability (and (C, Φ) observability) even though the
//    continuous pair has it. Compared with the tolerance √ε·max(|λi|, |λj|, 2π/T): eigenvalues
//    of nearly defective pairs are only accurate to about √ε relative.
//  • T below 1e-9 s is flagged: no practical digital controller runs at that rate, and it is
//    almost always a unit mistake (ms or µs written as s).
import type { Complex } from '../numeric/types';

export interface SamplingAdviceOptions {
  /** Samples per fastest closed-loop time constant (settings.samplesPerTimeConstant). */
  samplesPerTimeConstant: number;
  /** Warn when |λ|max·T exceeds this (default 1). */
  maxPoleSampleProduct?: number;
  /** Closed-loop bandwidth in rad/s, when known. */
  closedLoopBandwidth?: number;
}

export interface PathologicalPair {
  first: Complex;
  second: Complex;
  /** The integer k with Im(λi − λj) ≈ k·2π/T. */
  multiple: number;
}

export interface SamplingAdvice {
  samplePeriod: number;
  /** Invalid: T not finite or not positive. Nothing else is checked. */
  invalid: boolean;
  belowNanosecond: boolean;
  fastestPoleMagnitude: number | null;
  /** T ≤ this is advised from the fastest closed-loop pole. */
  advisedMaximumPeriod: number | null;
  /** Product |λ|max·T. */
  fastestPoleSampleProduct: number | null;
  tooLongForFastestPole: boolean;
  /** Advised period range from the bandwidth rule (10–30 samples per bandwidth cycle). */
  bandwidthPeriodRange: [number, number] | null;
  tooLongForBandwidth: boolean;
  pathologicalPairs: PathologicalPair[];
  /** Nyquist frequency π/T, rad/s. */
  nyquistFrequency: number | null;
}

const NANOSECOND = 1e-9;

/**
 * @param closedLoopPoles continuous-time closed-loop poles (s) of the design (for discrete
 *   designs, map them with mapPolesToContinuous first).
 * @param plantEigenvalues eigenvalues of the continuous plant A (for the pathological test).
 */
export function adviseSamplePeriod(
  T: number,
  closedLoopPoles: Complex[],
  plantEigenvalues: Complex[],
  options: SamplingAdviceOptions,
): SamplingAdvice {
  const advice: SamplingAdvice = {
    samplePeriod: T,
    invalid: !(Number.isFinite(T) && T > 0),
    belowNanosecond: false,
    fastestPoleMagnitude: null,
    advisedMaximumPeriod: null,
    fastestPoleSampleProduct: null,
    tooLongForFastestPole: false,
    bandwidthPeriodRange: null,
    tooLongForBandwidth: false,
    pathologicalPairs: [],
    nyquistFrequency: null,
  };
  if (advice.invalid) return advice;
  advice.belowNanosecond = T < NANOSECOND;
  advice.nyquistFrequency = Math.PI / T;

  let fastest = 0;
  for (const pole of closedLoopPoles) {
    const magnitude = Math.hypot(pole.re, pole.im);
    if (Number.isFinite(magnitude)) fastest = Math.max(fastest, magnitude);
  }
  if (fastest > 0) {
    advice.fastestPoleMagnitude = fastest;
    advice.advisedMaximumPeriod = 1 / (options.samplesPerTimeConstant * fastest);
    advice.fastestPoleSampleProduct = fastest * T;
    advice.tooLongForFastestPole = fastest * T > (options.maxPoleSampleProduct ?? 1);
  }
  const bandwidth = options.closedLoopBandwidth;
  if (bandwidth !== undefined && Number.isFinite(bandwidth) && bandwidth > 0) {
    advice.bandwidthPeriodRange = [(2 * Math.PI) / (30 * bandwidth), (2 * Math.PI) / (10 * bandwidth)];
    advice.tooLongForBandwidth = T > advice.bandwidthPeriodRange[1];
  }
  advice.pathologicalPairs = pathologicalEigenvaluePairs(plantEigenvalues, T);
  return advice;
}

/** Pairs of eigenvalues that the sample period T folds onto the same z = e^{λT}. */
export function pathologicalEigenvaluePairs(eigenvalues: Complex[], T: number): PathologicalPair[] {
  const pairs: PathologicalPair[] = [];
  if (!(T > 0)) return pairs;
  const samplingFrequency = (2 * Math.PI) / T;
  const rootEps = Math.sqrt(Number.EPSILON);
  for (let i = 0; i < eigenvalues.length; i++) {
    for (let j = i + 1; j < eigenvalues.length; j++) {
      const a = eigenvalues[i];
      const b = eigenvalues[j];
      const scale = Math.max(Math.hypot(a.re, a.im), Math.hypot(b.re, b.im), samplingFrequency);
      const tolerance = rootEps * scale;
      if (Math.abs(a.re - b.re) > tolerance) continue;
      const gap = Math.abs(a.im - b.im);
      const multiple = Math.round(gap / samplingFrequency);
      if (multiple === 0) continue;
      if (Math.abs(gap - multiple * samplingFrequency) <= tolerance) pairs.push({ first: a, second: b, multiple });
    }
  }
  return pairs;
}
