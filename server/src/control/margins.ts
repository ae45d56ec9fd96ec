// Stability margins of the loop as implemented, broken at the plant input.
//
// Loop transfer (negative-feedback convention, closed by v = −L v):
//   state feedback      L(λ) = K (λI − A)⁻¹ B
//   output feedback     L(λ) = −Kc(λ) P(λ), P the plant y/u, Kc the controller u/y
//                       (observer-based controller from combinedClosedLoop.ts)
// MIMO: one input at a time, the other loops closed (Skogestad & Postlethwaite's "loop-at-a-
// time" margins): L_i = l_ii − l_io (I + L_oo)⁻¹ l_oi at each frequency.
// On the SISO L_i(jω) (or L_i(e^{jωT}) up to π/T):
//   gain crossovers |L_i| = 1 → phase margin PM = 180° − |∠L_i| with ∠L_i in (−180°, 180°] (the
//     phase change in either direction that puts L_i on −1; given a negative sign when the closed
//     loop is unstable), the smallest over crossovers; delay margin: a delay τ lags the phase by
//     ωτ, so τ = (∠L_i + 180°)[rad]/ω_c, the smallest over crossovers;
//   negative-real-axis crossings L_i = −a (phase crossovers, incl. ω = 0 and ω = ∞ / π/T) → the
//     critical gains 1/a; the upper gain margin is the smallest 1/a above 1, the lower gain
//     margin the largest 1/a below 1 (the gain interval around 1 over which the Nyquist count,
//     hence stability, is unchanged);
//   peak sensitivity Ms = max |1/(1 + L_i)|.
// Grid: logarithmic, 60 points per decade over two decades beyond the smallest and largest pole
// magnitudes of the loop and closed loop, extra points around poles too lightly damped for that
// grid (±3ζ narrower than four grid cells, ζ ≲ 0.05); each crossing
// is refined by the Illinois method on log ω (at most 60 steps), the sensitivity peak by golden-section
// search (at most 60 steps).
import type { Complex, ComplexRows, Rows } from '../numeric/types';
import { denseFromRows, eigenvalues, realSchurDense, solveComplexLinear, solveLinear, type RealSchurDense } from '../numeric';
import type { StateSpace } from './combinedClosedLoop';
import { frequencyPoint, logarithmicGrid, transferEvaluator } from './frequencyResponse';
import { multiplyRows as multiply } from './controlLinearAlgebra';

export interface InputLoopMargins {
  input: number;
  /** Factor (dB) by which this loop's gain may grow before instability; +∞ when unbounded. */
  upperGainMarginDb: number;
  upperGainCrossover: number | null;
  /** Factor (dB, ≤ 0) to which the gain may shrink before instability; −∞ when unbounded. */
  lowerGainMarginDb: number;
  lowerGainCrossover: number | null;
  /** Smallest phase margin over the gain crossovers (deg); null when |L| never crosses 1. */
  phaseMarginDeg: number | null;
  gainCrossover: number | null;
  /** Smallest extra loop delay (s) that destabilises; null when there is no gain crossover. */
  delayMargin: number | null;
  peakSensitivity: number;
  peakSensitivityFrequency: number;
}

export interface LoopMarginsResult {
  method: 'loop-at-a-time, broken at the plant input, other loops closed';
  domain: 'continuous' | 'discrete';
  closedLoopStable: boolean;
  perInput: InputLoopMargins[];
  /** Grid bounds used (rad/s). */
  lowestFrequency: number;
  highestFrequency: number;
}


/** What loopMargins evaluated, for a plot of the same loop that then needs no evaluation of its own. */
export interface MarginEvaluations {
  /** L at every frequency evaluated (ω in rad/s → the m × m loop). */
  values: Map<number, ComplexRows>;
  /** The logarithmic part of the grid (60 points per decade), every point of it evaluated. */
  logarithmicGrid: number[];
}

/** Points per decade of the margin grid's logarithmic part. */
const MARGIN_GRID_PER_DECADE = 60;

/** L(λ) = K (λI − A)⁻¹ B as a state-space model. */
export function stateFeedbackLoop(A: Rows, B: Rows, K: Rows): StateSpace {
  const m = K.length;
  return { A, B, C: K, D: Array.from({ length: m }, () => new Array<number>(m).fill(0)) };
}

/** L = −Kc·P: plant (A, B, C, D) in series with the controller (Ac, Bc, Cc, Dc) from y to u. */
export function outputFeedbackLoop(plant: StateSpace, controller: StateSpace): StateSpace {
  const nc = controller.A.length;
  const BcC = multiply(controller.B, plant.C);
  const BcD = multiply(controller.B, plant.D);
  const DcC = multiply(controller.D, plant.C);
  const DcD = multiply(controller.D, plant.D);
  const A: Rows = [
    ...plant.A.map((row) => [...row, ...new Array<number>(nc).fill(0)]),
    ...controller.A.map((row, i) => [...BcC[i], ...row]),
  ];
  const B: Rows = [...plant.B.map((row) => row.slice()), ...BcD];
  const C: Rows = DcC.map((row, i) => [...row.map((v) => -v), ...controller.C[i].map((v) => -v)]);
  const D: Rows = DcD.map((row) => row.map((v) => -v));
  return { A, B, C, D };
}

/** Closed-loop state matrix of v = −L v: A − B (I + D)⁻¹ C. */
function closedLoopMatrix(loop: StateSpace): Rows {
  const m = loop.D.length;
  const IplusD = loop.D.map((row, i) => row.map((v, j) => v + (i === j ? 1 : 0)));
  const gain = m === 0 ? [] : solveLinear(IplusD, loop.C).X;
  const BG = m === 0 ? loop.A.map((row) => row.map(() => 0)) : multiply(loop.B, gain);
  return loop.A.map((row, i) => row.map((v, j) => v - BG[i][j]));
}

/** The SISO loop seen at input `channel` with the other loops closed: l_ii − l_io (I + L_oo)⁻¹ l_oi. */
function loopAtInput(value: ComplexRows, channel: number): Complex {
  const m = value.re.length;
  if (m === 1) return { re: value.re[0][0], im: value.im[0][0] };
  const others = Array.from({ length: m }, (_, k) => k).filter((k) => k !== channel);
  const M: ComplexRows = {
    re: others.map((i) => others.map((j) => value.re[i][j] + (i === j ? 1 : 0))),
    im: others.map((i) => others.map((j) => value.im[i][j])),
  };
  const rhs: ComplexRows = { re: others.map((i) => [value.re[i][channel]]), im: others.map((i) => [value.im[i][channel]]) };
  const solution = solveComplexLinear(M, rhs);
  let re = value.re[channel][channel];
  let im = value.im[channel][channel];
  others.forEach((j, index) => {
    const ar = value.re[channel][j];
    const ai = value.im[channel][j];
    const xr = solution.X.re[index][0];
    const xi = solution.X.im[index][0];
    re -= ar * xr - ai * xi;
    im -= ar * xi + ai * xr;
  });
  return { re, im };
}

function stableIn(poles: Complex[], domain: 'continuous' | 'discrete'): boolean {
  return poles.every((pole) => (domain === 'continuous' ? pole.re < 0 : Math.hypot(pole.re, pole.im) < 1));
}

function frequencyGrid(loop: StateSpace, openPoles: Complex[], closedPoles: Complex[], domain: 'continuous' | 'discrete', T: number): { grid: number[]; logarithmic: number[] } {
  const corners: { frequency: number; damping: number }[] = [];
  for (const pole of [...openPoles, ...closedPoles]) {
    const s = domain === 'continuous' ? pole : { re: Math.log(Math.hypot(pole.re, pole.im)) / T, im: Math.atan2(pole.im, pole.re) / T };
    const frequency = Math.hypot(s.re, s.im);
    if (Number.isFinite(frequency) && frequency > 0) corners.push({ frequency, damping: Math.abs(s.re) / frequency });
  }
  let scale = 0;
  for (const row of loop.A) for (const v of row) scale = Math.max(scale, Math.abs(v));
  const fallback = scale > 0 ? scale : 1;
  const lowCorner = corners.length ? Math.min(...corners.map((c) => c.frequency)) : fallback;
  const highCorner = corners.length ? Math.max(...corners.map((c) => c.frequency)) : fallback;
  const low = lowCorner / 100;
  const nyquist = Math.PI / T;
  const high = domain === 'continuous' ? highCorner * 100 : nyquist;
  const logarithmic = logarithmicGrid(Math.min(low, high / 10), high, MARGIN_GRID_PER_DECADE);
  const grid = logarithmic.slice();
  // Relative spacing of the logarithmic grid: a resonance whose ±3ζ band spans several grid cells
  // is already resolved by it and needs no extra points.
  const gridSpacing = Math.pow(10, 1 / MARGIN_GRID_PER_DECADE) - 1;
  for (const corner of corners) {
    if (corner.damping < 0.3 && 3 * corner.damping < 4 * gridSpacing) {
      // ±3ζ around a lightly damped resonance, at least ±1 % for (nearly) undamped modes.
      const width = Math.max(3 * corner.damping, 0.01);
      for (let k = -20; k <= 20; k++) {
        const omega = corner.frequency * (1 + (width * k) / 20);
        if (omega > 0 && omega <= high) grid.push(omega);
      }
    }
  }
  grid.sort((a, b) => a - b);
  return { grid: grid.filter((omega, index) => index === 0 || omega > grid[index - 1]), logarithmic };
}

const REFINE_STEPS = 60;

/**
 * The ω in [low, high] where f changes sign, by the Illinois variant of regula falsi on log ω
 * (Dowell & Jarratt, BIT 11, 1971): superlinear, and the bracket is kept, so a crossing found on
 * the grid is never lost. About ten evaluations instead of the sixty of bisection.
 */
function refineCrossing(f: (omega: number) => number, low: number, high: number): number {
  let a = Math.log(low);
  let b = Math.log(high);
  let fa = f(low);
  let fb = f(high);
  if (fa === 0) return low;
  if (fb === 0) return high;
  for (let step = 0; step < REFINE_STEPS && Math.abs(b - a) > 4 * Number.EPSILON * Math.max(1, Math.abs(a), Math.abs(b)); step++) {
    let c = b - (fb * (b - a)) / (fb - fa);
    if (!(c > Math.min(a, b) && c < Math.max(a, b))) c = 0.5 * (a + b);
    const fc = f(Math.exp(c));
    if (fc === 0 || Number.isNaN(fc)) return Math.exp(c);
    if (Math.sign(fc) !== Math.sign(fb)) {
      a = b;
      fa = fb;
    } else {
      fa /= 2;
    }
    b = c;
    fb = fc;
  }
  return Math.exp(0.5 * (a + b));
}

function goldenMax(f: (omega: number) => number, low: number, high: number): { omega: number; value: number } {
  const ratio = (Math.sqrt(5) - 1) / 2;
  let a = Math.log(low);
  let b = Math.log(high);
  let c = b - ratio * (b - a);
  let d = a + ratio * (b - a);
  let fc = f(Math.exp(c));
  let fd = f(Math.exp(d));
  for (let step = 0; step < REFINE_STEPS && b - a > 4 * Number.EPSILON * Math.max(1, Math.abs(b)); step++) {
    if (fc > fd) {
      b = d;
      d = c;
      fd = fc;
      c = b - ratio * (b - a);
      fc = f(Math.exp(c));
    } else {
      a = c;
      c = d;
      fc = fd;
      d = a + ratio * (b - a);
      fd = f(Math.exp(d));
    }
  }
  return fc > fd ? { omega: Math.exp(c), value: fc } : { omega: Math.exp(d), value: fd };
}

/**
 * Margins of the loop L = C(λI − A)⁻¹B + D. `openLoopSchur`, a real Schur form of loop.A, may be
 * passed when the caller needs it for other responses too; its diagonal gives the open-loop poles.
 * `evaluations`, when given, receives what was evaluated (MarginEvaluations).
 */
export function loopMargins(
  loop: StateSpace,
  domain: 'continuous' | 'discrete',
  T = 1,
  openLoopSchur?: RealSchurDense,
  evaluations: MarginEvaluations = { values: new Map(), logarithmicGrid: [] },
): LoopMarginsResult {
  const m = loop.D.length;
  const closedPoles = eigenvalues(closedLoopMatrix(loop));
  const closedLoopStable = stableIn(closedPoles, domain);
  const schur = openLoopSchur ?? (loop.A.length ? realSchurDense(denseFromRows(loop.A)) : undefined);
  const openPoles = schur?.converged ? schur.eigenvalues : eigenvalues(loop.A);
  const { grid, logarithmic } = frequencyGrid(loop, openPoles, closedPoles, domain, T);
  evaluations.logarithmicGrid = logarithmic;
  const rootEps = Math.sqrt(Number.EPSILON);

  const evaluate = transferEvaluator(loop.A, loop.B, loop.C, loop.D, schur);
  // One evaluation of the whole m × m loop per frequency, shared by the m loop-at-a-time channels.
  const evaluated = evaluations.values;
  const matrixAt = (omega: number): ComplexRows => {
    let value = evaluated.get(omega);
    if (!value) {
      value = evaluate(frequencyPoint(omega, domain, T)).value;
      evaluated.set(omega, value);
    }
    return value;
  };
  // The grid at once: the Schur evaluator solves four frequencies per pass (the same values).
  if (evaluate.many) {
    const missing = grid.filter((omega) => !evaluated.has(omega));
    const values = evaluate.many(missing.map((omega) => frequencyPoint(omega, domain, T)));
    missing.forEach((omega, k) => evaluated.set(omega, values[k].value));
  }
  const perInput: InputLoopMargins[] = [];
  for (let channel = 0; channel < m; channel++) {
    const at = (omega: number): Complex => loopAtInput(matrixAt(omega), channel);
    const values = grid.map(at);

    // Gain crossovers.
    const logMagnitude = (omega: number): number => {
      const value = at(omega);
      return Math.log(Math.hypot(value.re, value.im));
    };
    let phaseMarginDeg: number | null = null;
    let gainCrossover: number | null = null;
    let delayMargin: number | null = null;
    for (let k = 0; k + 1 < grid.length; k++) {
      const a = Math.log(Math.hypot(values[k].re, values[k].im));
      const b = Math.log(Math.hypot(values[k + 1].re, values[k + 1].im));
      if (!(Number.isFinite(a) && Number.isFinite(b)) || Math.sign(a) === Math.sign(b) || a === 0) continue;
      const omega = refineCrossing(logMagnitude, grid[k], grid[k + 1]);
      const value = at(omega);
      const phase = (Math.atan2(value.im, value.re) * 180) / Math.PI; // (−180°, 180°]
      // Phase change in either direction that puts L on −1; negative when the loop is unstable.
      const margin = (closedLoopStable ? 1 : -1) * (180 - Math.abs(phase));
      // A delay τ only lags the phase (−ωτ): it needs phase + 180° of lag (in [0°, 360°)).
      const lag = phase + 180;
      const delay = closedLoopStable ? ((lag * Math.PI) / 180) / omega : 0;
      if (phaseMarginDeg === null || margin < phaseMarginDeg) {
        phaseMarginDeg = margin;
        gainCrossover = omega;
      }
      delayMargin = delayMargin === null ? delay : Math.min(delayMargin, delay);
    }

    // Negative-real-axis crossings: critical gains 1/a.
    const critical: { gain: number; omega: number }[] = [];
    const consider = (value: Complex, omega: number): void => {
      const magnitude = Math.hypot(value.re, value.im);
      if (value.re < 0 && Math.abs(value.im) <= rootEps * magnitude && magnitude > 0 && Number.isFinite(magnitude)) {
        critical.push({ gain: 1 / magnitude, omega });
      }
    };
    const imaginary = (omega: number): number => at(omega).im;
    for (let k = 0; k + 1 < grid.length; k++) {
      const a = values[k].im;
      const b = values[k + 1].im;
      if (a === 0 || Math.sign(a) === Math.sign(b) || !Number.isFinite(a) || !Number.isFinite(b)) continue;
      const omega = refineCrossing(imaginary, grid[k], grid[k + 1]);
      consider(at(omega), omega);
    }
    for (let k = 0; k < grid.length; k++) if (values[k].im === 0) consider(values[k], grid[k]);
    // Endpoints ω = 0 and ω = ∞ (continuous) or π/T (discrete): L is real there.
    const zero = evaluate(domain === 'continuous' ? { re: 0, im: 0 } : { re: 1, im: 0 });
    if (!zero.singular) consider(loopAtInput(zero.value, channel), 0);
    if (domain === 'continuous') {
      consider(loopAtInput({ re: loop.D, im: loop.D.map((row) => row.map(() => 0)) }, channel), Infinity);
    } else {
      const nyquist = evaluate({ re: -1, im: 0 });
      if (!nyquist.singular) consider(loopAtInput(nyquist.value, channel), Math.PI / T);
    }
    let upper = Infinity;
    let upperOmega: number | null = null;
    let lower = 0;
    let lowerOmega: number | null = null;
    for (const { gain, omega } of critical) {
      if (gain > 1 && gain < upper) {
        upper = gain;
        upperOmega = omega;
      }
      if (gain < 1 && gain > lower) {
        lower = gain;
        lowerOmega = omega;
      }
    }

    // Peak sensitivity.
    const sensitivity = (omega: number): number => {
      const value = at(omega);
      return 1 / Math.hypot(1 + value.re, value.im);
    };
    let peakIndex = 0;
    let peak = -Infinity;
    values.forEach((value, index) => {
      const s = 1 / Math.hypot(1 + value.re, value.im);
      if (s > peak) {
        peak = s;
        peakIndex = index;
      }
    });
    const refined = goldenMax(sensitivity, grid[Math.max(0, peakIndex - 1)], grid[Math.min(grid.length - 1, peakIndex + 1)]);
    const peakSensitivity = Math.max(peak, refined.value);
    const peakSensitivityFrequency = refined.value > peak ? refined.omega : grid[peakIndex];

    perInput.push({
      input: channel,
      upperGainMarginDb: 20 * Math.log10(upper),
      upperGainCrossover: upperOmega,
      lowerGainMarginDb: 20 * Math.log10(lower),
      lowerGainCrossover: lowerOmega,
      phaseMarginDeg,
      gainCrossover,
      delayMargin,
      peakSensitivity,
      peakSensitivityFrequency,
    });
  }
  return {
    method: 'loop-at-a-time, broken at the plant input, other loops closed',
    domain,
    closedLoopStable,
    perInput,
    lowestFrequency: grid[0],
    highestFrequency: grid[grid.length - 1],
  };
}
