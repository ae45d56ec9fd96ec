// The two-thread analysis (lsp/analysisHelper.ts) gives exactly the one-thread result: first the
// split itself (plant reports and fragility studies computed from a separate parse, merged back
// in order), then the real threads (the bundled worker as coordinator and as helper, linked as
// the server links them), including a helper that is gone before the job starts.
import { readdirSync, readFileSync } from 'node:fs';
import { join } from 'node:path';
import { MessageChannel, Worker } from 'node:worker_threads';
import { afterAll, beforeAll, describe, expect, it, vi } from 'vitest';
import * as setpointModule from '../../server/src/control/setpoint';
import { analyzeFastCheck, checkText, fragilityOf, HELPER_FROM_STATES, plantReportsOf, prepareFragility, type AnalysisHelper } from '../../server/src/analyze';
import { riccatiConditionOf, type FragilityRequest } from '../../server/src/control/controllerDesign';
import { ANSWERS_POSTED, HELPER_BUSY, HELPER_CELLS, HELPER_GONE } from '../../server/src/lsp/analysisHelper';
import { cloneable, runSlowAnalysis, type AnalysisReply } from '../../server/src/lsp/slowAnalysis';
import { ensureBuilt, root } from './lspClient';

const samples = readdirSync(join(root, 'samples')).filter((name) => name.endsWith('.plant'));
const sampleText = (name: string) => readFileSync(join(root, 'samples', name), 'utf8');

describe('analysis split across a helper (same thread)', () => {
  it.each(samples)('%s: equals the single-thread analysis, and the helper answered', (sample) => {
    const text = sampleText(sample);
    const single = analyzeFastCheck(checkText(text));
    const helperParse = checkText(text); // the helper's own parse of the same text
    const prepared = prepareFragility(helperParse, {}); // as the helper does while it waits for gains
    let answered = 0;
    const helper: AnalysisHelper = {
      plantReports: () => {
        answered++;
        return plantReportsOf(helperParse, {});
      },
      startFragility: (controllerIndex, request) => {
        const result = fragilityOf(helperParse, controllerIndex, request, prepared[controllerIndex]);
        return () => {
          if (result) answered++;
          return result;
        };
      },
      startRiccatiCondition: (_, request) => {
        const value = riccatiConditionOf(structuredClone(request)); // as it crosses to the helper
        return () => {
          answered++;
          return value;
        };
      },
    };
    const split = analyzeFastCheck(checkText(text), {}, { helper, helperFromStates: 0 }); // every sample, however small
    expect(answered).toBeGreaterThan(0);
    expect(cloneable(split.diagnostics)).toEqual(cloneable(single.diagnostics));
    expect(cloneable(split.plants)).toEqual(cloneable(single.plants));
    expect(cloneable(split.controllers)).toEqual(cloneable(single.controllers));
  });

  it('the fragility study starts once, before the set-point rank decision, wherever the square prescaler is the one decided', () => {
    const events: string[] = [];
    const original = setpointModule.setpointGains;
    const setpointDecisions = vi.spyOn(setpointModule, 'setpointGains').mockImplementation((...args) => {
      events.push('set-point decided');
      return original(...args);
    });
    let speculated = 0;
    let zeroAtDc = 0;
    for (const sample of samples) {
      const text = sampleText(sample);
      const helperParse = checkText(text);
      const requests = new Map<number, number>();
      events.length = 0;
      const helper: AnalysisHelper = {
        plantReports: () => plantReportsOf(helperParse, {}),
        startFragility: (controllerIndex, request) => {
          events.push(`request ${controllerIndex}`);
          requests.set(controllerIndex, (requests.get(controllerIndex) ?? 0) + 1);
          const result = fragilityOf(helperParse, controllerIndex, request);
          return () => result;
        },
      };
      const split = analyzeFastCheck(checkText(text), {}, { helper, helperFromStates: 0 });
      split.controllers.forEach((controller, index) => {
        // Square set-point equations of full rank: one request, made early and kept.
        if (controller.details.setpointFeasibility === 'unique' && controller.prescaler && controller.Ki === null) {
          expect(requests.get(index)).toBe(1);
          // Requested before the set-point analysis decided the rank: the next event is that decision.
          expect(events[events.indexOf(`request ${index}`) + 1]).toBe('set-point decided');
          speculated++;
        }
        // A zero at s = 0 (no prescaler): no study is started, not even a speculative one.
        if (controller.details.setpointFeasibility === 'zero-at-dc') {
          expect(requests.get(index)).toBeUndefined();
          zeroAtDc++;
        }
        expect(requests.get(index) ?? 0).toBeLessThanOrEqual(2);
      });
    }
    expect(speculated).toBeGreaterThan(2);
    expect(zeroAtDc).toBeGreaterThan(0);
    setpointDecisions.mockRestore();
  });

  it('plants rebuilt ahead of the gains are exactly the ones the fragility study needs', () => {
    const fast = checkText(sampleText('dosing-tank.plant'));
    const requests: { controllerIndex: number; request: FragilityRequest }[] = [];
    analyzeFastCheck(checkText(sampleText('dosing-tank.plant')), {}, {
      helper: { plantReports: () => null, startFragility: (controllerIndex, request) => (requests.push({ controllerIndex, request }), () => null) },
      helperFromStates: 0,
    });
    expect(requests.length).toBeGreaterThan(0);
    const prepared = prepareFragility(fast, {});
    for (const { controllerIndex, request } of requests) {
      const ahead = prepared[controllerIndex];
      const points = ahead.size;
      // every distinct point: the nominal plant, each parameter at ±p %, the box vertices
      const k = request.nominal.length;
      expect(points).toBeGreaterThanOrEqual(1 + 2 ** k);
      expect(points).toBeLessThanOrEqual(1 + 2 * k + 2 ** k);
      const withPrepared = fragilityOf(fast, controllerIndex, request, ahead);
      expect(ahead.size).toBe(points); // the study rebuilt nothing the helper had not prepared
      expect(cloneable(withPrepared)).toEqual(cloneable(fragilityOf(checkText(sampleText('dosing-tank.plant')), controllerIndex, request)));
    }
  });

  it('the helper is begun only for documents large enough to pay for it', () => {
    const rod = (n: number) => {
      const states = Array.from({ length: n }, (_, i) => `T${i + 1}`);
      const A = states.map((_, i) => states.map((__, j) => (i === j ? '-1' : Math.abs(i - j) === 1 ? '0.5' : '0')).join(', ')).join('; ');
      return `plant rod {\n  states ${states.join(', ')}\n  inputs q\n  outputs y\n  A = [${A}]\n  B = [${states.map((_, i) => (i ? '0' : '1')).join('; ')}]\n  C = [${states.map((_, i) => (i === n - 1 ? '1' : '0')).join(', ')}]\n}\n`;
    };
    const counted = () => {
      const calls = { begun: 0, asked: 0 };
      const helper: AnalysisHelper = {
        begin: () => void calls.begun++,
        plantReports: () => (calls.asked++, null),
        startFragility: () => () => null,
      };
      return { calls, helper };
    };
    const small = counted();
    analyzeFastCheck(checkText(sampleText('hoist.plant')), {}, { helper: small.helper });
    expect(small.calls).toEqual({ begun: 0, asked: 0 });
    const large = counted();
    analyzeFastCheck(checkText(rod(HELPER_FROM_STATES)), {}, { helper: large.helper });
    expect(large.calls).toEqual({ begun: 1, asked: 1 });
    const below = counted();
    analyzeFastCheck(checkText(rod(HELPER_FROM_STATES - 1)), {}, { helper: below.helper });
    expect(below.calls).toEqual({ begun: 0, asked: 0 });
  });

  it('the helper analyses nothing beyond maxLiveStates, as the coordinator does not', () => {
    const fast = checkText(sampleText('hoist.plant'));
    const states = Math.max(...fast.model.plants.map((plant) => plant.states.length));
    expect(plantReportsOf(fast, { maxLiveStates: states - 1 })).toBeNull();
    expect(plantReportsOf(fast, { maxLiveStates: states })).toHaveLength(fast.model.plants.length);
    expect(analyzeFastCheck(fast, { maxLiveStates: states - 1 }).skipped?.reason).toBe('too-large');
  });

  it('a helper that cannot answer (null) leaves the work to the coordinator', () => {
    const text = sampleText('dosing-tank.plant');
    const single = analyzeFastCheck(checkText(text));
    const silent: AnalysisHelper = { plantReports: () => null, startFragility: () => () => null };
    const split = analyzeFastCheck(checkText(text), {}, { helper: silent, helperFromStates: 0 });
    expect(cloneable(split.diagnostics)).toEqual(cloneable(single.diagnostics));
    expect(cloneable(split.controllers)).toEqual(cloneable(single.controllers));
    expect(split.diagnostics.map((d) => d.code)).toContain('control/fragile-prescaler');
  });
});

describe('analysis helper thread', () => {
  const workerPath = join(root, 'dist', 'worker.cjs');
  let coordinator: Worker;
  let helper: Worker;
  let cells: Int32Array;
  let nextJob = 1;

  // As the server does: a fresh channel and fresh cells for every (new) coordinator.
  const linkNewCoordinator = () => {
    // The samples are small: the coordinator is told to use the helper for them all the same.
    coordinator = new Worker(workerPath, { env: { ...process.env, LOOPWRIGHT_HELPER_FROM_STATES: '0' } });
    const channel = new MessageChannel();
    const shared = new SharedArrayBuffer(HELPER_CELLS * 4);
    cells = new Int32Array(shared);
    helper.postMessage({ kind: 'link', port: channel.port2, cells: shared }, [channel.port2]);
    coordinator.postMessage({ kind: 'link', port: channel.port1, cells: shared }, [channel.port1]);
  };

  beforeAll(() => {
    ensureBuilt();
    helper = new Worker(workerPath, { workerData: { role: 'helper' } });
    linkNewCoordinator();
  });

  afterAll(async () => {
    await coordinator?.terminate();
    await helper?.terminate();
  });

  const analyseInThreads = (text: string): Promise<AnalysisReply> =>
    new Promise((resolve) => {
      const job = nextJob++;
      const listener = (reply: AnalysisReply) => {
        if (reply.job !== job) return;
        coordinator.off('message', listener);
        resolve(reply);
      };
      coordinator.on('message', listener);
      coordinator.postMessage({ job, uri: 'file:///x.plant', version: 1, text, settings: {} });
    });

  it.each(samples)('%s: the linked threads return the in-process result', async (sample) => {
    const text = sampleText(sample);
    const posted = Atomics.load(cells, ANSWERS_POSTED);
    const reply = await analyseInThreads(text);
    expect('result' in reply, 'error' in reply ? reply.error : '').toBe(true);
    if (!('result' in reply)) return;
    // The helper answered this job (plant reports at least), and the answers were used unchanged.
    expect(Atomics.load(cells, ANSWERS_POSTED)).toBeGreaterThan(posted);
    const local = cloneable(runSlowAnalysis(text, {}));
    expect(cloneable(reply.result.diagnostics)).toEqual(local.diagnostics);
    expect(cloneable(reply.result.plants)).toEqual(local.plants);
    expect(cloneable(reply.result.controllers)).toEqual(local.controllers);
  });

  it('an idle helper kept after its coordinator is stopped serves the next one (a cancelled edit)', async () => {
    await coordinator.terminate();
    expect(Atomics.load(cells, HELPER_BUSY)).toBe(0);
    linkNewCoordinator();
    const text = sampleText('conveyor.plant');
    const reply = await analyseInThreads(text);
    expect('result' in reply).toBe(true);
    if (!('result' in reply)) return;
    expect(Atomics.load(cells, ANSWERS_POSTED)).toBeGreaterThan(0);
    expect(cloneable(reply.result.controllers)).toEqual(cloneable(runSlowAnalysis(text, {}).controllers));
  });

  it('when the helper is gone the coordinator does its work and answers the same', async () => {
    await helper.terminate();
    Atomics.store(cells, HELPER_GONE, 1); // what the server does on the helper's exit
    Atomics.notify(cells, ANSWERS_POSTED);
    const text = sampleText('dosing-tank.plant');
    const reply = await analyseInThreads(text);
    expect('result' in reply).toBe(true);
    if (!('result' in reply)) return;
    expect(cloneable(reply.result.diagnostics)).toEqual(cloneable(runSlowAnalysis(text, {}).diagnostics));
  });
});
