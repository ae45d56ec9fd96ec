// Timeline of one analysis across its threads, for performance work only: with
// LOOPWRIGHT_TRACE=<file> every thread appends "<epoch ms> <label>" lines to that file (the clock
// is shared by all threads of the process). Off by default; then each mark costs one comparison.
import { appendFileSync } from 'node:fs';
import { PerformanceObserver } from 'node:perf_hooks';

const traceFile = process.env.LOOPWRIGHT_TRACE;

export function traceMark(label: string): void {
  if (!traceFile) return;
  try {
    appendFileSync(traceFile, `${(performance.timeOrigin + performance.now()).toFixed(1)} ${label}\n`);
  } catch {
    // tracing must never disturb an analysis
  }
}

/** With tracing on, every garbage collection of at least 1 ms in this thread becomes a mark too. */
export function traceGarbageCollection(thread: string): void {
  if (!traceFile) return;
  const observer = new PerformanceObserver((list) => {
    for (const entry of list.getEntries()) {
      if (entry.duration < 1) continue;
      const kind = (entry as { detail?: { kind?: number } }).detail?.kind;
      // The entry's start time is on this thread's clock: its epoch time is timeOrigin + startTime.
      try {
        appendFileSync(traceFile, `${(performance.timeOrigin + entry.startTime).toFixed(1)} ${thread}: gc kind ${kind} ${entry.duration.toFixed(1)} ms\n`);
      } catch {
        // tracing must never disturb an analysis
      }
    }
  });
  observer.observe({ entryTypes: ['gc'] });
}
