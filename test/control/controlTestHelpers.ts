// Small helpers for the control-analysis tests (matrix products and norms on plain rows).
import type { Complex, Rows } from '../../server/src/numeric/types';
import fixture from '../fixtures/reference/control_response.json';

export const EPS = Number.EPSILON;
export const reference = fixture as unknown as ControlFixture;

export interface ControlFixture {
  zeroOrderHold: { n: number; m: number; T: number; A: Rows; B: Rows; Phi: Rows; Gamma: Rows }[];
  frequencyResponse: { n: number; A: Rows; B: Rows; C: Rows; D: Rows; omegas: number[]; G: { re: Rows; im: Rows }[] }[];
  lqr: {
    n: number;
    m: number;
    A: Rows;
    B: Rows;
    Q: Rows;
    R: Rows;
    N: Rows | null;
    continuousX: Rows;
    continuousK: Rows;
    discreteX: Rows;
    discreteK: Rows;
  }[];
  kalman: {
    n: number;
    p: number;
    d: number;
    A: Rows;
    C: Rows;
    G: Rows;
    W: Rows;
    V: Rows;
    stateNoiseExtra: number;
    continuousP: Rows;
    continuousL: Rows;
    discreteP: Rows;
    predictorL: Rows;
    currentM: Rows;
  }[];
  sampledCost: { n: number; m: number; T: number; A: Rows; B: Rows; Q: Rows; R: Rows; N: Rows; Qd: Rows; Rd: Rows; Nd: Rows }[];
  stepResponse: { n: number; A: Rows; B: Rows; C: Rows; K: Rows; Nr: number; t: number[]; y: number[] }[];
  /** Random stable loops of 30 and 64 states (K = 0: A is the closed loop), long enough for the block recursion. */
  stepResponseLarge: { n: number; A: Rows; B: Rows; C: Rows; K: Rows; Nr: number; t: number[]; y: number[] }[];
}

export function multiply(a: Rows, b: Rows): Rows {
  return a.map((row) => b[0].map((_, j) => row.reduce((sum, value, k) => sum + value * b[k][j], 0)));
}
export function subtract(a: Rows, b: Rows): Rows {
  return a.map((row, i) => row.map((value, j) => value - b[i][j]));
}
export function transpose(a: Rows): Rows {
  return a[0].map((_, j) => a.map((row) => row[j]));
}
export function frobenius(a: Rows): number {
  return Math.sqrt(a.reduce((sum, row) => sum + row.reduce((s, v) => s + v * v, 0), 0));
}
export function relativeError(actual: Rows, expected: Rows): number {
  return frobenius(subtract(actual, expected)) / Math.max(frobenius(expected), Number.MIN_VALUE);
}
export function identity(n: number): Rows {
  return Array.from({ length: n }, (_, i) => Array.from({ length: n }, (_, j) => (i === j ? 1 : 0)));
}

/** Largest distance from each pole of `a` to its nearest unused pole in `b` (greedy). */
export function poleSetDistance(a: Complex[], b: Complex[]): number {
  const used = new Array<boolean>(b.length).fill(false);
  let worst = 0;
  for (const pole of a) {
    let best = -1;
    let distance = Infinity;
    b.forEach((candidate, index) => {
      const d = Math.hypot(candidate.re - pole.re, candidate.im - pole.im);
      if (!used[index] && d < distance) {
        distance = d;
        best = index;
      }
    });
    if (best < 0) return Infinity;
    used[best] = true;
    worst = Math.max(worst, distance);
  }
  return a.length === b.length ? worst : Infinity;
}
