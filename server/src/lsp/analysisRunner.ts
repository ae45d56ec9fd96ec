// Runs slow analyses one at a time in a worker thread, newest version per document first.
// A newer version of the document being analysed terminates the worker (the cheapest and
// surest cancellation: the engine need not poll) and a fresh worker starts at once.
// Without the bundled worker file (tests running the sources) the analysis runs in-process.
// On a machine with more than one core a helper thread runs beside the worker and takes the
// plant reports and fragility studies (analysisHelper.ts); LOOPWRIGHT_ANALYSIS_THREADS=1 turns
// it off (for side-by-side measurement). A cancelled worker is always stopped; the helper only
// when it is still busy with the abandoned job.
import { existsSync } from 'node:fs';
import { availableParallelism } from 'node:os';
import { setFlagsFromString } from 'node:v8';
import { MessageChannel, Worker } from 'node:worker_threads';
import { ANSWERS_POSTED, HELPER_BUSY, HELPER_CELLS, HELPER_GONE } from './analysisHelper';
import { traceMark } from './trace';
import type { AnalysisSettings } from '../control/settings';
import { runSlowAnalysis, type AnalysisJob, type AnalysisReply, type PackedRiccatiStart, type SlowResult } from './slowAnalysis';

// The analyses allocate many short-lived rows; a larger young generation means fewer scavenges
// (about 10 % off a 100-state analysis, measured with test/bench/lsp.mjs).
const WORKER_LIMITS = { maxYoungGenerationSizeMb: 64 };

// After each full (mark-compact) collection of an analysis thread's heap, V8 compiles much of the
// analysis code again (seen with --trace-opt: the transfer evaluator's closures, for one, were
// optimised anew after every full collection); with V8's default heap sizing a 100-state edit
// filled the old generation often enough that the background compiler used more CPU than the
// server's main thread. A larger initial old
// generation makes full collections rarer (measured, 60 edits of the 100-state rod in one thread:
// 9 → 2 full collections, 15 → 7 optimising compilations per edit). V8 reads the flag when an
// isolate is created, so it is set once before the first thread starts; the main thread's heap
// keeps its default. LOOPWRIGHT_ANALYSIS_OLD_SPACE_MB overrides it (0: V8's default), for
// side-by-side measurement.
const ANALYSIS_OLD_SPACE_MB = Number(process.env.LOOPWRIGHT_ANALYSIS_OLD_SPACE_MB ?? 128);
let heapFlagsSet = false;
function setAnalysisHeapFlags(): void {
  if (heapFlagsSet) return;
  heapFlagsSet = true;
  if (ANALYSIS_OLD_SPACE_MB > 0) setFlagsFromString(`--initial-old-space-size=${ANALYSIS_OLD_SPACE_MB}`);
}

export type SlowOutcome = { result: SlowResult } | { error: string } | { superseded: true };

interface Pending {
  job: AnalysisJob;
  resolve: (outcome: SlowOutcome) => void;
}

export class AnalysisRunner {
  private worker: Worker | null = null;
  private helper: Worker | null = null;
  private helperCells: Int32Array | null = null;
  private running: Pending | null = null;
  private readonly queue = new Map<string, Pending>();
  /**
   * Per document, the Riccati solutions of its last analysed version: the next job's warm starts.
   * Kept here, not in the worker, because a newer edit terminates the worker.
   */
  private readonly riccatiStarts = new Map<string, Map<string, PackedRiccatiStart>>();
  private nextJob = 1;
  private disposed = false;

  constructor(
    private readonly workerPath: string | null,
    private readonly log: (message: string) => void,
  ) {
    if (workerPath && !existsSync(workerPath)) this.workerPath = null;
  }

  get usesWorker(): boolean {
    return this.workerPath !== null;
  }

  /** Analyses a version; an older request for the same document resolves as superseded. */
  analyse(uri: string, version: number, text: string, settings: Partial<AnalysisSettings>, largestPlantStates?: number): Promise<SlowOutcome> {
    return new Promise((resolve) => {
      this.cancel(uri);
      // LOOPWRIGHT_WARM_START=0 solves every version afresh (for side-by-side measurement).
      const riccatiStarts = process.env.LOOPWRIGHT_WARM_START === '0' ? undefined : this.riccatiStarts.get(uri);
      const hint = largestPlantStates !== undefined ? { largestPlantStates } : {};
      this.queue.set(uri, { job: { job: this.nextJob++, uri, version, text, settings, ...hint, ...(riccatiStarts ? { riccatiStarts } : {}) }, resolve });
      this.pump();
    });
  }

  /** Abandons queued and running work for a document (a newer edit or a close). */
  cancel(uri: string): void {
    const queued = this.queue.get(uri);
    if (queued) {
      this.queue.delete(uri);
      queued.resolve({ superseded: true });
    }
    if (this.running?.job.uri === uri) {
      const running = this.running;
      this.running = null;
      this.stopWorker();
      running.resolve({ superseded: true });
      this.warm(); // a fresh worker loads while the next edit settles
      this.pump();
    }
  }

  /** Forgets a closed document's warm starts (after `cancel`). */
  forget(uri: string): void {
    this.riccatiStarts.delete(uri);
  }

  /** Starts the worker ahead of the first job, so the first analysis does not wait for it to load. */
  warm(): void {
    if (this.workerPath && !this.disposed) this.ensureWorker();
  }

  dispose(): void {
    this.disposed = true;
    for (const uri of [...this.queue.keys()]) this.cancel(uri);
    if (this.running) this.cancel(this.running.job.uri);
    this.stopWorker();
  }

  private pump(): void {
    if (this.running || this.disposed) return;
    const next = this.queue.entries().next();
    if (next.done) return;
    const [uri, pending] = next.value;
    this.queue.delete(uri);
    this.running = pending;
    if (this.workerPath) this.runInWorker(pending);
    else this.runInProcess(pending);
  }

  private finish(pending: Pending, outcome: SlowOutcome): void {
    if (this.running !== pending) return; // cancelled meanwhile; already resolved
    this.running = null;
    if ('result' in outcome) {
      if (outcome.result.riccatiStarts.size) this.riccatiStarts.set(pending.job.uri, outcome.result.riccatiStarts);
      else this.riccatiStarts.delete(pending.job.uri);
    }
    pending.resolve(outcome);
    this.pump();
  }

  private runInProcess(pending: Pending): void {
    setImmediate(() => {
      if (this.running !== pending) return;
      try {
        const result = runSlowAnalysis(pending.job.text, pending.job.settings, {
          isCancelled: () => this.running !== pending,
          riccatiStarts: pending.job.riccatiStarts,
        });
        this.finish(pending, { result });
      } catch (error) {
        this.finish(pending, { error: error instanceof Error ? error.stack ?? error.message : String(error) });
      }
    });
  }

  private runInWorker(pending: Pending): void {
    const worker = this.ensureWorker();
    worker.postMessage(pending.job);
    traceMark('server: job posted');
  }

  private ensureWorker(): Worker {
    if (this.worker) return this.worker;
    setAnalysisHeapFlags();
    const worker = new Worker(this.workerPath!, { resourceLimits: WORKER_LIMITS });
    if (availableParallelism() > 1 && process.env.LOOPWRIGHT_ANALYSIS_THREADS !== '1') this.linkHelper(worker);
    worker.on('message', (reply: AnalysisReply | { kind: 'log'; message: string }) => {
      if ('kind' in reply) {
        if (reply.kind === 'log') this.log(reply.message);
        return;
      }
      traceMark('server: analysis received');
      const pending = this.running;
      if (!pending || pending.job.job !== reply.job) return;
      this.finish(pending, 'result' in reply ? { result: reply.result } : { error: reply.error });
    });
    worker.on('error', (error) => {
      this.log(`analysis worker failed: ${error.stack ?? error.message}`);
    });
    worker.on('exit', (code) => {
      if (this.worker !== worker) return; // terminated on purpose
      this.worker = null;
      const pending = this.running;
      if (pending) this.finish(pending, { error: `analysis worker stopped (exit code ${code})` });
    });
    this.worker = worker;
    return worker;
  }

  /**
   * Links a new worker to the helper thread (analysisHelper.ts) through a fresh channel and fresh
   * shared cells. An idle helper outlives the worker it served (typing cancels analyses often, and
   * a thread costs tens of milliseconds to start); a busy or missing one is (re)started.
   */
  private linkHelper(worker: Worker): void {
    if (!this.helper) {
      const helper = new Worker(this.workerPath!, { resourceLimits: WORKER_LIMITS, workerData: { role: 'helper' } });
      helper.on('message', (message: { kind?: string; message?: string }) => {
        if (message?.kind === 'log' && message.message) this.log(message.message);
      });
      helper.on('error', (error) => this.log(`analysis helper failed: ${error.stack ?? error.message}`));
      helper.on('exit', () => {
        if (this.helper !== helper) return; // stopped on purpose
        this.helper = null;
        // Whoever waits on the helper stops waiting and computes its part itself.
        Atomics.store(this.helperCells!, HELPER_GONE, 1);
        Atomics.notify(this.helperCells!, ANSWERS_POSTED);
      });
      this.helper = helper;
    }
    const channel = new MessageChannel();
    const cells = new SharedArrayBuffer(HELPER_CELLS * 4);
    this.helperCells = new Int32Array(cells);
    this.helper.postMessage({ kind: 'link', port: channel.port2, cells }, [channel.port2]);
    worker.postMessage({ kind: 'link', port: channel.port1, cells }, [channel.port1]);
  }

  private stopWorker(): void {
    const worker = this.worker;
    this.worker = null;
    if (worker) void worker.terminate();
    const helper = this.helper;
    if (helper && (this.disposed || (this.helperCells && Atomics.load(this.helperCells, HELPER_BUSY) !== 0))) {
      // Still computing for the abandoned job: stopping it is cheaper than waiting for it.
      this.helper = null;
      void helper.terminate();
    }
  }
}
