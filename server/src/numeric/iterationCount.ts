// A process-wide tally of the iterations the bounded kernels spend (QR/QZ sweeps, Jacobi sweeps,
// Newton steps, doubling steps) and of the times a kernel ran out of its budget. Every kernel is
// bounded on its own; the tally lets tests check that a whole analysis stays inside a budget
// (docs/robustness.md) and that a non-converged kernel is never silent. Counting costs one add.

export type IterativeKernel = 'schur-qr' | 'qz' | 'svd-jacobi' | 'balance' | 'matrix-sign' | 'riccati-newton' | 'riccati-doubling' | 'knv-sweep';

const tally = { iterations: 0, nonConverged: 0 };
const nonConvergedBy = new Map<IterativeKernel, number>();

/** Called by a kernel once per sweep / step. */
export function countIterations(count = 1): void {
  tally.iterations += count;
}

/** Called by a kernel that stopped because its budget was exhausted (or its iterates overflowed). */
export function noteNonConvergence(kernel: IterativeKernel): void {
  tally.nonConverged++;
  nonConvergedBy.set(kernel, (nonConvergedBy.get(kernel) ?? 0) + 1);
}

export interface IterationTally {
  iterations: number;
  nonConverged: number;
  nonConvergedBy: Partial<Record<IterativeKernel, number>>;
}

/** The tally since the last reset. */
export function iterationTally(): IterationTally {
  return { ...tally, nonConvergedBy: Object.fromEntries(nonConvergedBy) };
}

export function resetIterationTally(): void {
  tally.iterations = 0;
  tally.nonConverged = 0;
  nonConvergedBy.clear();
}

/**
 * Documented iteration budget of one document analysis with at most `states` states per model
 * (docs/robustness.md): generous against the measured use (a few thousand for n ≤ 6), but finite,
 * so a kernel that iterates far more than its design allows shows up in the fuzz runs.
 */
export function documentIterationBudget(states: number, models: number): number {
  return 20000 * Math.max(1, models) * Math.max(1, states) ** 2;
}
