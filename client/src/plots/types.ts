// The part of a controller's analysis record that the plots read. The server's ControllerReport
// (server/src/control/design.ts) satisfies it structurally; kept separate so the plots stay a
// pure module with no dependency on the analysis code.

export interface Complex {
  re: number;
  im: number;
}

export interface SignalTrace {
  name: string;
  values: number[];
}

export interface StepPlotData {
  steppedOutput: string;
  time: number[];
  outputs: SignalTrace[];
  inputs: (SignalTrace & { limit: [number, number] | null })[];
  saturated?: { outputs: SignalTrace[]; inputs: SignalTrace[] };
  antiWindup?: { outputs: SignalTrace[]; inputs: SignalTrace[] };
  nonlinear?: { outputs: SignalTrace[]; inputs: SignalTrace[] };
  metrics: {
    output: string;
    setpoint: number;
    finalValue: number | null;
    riseTime: number | null;
    settlingTime: number | null;
    overshootPercent: number | null;
    undershootPercent: number | null;
    steadyStateError: number | null;
    peakInput: { input: string; value: number; min?: number; max?: number; limit: [number, number] | null }[];
  };
}

export interface FrequencyPlotData {
  omega: number[];
  magnitudeDb: number[];
  phaseDeg: number[];
}

export interface PlotData {
  name: string;
  domain: 'continuous' | 'discrete';
  closedLoopPoles: Complex[];
  step: StepPlotData[];
  details?: {
    observerPoles?: Complex[];
    zeros?: Complex[];
    frequencyResponse?: FrequencyPlotData;
    [key: string]: unknown;
  };
}

export interface PlotTheme {
  foreground: string;
  muted: string;
  grid: string;
  background: string;
  fontFamily: string;
  palette: string[];
  /** Colour of input limits. */
  limit: string;
}

export interface Series {
  label: string;
  values: number[];
  dash?: number[];
  colour?: string;
}

/** Four significant digits, exponent form for very large or small magnitudes; '—' for missing values. */
export function formatNumber(value: number | null | undefined): string {
  if (value === null || value === undefined || Number.isNaN(value)) return '—';
  if (!Number.isFinite(value)) return value > 0 ? '∞' : '−∞';
  if (value === 0) return '0';
  const magnitude = Math.abs(value);
  const text = magnitude >= 1e5 || magnitude < 1e-3 ? value.toExponential(3) : String(Number(value.toPrecision(4)));
  return text.replace('-', '−');
}
