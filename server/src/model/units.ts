// Unit suffixes on numbers. Times convert to seconds, frequencies stay in hertz, and a
// percentage is a fraction in general expressions (the `overshoot` spec keeps percent).

export type UnitKind = 'time' | 'frequency' | 'percent';

export interface UnitInfo {
  kind: UnitKind;
  /** Multiply the written number by this to get seconds / hertz / a fraction. */
  scale: number;
}

const units: Record<string, UnitInfo> = {
  s: { kind: 'time', scale: 1 },
  ms: { kind: 'time', scale: 1e-3 },
  us: { kind: 'time', scale: 1e-6 },
  ns: { kind: 'time', scale: 1e-9 },
  min: { kind: 'time', scale: 60 },
  Hz: { kind: 'frequency', scale: 1 },
  kHz: { kind: 'frequency', scale: 1e3 },
  '%': { kind: 'percent', scale: 1e-2 },
};

export const unitNames = Object.keys(units);

export function unitInfo(name: string): UnitInfo | undefined {
  return Object.prototype.hasOwnProperty.call(units, name) ? units[name] : undefined;
}

/** Shortest sample period accepted: below a nanosecond no digital controller samples. */
export const shortestSamplePeriod = 1e-9;
