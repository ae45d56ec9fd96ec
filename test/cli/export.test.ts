// Gain export for controller code: the C header compiles cleanly with every symbol used, a C
// program running it against the sampled plant reproduces Loopwright's simulated closed-loop
// response, and the JSON export reads back to the same gains. The reference for the response is
// the tool's own exact discrete simulation; the C side is an independent implementation of the
// documented control law, compiled by the system C compiler.
import { execFileSync, spawnSync } from 'node:child_process';
import { mkdtempSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { describe, expect, it } from 'vitest';
import { checkJson, root, runCli } from './run';

const cases = [
  { file: 'samples/maglev-rig.plant', prefix: 'hover', note: 'linearised plant, current-form estimator, prescaler' },
  { file: 'test/fixtures/cli/sampled-integral.plant', prefix: 'fill_sampled', note: 'integral action, predictor estimator' },
];

function cProgram(prefix: string, exported: any, steps: number, setpoint: number): string {
  const upper = prefix.toUpperCase();
  const n = exported.states.length;
  const m = exported.inputs.length;
  const p = exported.outputs.length;
  const uses = ['K', 'x0', ...(exported.Ki ? ['Ki'] : []), ...(exported.N ? ['N', 'Nx', 'Nu'] : []), ...(exported.observer ? ['L', 'C', 'D', 'Phi', 'Gamma'] : [])];
  const checksum = uses
    .map((name) => `  { const ${prefix}_real *v = (const ${prefix}_real *)${prefix}_${name}; for (unsigned i = 0; i < sizeof ${prefix}_${name} / sizeof v[0]; i++) checksum += v[i]; }`)
    .join('\n');
  return `#include <stdio.h>
#include "controller.h"

int main(void) {
  ${prefix}_state state;
  ${prefix}_real x[${n}] = {0}, next[${n}], u[${m}], y[${p}], r[${Math.max(1, exported.trackedOutputs.length)}];
  double checksum = ${upper}_STATES + ${upper}_INPUTS + ${upper}_OUTPUTS + ${upper}_TRACKED + ${upper}_INTEGRATORS + ${upper}_HAS_ESTIMATOR + ${upper}_SAMPLE_PERIOD;
${checksum}
  ${prefix}_reset(&state);
  r[0] = ${setpoint};
  for (int k = 0; k < ${steps}; k++) {
    /* The plant: the exported zero-order-hold model in deviation variables (D = 0 here). */
    for (int i = 0; i < ${p}; i++) { y[i] = ${prefix}_y0[i]; for (int j = 0; j < ${n}; j++) y[i] += ${prefix}_C[i][j] * x[j]; }
    ${prefix}_step(&state, r, y, u);
    printf("%.17g\\n", y[0]);
    for (int i = 0; i < ${n}; i++) {
      next[i] = 0;
      for (int j = 0; j < ${n}; j++) next[i] += ${prefix}_Phi[i][j] * x[j];
      for (int j = 0; j < ${m}; j++) next[i] += ${prefix}_Gamma[i][j] * (u[j] - ${prefix}_u0[j]);
    }
    for (int i = 0; i < ${n}; i++) x[i] = next[i];
  }
  fprintf(stderr, "%g\\n", checksum);
  return 0;
}
`;
}

describe('loopwright export', () => {
  it.each(cases)('C header for $file ($note) compiles with -Wall -Wextra -Werror and reproduces the response', ({ file, prefix }) => {
    const dir = mkdtempSync(join(tmpdir(), 'loopwright-export-'));
    const header = runCli(['export', file, '--format', 'c', '-o', join(dir, 'controller.h')]);
    expect(header.status).toBe(0);
    const exported = JSON.parse(runCli(['export', file, '--format', 'json']).stdout);
    const analysis = checkJson(file, ['--series']);
    const controller = analysis.files[0].controllers[0];
    const response = controller.step[0];
    const setpoint = response.metrics.setpoint;
    const steps = 30;
    writeFileSync(join(dir, 'main.c'), cProgram(prefix, exported, steps, setpoint));
    // Every symbol in the header is used, so -Wall -Wextra -Werror also proves nothing is left dangling.
    execFileSync('cc', ['-std=c99', '-c', '-Wall', '-Wextra', '-Werror', '-o', join(dir, 'main.o'), join(dir, 'main.c')], { cwd: dir });
    execFileSync('cc', ['-o', join(dir, 'main'), join(dir, 'main.o')], { cwd: dir });
    const run = spawnSync(join(dir, 'main'), { encoding: 'utf8' });
    expect(run.status).toBe(0);
    const fromC = run.stdout.trim().split('\n').map(Number);
    const T = exported.samplePeriod;
    const output = response.outputs.find((trace: { name: string }) => trace.name === response.steppedOutput).values;
    const scale = Math.abs(setpoint - exported.y0[0]);
    let compared = 0;
    response.time.forEach((time: number, index: number) => {
      const k = Math.round(time / T);
      if (k >= steps || Math.abs(time - k * T) > 1e-9 * T) return;
      expect(Math.abs(fromC[k] - output[index]), `sample ${k}`).toBeLessThanOrEqual(1e-6 * scale);
      compared++;
    });
    expect(compared).toBeGreaterThan(10);
  });

  it('writes JSON that reads back to the same gains as the analysis', () => {
    const file = 'test/fixtures/cli/sampled-integral.plant';
    const exported = JSON.parse(runCli(['export', file, '--format', 'json']).stdout);
    const controller = checkJson(file).files[0].controllers[0];
    expect(exported.K).toEqual(controller.K);
    expect(exported.Ki).toEqual(controller.Ki);
    expect(exported.N).toEqual(controller.prescaler);
    expect(exported.controlLaw).toContain('u = u0 - K (xhat - x0) - Ki xi + N (r - y0)');
    expect(exported.estimator).toMatch(/^predictor form/);
    expect(exported.sourceSha256).toMatch(/^[0-9a-f]{64}$/);
  });

  it('refuses a controller without a valid design, and an unknown controller name', () => {
    expect(runCli(['export', 'samples/isolation-table.plant', '--format', 'c']).status).toBe(1);
    const unknown = runCli(['export', 'samples/hoist.plant', '--format', 'c', '--controller', 'nosuch']);
    expect(unknown.status).toBe(2);
    expect(unknown.stderr).toContain("no controller 'nosuch'");
  });
});
