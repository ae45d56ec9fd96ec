// The second analysis thread, used on machines with more than one core. One document's slow
// analysis splits cleanly: the plant reports need only the text, and a controller's fragility
// study (a dozen eigenvalue problems of the perturbed loop) needs only the text plus the gains
// and prescaler. So the analysis worker (the coordinator) designs the controllers while this
// helper, holding its own parse of the same text, computes the plant reports, rebuilds the plants
// the fragility studies will need, and, as each controller's gains arrive, its fragility study and
// (LQR) the Riccati condition estimate. Answers are the same pure functions of the text and
// settings as in one thread; the coordinator computes anything the helper cannot give.
//
// The coordinator waits synchronously (its analysis is one synchronous call): the helper posts
// each answer on a MessagePort and then bumps a shared counter that the coordinator sleeps on
// with Atomics.wait, reading the port with receiveMessageOnPort. A second shared cell says the
// helper is gone (set by the server when the helper thread exits), so nobody waits for a dead
// thread; a third says it is busy (the server stops a busy helper when the job is abandoned).
// The wait is bounded in wall-clock time, but that decides only which thread computes an
// answer, never the answer: results do not depend on machine load.
import { type MessagePort, receiveMessageOnPort } from 'node:worker_threads';
import { checkText, fragilityOf, plantReportsOf, prepareFragility, type AnalysisHelper, type FastCheck } from '../analyze';
import { riccatiConditionOf, type FragilityRequest, type RebuiltPlants, type RiccatiConditionRequest } from '../control/controllerDesign';
import type { FragilityResult } from '../control/fragility';
import type { PlantReport } from '../control/design';
import type { AnalysisSettings } from '../control/settings';
import { cloneable } from './slowAnalysis';
import { traceMark } from './trace';

/** Shared cells (an Int32Array of HELPER_CELLS entries over a SharedArrayBuffer), one set per link. */
export const ANSWERS_POSTED = 0;
export const HELPER_GONE = 1;
/** 1 while the helper computes for this link (the server stops a busy helper on cancellation). */
export const HELPER_BUSY = 2;
export const HELPER_CELLS = 3;

export type ToHelper =
  | { kind: 'start'; job: number; text: string; settings: Partial<AnalysisSettings> }
  | { kind: 'fragility'; job: number; controllerIndex: number; sequence: number; request: FragilityRequest }
  | { kind: 'condition'; job: number; controllerIndex: number; request: RiccatiConditionRequest };

export type FromHelper =
  | { kind: 'plants'; job: number; reports: PlantReport[] | null }
  | { kind: 'fragility'; job: number; controllerIndex: number; sequence: number; result: FragilityResult | null }
  | { kind: 'condition'; job: number; controllerIndex: number; value: number | null };

/**
 * The helper thread's side of one link: answers every request of the current job, in order.
 * Returns a function that ends the link (the server links each new worker afresh).
 */
export function serveAsHelper(port: MessagePort, cells: Int32Array, log: (message: string) => void): () => void {
  let current: { job: number; fast: FastCheck; prepared: RebuiltPlants[] } | null = null;
  const answer = (message: FromHelper): void => {
    try {
      port.postMessage(message);
    } catch {
      port.postMessage(cloneable(message)); // a report held something structured clone refuses
    }
    Atomics.add(cells, ANSWERS_POSTED, 1);
    Atomics.notify(cells, ANSWERS_POSTED);
  };
  const serve = (message: ToHelper): void => {
    traceMark(`helper: ${message.kind} request`);
    if (message.kind === 'start') {
      let reports: PlantReport[] | null = null;
      try {
        const fast = checkText(message.text);
        current = { job: message.job, fast, prepared: [] };
        reports = plantReportsOf(fast, message.settings);
      } catch (error) {
        log(`analysis helper: plant reports failed: ${error instanceof Error ? error.stack ?? error.message : String(error)}`);
      }
      traceMark('helper: plant reports done');
      answer({ kind: 'plants', job: message.job, reports });
      // Idle until the gains arrive: rebuild the plants the fragility studies will need.
      try {
        if (current?.job === message.job) current.prepared = prepareFragility(current.fast, message.settings);
      } catch (error) {
        log(`analysis helper: preparing fragility plants failed: ${error instanceof Error ? error.stack ?? error.message : String(error)}`);
      }
      traceMark('helper: fragility plants prepared');
      return;
    }
    if (message.kind === 'condition') {
      let value: number | null = null;
      try {
        value = riccatiConditionOf(message.request);
      } catch (error) {
        log(`analysis helper: condition estimate failed: ${error instanceof Error ? error.stack ?? error.message : String(error)}`);
      }
      traceMark('helper: condition estimate done');
      answer({ kind: 'condition', job: message.job, controllerIndex: message.controllerIndex, value });
      return;
    }
    let result: FragilityResult | null = null;
    try {
      if (current?.job === message.job) result = fragilityOf(current.fast, message.controllerIndex, message.request, current.prepared[message.controllerIndex]);
    } catch (error) {
      log(`analysis helper: fragility failed: ${error instanceof Error ? error.stack ?? error.message : String(error)}`);
    }
    traceMark('helper: fragility study done');
    answer({ kind: 'fragility', job: message.job, controllerIndex: message.controllerIndex, sequence: message.sequence, result });
  };
  port.on('message', (message: ToHelper) => {
    Atomics.store(cells, HELPER_BUSY, 1);
    try {
      serve(message);
    } finally {
      Atomics.store(cells, HELPER_BUSY, 0);
    }
  });
  return () => port.close();
}

/**
 * How long the coordinator waits for one answer before computing it itself. The helper does
 * no more work than the coordinator would, so this bound only matters if the helper is stuck.
 */
const PATIENCE_MS = 60_000;

/** The coordinator's side for one job: starts the helper on the text and waits for its answers. */
export function helperForJob(
  port: MessagePort,
  cells: Int32Array,
  job: number,
  text: string,
  settings: Partial<AnalysisSettings>,
): AnalysisHelper {
  const mailbox: FromHelper[] = [];
  const waitFor = <T extends FromHelper>(matches: (message: FromHelper) => message is T): T | null => {
    const deadline = Date.now() + PATIENCE_MS;
    for (;;) {
      const posted = Atomics.load(cells, ANSWERS_POSTED);
      for (let received = receiveMessageOnPort(port); received; received = receiveMessageOnPort(port)) {
        const message = received.message as FromHelper;
        if (message.job === job) mailbox.push(message); // answers to an abandoned job are dropped
      }
      const index = mailbox.findIndex(matches);
      if (index >= 0) return mailbox.splice(index, 1)[0] as T;
      if (Atomics.load(cells, HELPER_GONE) !== 0) return null;
      const left = deadline - Date.now();
      if (left <= 0) return null;
      Atomics.wait(cells, ANSWERS_POSTED, posted, Math.min(left, 1000));
    }
  };
  const send = (message: ToHelper): boolean => {
    if (Atomics.load(cells, HELPER_GONE) !== 0) return false;
    port.postMessage(message);
    return true;
  };
  // The helper starts on this job only when the coordinator asks (a document large enough for a
  // second thread to pay); a helper never begun is asked nothing.
  let started = false;
  let fragilityRequests = 0;
  return {
    begin: () => {
      if (!started) started = send({ kind: 'start', job, text, settings });
    },
    plantReports: () => {
      traceMark('coordinator: waits for the plant reports');
      if (!started) return null;
      return waitFor((message): message is Extract<FromHelper, { kind: 'plants' }> => message.kind === 'plants')?.reports ?? null;
    },
    startFragility: (controllerIndex, request) => {
      traceMark('coordinator: gains known, fragility handed over');
      // A controller's study may be asked for twice (a speculative early start, then the final
      // prescaler): each answer is matched to its own request.
      const sequence = fragilityRequests++;
      const sent = started && send({ kind: 'fragility', job, controllerIndex, sequence, request });
      return () => {
        traceMark('coordinator: waits for the fragility study');
        if (!sent) return null;
        const answer = waitFor(
          (message): message is Extract<FromHelper, { kind: 'fragility' }> =>
            message.kind === 'fragility' && message.controllerIndex === controllerIndex && message.sequence === sequence,
        );
        return answer?.result ?? null;
      };
    },
    startRiccatiCondition: (controllerIndex, request) => {
      const sent = started && send({ kind: 'condition', job, controllerIndex, request });
      return () => {
        if (!sent) return null;
        const answer = waitFor(
          (message): message is Extract<FromHelper, { kind: 'condition' }> => message.kind === 'condition' && message.controllerIndex === controllerIndex,
        );
        return answer?.value ?? null;
      };
    },
  };
}
