// Analysis worker (bundled as dist/worker.cjs): runs the slow analyses of one document version
// off the server's main thread, so hovers and completions answer while a large model analyses.
// The server terminates this thread when a newer edit makes the running job pointless.
// The same file runs as the analysis helper (workerData.role === 'helper', analysisHelper.ts):
// the server links each worker to it with a fresh MessageChannel and shared cells.
import { type MessagePort, parentPort, workerData } from 'node:worker_threads';
import { helperForJob, serveAsHelper } from './analysisHelper';
import { usesHelper } from '../analyze';
import { numberFromEnvironment } from './settings';
import { traceGarbageCollection, traceMark } from './trace';
import { cloneable, runSlowAnalysis, type AnalysisJob, type AnalysisReply } from './slowAnalysis';

/** First message from the server when a helper thread is running beside this worker. */
export interface HelperLinkMessage {
  kind: 'link';
  port: MessagePort;
  cells: SharedArrayBuffer;
}

const log = (message: string) => parentPort?.postMessage({ kind: 'log', message });

if ((workerData as { role?: string } | null)?.role === 'helper') {
  traceGarbageCollection('helper');
  // One link at a time: each new analysis worker gets a fresh one (the previous one is closed).
  let unlink: (() => void) | null = null;
  parentPort?.on('message', (link: HelperLinkMessage) => {
    unlink?.();
    unlink = serveAsHelper(link.port, new Int32Array(link.cells), log);
  });
} else {
  traceGarbageCollection('coordinator');
  let helper: { port: MessagePort; cells: Int32Array } | null = null;
  // LOOPWRIGHT_HELPER_FROM_STATES overrides the size from which the helper is used (tests use 0).
  const helperFromStates = numberFromEnvironment('LOOPWRIGHT_HELPER_FROM_STATES');
  parentPort?.on('message', (message: AnalysisJob | HelperLinkMessage) => {
    if ('kind' in message && message.kind === 'link') {
      helper = { port: message.port, cells: new Int32Array(message.cells) };
      return;
    }
    const job = message as AnalysisJob;
    traceMark('coordinator: job start');
    let reply: AnalysisReply;
    try {
      const link = helper ? helperForJob(helper.port, helper.cells, job.job, job.text, job.settings) : undefined;
      // The server's fast check says the document is large: the helper parses alongside this thread.
      if (link && job.largestPlantStates !== undefined && usesHelper(job.largestPlantStates, job.settings, helperFromStates)) link.begin?.();
      reply = { job: job.job, uri: job.uri, version: job.version, result: runSlowAnalysis(job.text, job.settings, { helper: link, helperFromStates, riccatiStarts: job.riccatiStarts }) };
    } catch (error) {
      reply = { job: job.job, uri: job.uri, version: job.version, error: error instanceof Error ? error.stack ?? error.message : String(error) };
    }
    traceMark('coordinator: job end');
    try {
      parentPort!.postMessage(reply);
    } catch {
      // A report held something structured clone refuses (a function): send a plain copy.
      parentPort!.postMessage(cloneable(reply));
    }
    traceMark('coordinator: reply posted');
  });
}
