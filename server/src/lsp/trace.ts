// Timeline of one analysis across its threads, for performance work only: with
// LOOPWRIGHT_TRACE=<file> every thread appends "<epoch ms> <label>" lines to that file (the clock
// is shared by all threads of the process). Off by default; then each mark costs one comparison.
import { appendFileSync } from 'node:fs';

const traceFile = process.env.LOOPWRIGHT_TRACE;

export function traceMark(label: string): void {
  if (!traceFile) return;
  try {
    appendFileSync(traceFile, `${(performance.timeOrigin + performance.now()).toFixed(1)} ${label}\n`);
  } catch {
    // tracing must never disturb an analysis
  }
}
