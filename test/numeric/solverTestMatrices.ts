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

/** What both Riccati solvers return, as far as the warm-start checks read it. */
interface WarmStartOutcome {
  ok: boolean;
  X: M;
  residual: number;
  warmStarted: boolean;
  newtonSteps: number;
}

/**
 * The warm-start check shared by both Riccati solvers: from the reference solution moved by
 * `distance` in a random symmetric direction, the solver must use the start wherever
 * distance·κ < 0.1 (κ its condition estimate of the fresh solve: Newton's quadratic phase), take at
 * most 3 steps, and land within the bound the fresh route meets against the reference,
 * 10·n·ε·κ·‖X‖. Returns how many cases were warm-started.
 */
export function checkWarmStartsNearReference<C extends { n: number; m: number }>(
  cases: C[],
  reference: (c: C) => M,
  solve: (c: C, start?: M) => WarmStartOutcome & { conditionEstimate: number },
  seed: number,
  expectValue: (actual: unknown, label: string) => { toBe(value: unknown): void; toBeLessThan(value: number): void; toBeLessThanOrEqual(value: number): void },
): number {
  const random = seededRandom(seed);
  const distance = 1e-5;
  let warm = 0;
  for (const c of cases) {
    const X = reference(c);
    const S = randomMatrix(c.n, c.n, random);
    const direction = add(S, tr(S));
    const s = solve(c, add(X, scale(direction, (distance * frob(X)) / frob(direction))));
    const { conditionEstimate } = solve(c);
    const label = `n=${c.n} m=${c.m} κ=${conditionEstimate}`;
    expectValue(s.ok, label).toBe(true);
    if (distance * conditionEstimate < 0.1) expectValue(s.warmStarted, label).toBe(true);
    if (s.warmStarted) {
      warm++;
      expectValue(s.newtonSteps, label).toBeLessThanOrEqual(3);
    }
    expectValue(s.residual, label).toBeLessThan(10 * c.n * EPS);
    expectValue(maxAbsDiff(s.X, X), label).toBeLessThan(10 * c.n * EPS * conditionEstimate * frob(X));
  }
  return warm;
}

