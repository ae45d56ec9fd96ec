// Small Rows-level helpers for the numeric solver tests (plain loops, independent of the code under test).
export type M = number[][];

export const EPS = Number.EPSILON;

export function mul(a: M, b: M): M {
  return a.map((row) => b[0].map((_, j) => row.reduce((sum, v, k) => sum + v * b[k][j], 0)));
}
export function tr(a: M): M {
  return a[0].map((_, j) => a.map((row) => row[j]));
}
export function add(...terms: M[]): M {
  return terms[0].map((row, i) => row.map((_, j) => terms.reduce((s, t) => s + t[i][j], 0)));
}
export function sub(a: M, b: M): M {
  return a.map((row, i) => row.map((v, j) => v - b[i][j]));
}
export function scale(a: M, f: number): M {
  return a.map((row) => row.map((v) => v * f));
}
export function frob(a: M): number {
  return Math.sqrt(a.flat().reduce((s, v) => s + v * v, 0));
}
export function eye(n: number): M {
  return Array.from({ length: n }, (_, i) => Array.from({ length: n }, (_, j) => (i === j ? 1 : 0)));
}
export function maxAbsDiff(a: M, b: M): number {
  let worst = 0;
  for (let i = 0; i < a.length; i++) for (let j = 0; j < a[i].length; j++) worst = Math.max(worst, Math.abs(a[i][j] - b[i][j]));
  return worst;
}
/** Deterministic uniform(−1, 1) generator (Park–Miller minimal standard). */
export function seededRandom(seed: number): () => number {
  let state = seed;
  return () => ((state = (state * 16807) % 2147483647) / 2147483647) * 2 - 1;
}
export function randomMatrix(rows: number, cols: number, random: () => number): M {
  return Array.from({ length: rows }, () => Array.from({ length: cols }, random));
}
