// Frequency response of a state-space model G = C (λI − A)⁻¹ B + D at λ = jω (continuous) or
// λ = e^{jωT} (discrete, ω up to the Nyquist frequency π/T), by one complex LU solve per
// frequency (numeric solveComplexLinear). Phase is unwrapped along the grid (jumps > 180°
// removed by ±360°), magnitude in dB.
import type { Complex, ComplexRows, Rows } from '../numeric/types';
import { solveComplexLinear } from '../numeric';

export interface FrequencyChannel {
  output: number;
  input: number;
  magnitudeDb: number[];
  phaseDeg: number[];
}

export interface FrequencyResponse {
  omegas: number[];
  channels: FrequencyChannel[];
}

/** The evaluation point for frequency ω: jω, or e^{jωT}. */
export function frequencyPoint(omega: number, domain: 'continuous' | 'discrete', T = 1): Complex {
  return domain === 'continuous' ? { re: 0, im: omega } : { re: Math.cos(omega * T), im: Math.sin(omega * T) };
}

/**
 * G(λ) as separate real and imaginary p × m arrays; `singular` when λ is (numerically) an
 * eigenvalue of A.
 */
export function evaluateTransfer(A: Rows, B: Rows, C: Rows, D: Rows, point: Complex): { value: ComplexRows; singular: boolean } {
  const n = A.length;
  const m = D[0]?.length ?? B[0]?.length ?? 0;
  const p = C.length;
  if (n === 0) return { value: { re: D.map((row) => row.slice()), im: D.map((row) => row.map(() => 0)) }, singular: false };
  const matrix: ComplexRows = {
    re: A.map((row, i) => row.map((value, j) => (i === j ? point.re : 0) - value)),
    im: A.map((row, i) => row.map((_, j) => (i === j ? point.im : 0))),
  };
  const rhs: ComplexRows = { re: B.map((row) => row.slice()), im: B.map((row) => row.map(() => 0)) };
  const solution = solveComplexLinear(matrix, rhs);
  const re: Rows = [];
  const im: Rows = [];
  for (let i = 0; i < p; i++) {
    re.push(new Array<number>(m).fill(0));
    im.push(new Array<number>(m).fill(0));
    for (let j = 0; j < m; j++) {
      let sumRe = D[i]?.[j] ?? 0;
      let sumIm = 0;
      for (let k = 0; k < n; k++) {
        sumRe += C[i][k] * solution.X.re[k][j];
        sumIm += C[i][k] * solution.X.im[k][j];
      }
      re[i][j] = sumRe;
      im[i][j] = sumIm;
    }
  }
  return { value: { re, im }, singular: solution.singular };
}

export function unwrapDegrees(phases: number[]): number[] {
  const out: number[] = [];
  let offset = 0;
  for (let k = 0; k < phases.length; k++) {
    if (k > 0 && Number.isFinite(phases[k]) && Number.isFinite(phases[k - 1])) {
      const jump = phases[k] + offset - out[k - 1];
      offset -= 360 * Math.round(jump / 360);
    }
    out.push(phases[k] + offset);
  }
  return out;
}

export function frequencyResponse(
  A: Rows,
  B: Rows,
  C: Rows,
  D: Rows,
  omegas: number[],
  domain: 'continuous' | 'discrete',
  T?: number,
): FrequencyResponse {
  const p = C.length;
  const m = D[0]?.length ?? B[0]?.length ?? 0;
  const magnitude: number[][][] = Array.from({ length: p }, () => Array.from({ length: m }, () => []));
  const phase: number[][][] = Array.from({ length: p }, () => Array.from({ length: m }, () => []));
  for (const omega of omegas) {
    const { value } = evaluateTransfer(A, B, C, D, frequencyPoint(omega, domain, T ?? 1));
    for (let i = 0; i < p; i++) {
      for (let j = 0; j < m; j++) {
        const re = value.re[i][j];
        const im = value.im[i][j];
        magnitude[i][j].push(20 * Math.log10(Math.hypot(re, im)));
        phase[i][j].push((Math.atan2(im, re) * 180) / Math.PI);
      }
    }
  }
  const channels: FrequencyChannel[] = [];
  for (let i = 0; i < p; i++) {
    for (let j = 0; j < m; j++) {
      channels.push({ output: i, input: j, magnitudeDb: magnitude[i][j], phaseDeg: unwrapDegrees(phase[i][j]) });
    }
  }
  return { omegas: omegas.slice(), channels };
}

/** Logarithmic grid from ω_low to ω_high with `perDecade` points per decade (at least 2 points). */
export function logarithmicGrid(low: number, high: number, perDecade: number): number[] {
  const decades = Math.log10(high / low);
  const count = Math.max(2, Math.ceil(decades * perDecade) + 1);
  return Array.from({ length: count }, (_, k) => low * Math.pow(10, (decades * k) / (count - 1)));
}

/**
 * Closed-loop bandwidth (rad/s) of a stable SISO channel: the lowest frequency where |G(jω)|
 * falls 3 dB below |G(0)| (null when |G(0)| is zero or the response never falls that far on
 * the grid). Refined by bisection on log ω (at most 60 steps).
 */
export function bandwidth(A: Rows, B: Rows, C: Rows, D: Rows, omegas: number[], domain: 'continuous' | 'discrete', T?: number): number | null {
  const magnitudeAt = (omega: number): number => {
    const { value } = evaluateTransfer(A, B, C, D, frequencyPoint(omega, domain, T ?? 1));
    return Math.hypot(value.re[0][0], value.im[0][0]);
  };
  const dc = magnitudeAt(0);
  if (!(dc > 0) || !Number.isFinite(dc)) return null;
  const level = dc / Math.SQRT2;
  let previous = 0;
  for (const omega of omegas) {
    if (magnitudeAt(omega) < level) {
      let low = previous;
      let high = omega;
      for (let step = 0; step < 60 && high - low > 4 * Number.EPSILON * high; step++) {
        const middle = low > 0 ? Math.sqrt(low * high) : 0.5 * high;
        if (magnitudeAt(middle) < level) high = middle;
        else low = middle;
      }
      return 0.5 * (low + high);
    }
    previous = omega;
  }
  return null;
}
