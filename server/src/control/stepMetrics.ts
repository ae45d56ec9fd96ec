// Step-response metrics of one output, measured relative to the final value (the usual
// definitions): 10–90 % rise time, 2 % settling time, percent overshoot beyond the final value,
// percent undershoot (initial motion against the final value, the mark of a right-half-plane
// zero), peak time, steady-state error against the set-point, and each input's peak against its
// limit. Crossing times are interpolated linearly between grid points.

export interface InputLimit {
  low: number;
  high: number;
}

export interface InputPeak {
  input: number;
  /** Largest |u| over the run, with its sign. */
  peak: number;
  peakTime: number;
  limit: InputLimit | null;
  exceedsLimit: boolean;
}

export interface StepMetrics {
  initialValue: number;
  finalValue: number;
  setPoint: number;
  /** finalValue − initialValue; metrics below are relative to it. */
  change: number;
  /** False when the change is too small against the output's scale for relative metrics. */
  measurable: boolean;
  riseTime: number | null;
  /** Time after which the output stays within 2 % of the change around the final value. */
  settlingTime: number | null;
  settled: boolean;
  overshootPercent: number | null;
  undershootPercent: number | null;
  peakValue: number;
  peakTime: number;
  steadyStateError: number;
  inputs: InputPeak[];
}

export interface StepMetricsOptions {
  /** Exact final value when known (e.g. from the closed-loop DC gain); else the last sample. */
  finalValue?: number;
  /** Initial value (default: the first sample). */
  initialValue?: number;
  /** Settling band as a fraction of the change (default 0.02). */
  settlingBand?: number;
  inputs?: number[][];
  limits?: (InputLimit | null)[];
}

function crossingTime(time: number[], values: number[], level: number, from: number, rising: boolean): number | null {
  for (let k = Math.max(from, 1); k < values.length; k++) {
    const previous = values[k - 1];
    const current = values[k];
    const crossed = rising ? previous < level && current >= level : previous > level && current <= level;
    if (crossed) {
      const fraction = current === previous ? 1 : (level - previous) / (current - previous);
      return time[k - 1] + fraction * (time[k] - time[k - 1]);
    }
  }
  return null;
}

export function computeStepMetrics(time: number[], values: number[], setPoint: number, options: StepMetricsOptions = {}): StepMetrics {
  const count = values.length;
  const initialValue = options.initialValue ?? values[0] ?? 0;
  const finalValue = options.finalValue ?? values[count - 1] ?? 0;
  const change = finalValue - initialValue;
  let scale = Math.abs(setPoint);
  for (const value of values) scale = Math.max(scale, Math.abs(value));
  // Relative metrics are meaningless when the change is at rounding level of the signal.
  const measurable = Math.abs(change) > Math.sqrt(Number.EPSILON) * Math.max(scale, Number.MIN_VALUE) && count > 1;

  let peakIndex = 0;
  let peakValue = values[0] ?? 0;
  let undershoot = 0;
  const direction = change >= 0 ? 1 : -1;
  for (let k = 0; k < count; k++) {
    if (direction * (values[k] - peakValue) > 0) {
      peakValue = values[k];
      peakIndex = k;
    }
    undershoot = Math.max(undershoot, -direction * (values[k] - initialValue));
  }

  let riseTime: number | null = null;
  let settlingTime: number | null = null;
  let settled = false;
  let overshootPercent: number | null = null;
  let undershootPercent: number | null = null;
  if (measurable) {
    const rising = change > 0;
    const t10 = crossingTime(time, values, initialValue + 0.1 * change, 0, rising);
    const t90 = crossingTime(time, values, initialValue + 0.9 * change, 0, rising);
    riseTime = t10 !== null && t90 !== null ? t90 - t10 : null;
    overshootPercent = Math.max(0, (100 * direction * (peakValue - finalValue)) / Math.abs(change));
    undershootPercent = (100 * undershoot) / Math.abs(change);

    const band = (options.settlingBand ?? 0.02) * Math.abs(change);
    let lastOutside = -1;
    for (let k = 0; k < count; k++) if (Math.abs(values[k] - finalValue) > band) lastOutside = k;
    if (lastOutside === count - 1) {
      settled = false;
    } else if (lastOutside < 0) {
      settled = true;
      settlingTime = time[0];
    } else {
      settled = true;
      // Interpolate where |y − yf| falls to the band between lastOutside and the next sample.
      const a = Math.abs(values[lastOutside] - finalValue);
      const b = Math.abs(values[lastOutside + 1] - finalValue);
      const fraction = a === b ? 1 : Math.min(1, Math.max(0, (a - band) / (a - b)));
      settlingTime = time[lastOutside] + fraction * (time[lastOutside + 1] - time[lastOutside]);
    }
  }

  const inputs: InputPeak[] = (options.inputs ?? []).map((signal, input) => {
    let peak = 0;
    let peakTime = time[0] ?? 0;
    let low = Infinity;
    let high = -Infinity;
    for (let k = 0; k < signal.length; k++) {
      if (Math.abs(signal[k]) > Math.abs(peak)) {
        peak = signal[k];
        peakTime = time[k];
      }
      low = Math.min(low, signal[k]);
      high = Math.max(high, signal[k]);
    }
    const limit = options.limits?.[input] ?? null;
    // Limits compare with a rounding allowance so a saturated run that sits on the limit passes.
    const allowance = limit ? 8 * Number.EPSILON * Math.max(Math.abs(limit.low), Math.abs(limit.high)) : 0;
    const exceedsLimit = limit !== null && (high > limit.high + allowance || low < limit.low - allowance);
    return { input, peak, peakTime, limit, exceedsLimit };
  });

  return {
    initialValue,
    finalValue,
    setPoint,
    change,
    measurable,
    riseTime,
    settlingTime,
    settled,
    overshootPercent,
    undershootPercent,
    peakValue,
    peakTime: time[peakIndex] ?? 0,
    // A difference at the last bits of the two values is rounding, not an error: shown as 0.
    steadyStateError:
      Math.abs(setPoint - finalValue) <= 8 * Number.EPSILON * Math.max(Math.abs(setPoint), Math.abs(finalValue)) ? 0 : setPoint - finalValue,
    inputs,
  };
}
