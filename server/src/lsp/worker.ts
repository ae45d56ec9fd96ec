// Analysis worker (bundled as dist/worker.cjs): runs the slow analyses of one document version
// off the server's main thread, so hovers and completions answer while a large model analyses.
// The server terminates this thread when a newer edit makes the running job pointless.
import { parentPort } from 'node:worker_threads';
import { cloneable, runSlowAnalysis, type AnalysisJob, type AnalysisReply } from './slowAnalysis';

parentPort?.on('message', (job: AnalysisJob) => {
  let reply: AnalysisReply;
  try {
    reply = { job: job.job, uri: job.uri, version: job.version, result: runSlowAnalysis(job.text, job.settings) };
  } catch (error) {
    reply = { job: job.job, uri: job.uri, version: job.version, error: error instanceof Error ? error.stack ?? error.message : String(error) };
  }
  try {
    parentPort!.postMessage(reply);
  } catch {
    // A report held something structured clone refuses (a function): send a plain copy.
    parentPort!.postMessage(cloneable(reply));
  }
});
