// Resource limits: the largest model analysed live (settings.maxLiveStates), the iteration tally
// every bounded kernel feeds (server/src/numeric/iterationCount.ts) and its documented budget,
// and forced non-convergence through the kernels' own options.
import { describe, expect, it } from 'vitest';
import { readFileSync, readdirSync } from 'node:fs';
import { join } from 'node:path';
import { analyze } from '../../server/src/analyze';
import { documentJson } from '../../server/src/render/json';
import { realSchur } from '../../server/src/numeric/schur';
import { documentIterationBudget, iterationTally, resetIterationTally } from '../../server/src/numeric/iterationCount';
import { runCli } from '../cli/run';

const root = join(__dirname, '..', '..');
const sample = (name: string) => readFileSync(join(root, 'samples', name), 'utf8');

/** An equation-form chain of `n` first-order lags: a big model in a few lines of text. */
function chain(n: number): string {
  const lines = Array.from({ length: n }, (_, i) => `  x${i + 1}' = -x${i + 1}${i === 0 ? ' + u' : ` + x${i}`}`);
  return `plant long {\n  states ${Array.from({ length: n }, (_, i) => `x${i + 1}`).join(', ')}\n  inputs u\n  outputs y\n${lines.join('\n')}\n  output y = x${n}\n}\ncontroller c for long {\n  lqr Q = identity(${n}), R = [1]\n}\n`;
}

describe('model size limit for live analysis (maxLiveStates)', () => {
  it('a plant above the limit: slow analyses skipped with reason too-large and a detail naming the setting', () => {
    const analysis = analyze(sample('hoist.plant'), { maxLiveStates: 1 });
    expect(analysis.skipped?.reason).toBe('too-large');
    expect(analysis.skipped?.detail).toContain('2 states');
    expect(analysis.skipped?.detail).toContain('maxLiveStates');
    expect(analysis.plants).toEqual([]);
    expect(analysis.controllers).toEqual([]);
    const json = documentJson([{ path: 'hoist.plant', analysis }], 'test') as any;
    expect(json.files[0].skipped.reason).toBe('too-large');
    expect(json.files[0].plants[0].skipped.reason).toBe('too-large');
    expect(json.files[0].plants[0].eigenvalues).toBeNull();
    expect(json.files[0].controllers[0].K).toBeNull();
    expect(json.files[0].controllers[0].skipped.detail).toContain('limited to 1');
    // The same document at the default limit is analysed.
    expect(analyze(sample('hoist.plant')).skipped).toBeUndefined();
  });

  it('the CLI says it skipped a 201-state model and why (default limit 200), in JSON and in text', () => {
    const text = chain(201);
    const json = runCli(['check', '--json', '-'], text);
    const parsed = JSON.parse(json.stdout);
    expect(parsed.files[0].skipped).toEqual({ reason: 'too-large', detail: expect.stringContaining('201 states') });
    expect(parsed.files[0].controllers[0].K).toBeNull();
    const plain = runCli(['check', '-'], text);
    expect(plain.stdout).toContain('limited to 200');
  });
});

describe('bounded iterations', () => {
  it('every sample is analysed within the documented iteration budget, and the tally counts real work', () => {
    for (const name of readdirSync(join(root, 'samples')).filter((file) => file.endsWith('.plant'))) {
      resetIterationTally();
      const analysis = analyze(sample(name), { simulationPoints: 200 });
      const tally = iterationTally();
      const largest = Math.max(...analysis.model.plants.map((plant) => plant.states.length));
      const budget = documentIterationBudget(largest, analysis.model.plants.length + analysis.model.controllers.length);
      expect(tally.iterations, name).toBeGreaterThan(0);
      expect(tally.iterations, name).toBeLessThanOrEqual(budget);
    }
  });

  it('a QR iteration stopped by its sweep budget says converged: false and is tallied as non-converged', () => {
    // A 6×6 companion-like matrix with complex eigenvalues cannot deflate in one sweep.
    const A = [
      [0, 1, 0, 0, 0, 0],
      [0, 0, 1, 0, 0, 0],
      [0, 0, 0, 1, 0, 0],
      [0, 0, 0, 0, 1, 0],
      [0, 0, 0, 0, 0, 1],
      [-1, 0.3, -2, 0.5, -1, 0.2],
    ];
    resetIterationTally();
    const stopped = realSchur(A, { maxSweeps: 1 });
    expect(stopped.converged).toBe(false);
    expect(iterationTally().nonConvergedBy['schur-qr']).toBe(1);
    expect(iterationTally().iterations).toBe(1);
    resetIterationTally();
    const full = realSchur(A);
    expect(full.converged).toBe(true);
    expect(iterationTally().nonConverged).toBe(0);
    expect(iterationTally().iterations).toBeLessThanOrEqual(30 * 10);
  });

  it('the placement sweep budget (settings.iterationBudget) bounds the KNV sweeps; poles are still exact after one sweep', () => {
    const furnace = sample('two-zone-furnace.plant');
    resetIterationTally();
    const small = analyze(furnace, { iterationBudget: 0.02 }); // ⌈50 · 0.02⌉ = 1 sweep per placement
    const smallIterations = iterationTally().iterations;
    resetIterationTally();
    const normal = analyze(furnace);
    const normalIterations = iterationTally().iterations;
    expect(smallIterations).toBeLessThanOrEqual(normalIterations);
    const requested = small.controllers[0].closedLoopPoles;
    const reference = normal.controllers[0].closedLoopPoles;
    expect(requested.length).toBe(reference.length);
    requested.forEach((pole, i) => expect(Math.hypot(pole.re - reference[i].re, pole.im - reference[i].im)).toBeLessThan(1e-8 * Math.max(1, Math.hypot(pole.re, pole.im))));
  });
});
