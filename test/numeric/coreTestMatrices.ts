import type { Rows } from '../../server/src/numeric/types';

/** Deterministic pseudo-random matrix (linear congruential generator) so tests are reproducible. */
export function seededMatrix(rows: number, cols: number, seed: number): Rows {
  let state = seed >>> 0;
  const next = () => {
    state = (Math.imul(state, 1664525) + 1013904223) >>> 0;
    return state / 2 ** 32 - 0.5;
  };
  return Array.from({ length: rows }, () => Array.from({ length: cols }, () => next()));
}
