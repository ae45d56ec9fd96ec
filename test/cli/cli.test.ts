// The command-line tool end to end: exit codes, human and JSON output, every sample, recovery.
import { readdirSync, readFileSync } from 'node:fs';
import { join } from 'node:path';
import { describe, expect, it } from 'vitest';
import { checkJson, root, runCli } from './run';

const samples = readdirSync(join(root, 'samples')).filter((name) => name.endsWith('.plant'));
/** Samples written to show an error finding (documented in their header comments). */
const samplesWithErrors: Record<string, string> = {
  'isolation-table.plant': 'control/zero-dc-gain',
  'twin-lamp-oven.plant': 'control/placement-impossible',
};

describe('loopwright check', () => {
  it('prints the hoist design report and exits 0', () => {
    const result = runCli(['check', 'samples/hoist.plant']);
    expect(result.status).toBe(0);
    expect(result.stdout).toContain('plant hoist — matrix form, 2 states, 1 input, 1 output');
    expect(result.stdout).toMatch(/open-loop poles: -0\.33333, 0/);
    expect(result.stdout).toMatch(/K = \[3\.75, 1\.15\]/);
    expect(result.stdout).toContain('Caution: Results hold for the linear model only');
    expect(result.stderr).toBe('');
  });

  it('reports the hoist eigenvalues 0 and -b/J in JSON with the documented keys', () => {
    const json = checkJson('samples/hoist.plant');
    expect(json.status).toBe(0);
    const file = json.files[0];
    expect(file.path).toBe('samples/hoist.plant');
    const plant = file.plants[0];
    expect(plant).toMatchObject({ name: 'hoist', states: ['theta', 'omega'], inputs: ['current'], outputs: ['height'] });
    for (const key of ['A', 'B', 'C', 'D', 'eigenvalues', 'controllable', 'observable']) expect(plant).toHaveProperty(key);
    const bOverJ = 0.004 / 0.012; // the sample's parameters b and J
    // Sorted by real part: −b/J first, then the free integrator of the drum angle.
    expect(plant.eigenvalues[0].re).toBeCloseTo(-bOverJ, 12);
    expect(plant.eigenvalues[1].re).toBeCloseTo(0, 12);
    expect(plant.eigenvalues.every((e: { im: number }) => e.im === 0)).toBe(true);
    expect(plant.controllable).toBe(true);
    expect(plant.observable).toBe(true);
    const controller = file.controllers[0];
    for (const key of ['name', 'plant', 'K', 'closedLoopPoles', 'dcGain', 'prescaler']) expect(controller).toHaveProperty(key);
    // Hand computation (characteristic polynomial s² + (b/J + kt/J·k2)s + kt/J·k1 = s² + 8s + 25):
    // k1 = 25·J/kt = 3.75, k2 = (8 − b/J)·J/kt = 1.15; DC gain r·kt/J/25 = 0.013333…, prescaler 75.
    expect(controller.K[0][0]).toBeCloseTo(3.75, 10);
    expect(controller.K[0][1]).toBeCloseTo(1.15, 10);
    expect(controller.dcGain[0][0]).toBeCloseTo(0.05 * (0.08 / 0.012) / 25, 12);
    expect(controller.prescaler[0][0]).toBeCloseTo(75, 9);
    const diagnostic = file.diagnostics[0];
    expect(Object.keys(diagnostic)).toEqual(expect.arrayContaining(['severity', 'code', 'message', 'range']));
    expect(diagnostic.range.start).toHaveProperty('character');
  });

  it.each(samples)('analyses %s with no NaN or infinity in its JSON', (sample) => {
    const result = runCli(['check', '--json', `samples/${sample}`]);
    expect(result.stderr).toBe('');
    expect(result.stdout).not.toMatch(/NaN|Infinity/);
    const json = JSON.parse(result.stdout);
    const file = json.files[0];
    const expectedError = samplesWithErrors[sample];
    if (expectedError) {
      expect(result.status).toBe(1);
      expect(file.diagnostics.map((d: { code: string }) => d.code)).toContain(expectedError);
    } else {
      expect(result.status).toBe(0);
      expect(file.diagnostics.filter((d: { severity: string }) => d.severity === 'error')).toEqual([]);
      for (const controller of file.controllers) expect(controller.K).not.toBeNull();
    }
    for (const plant of file.plants) expect(plant.eigenvalues.length).toBe(plant.states.length);
    // The header comment says what the sample shows.
    expect(readFileSync(join(root, 'samples', sample), 'utf8').split('\n')[0]).toMatch(/^# \S/);
  });

  it('finds at least 20 errors on the right lines and still analyses the valid plant after them', () => {
    const path = 'test/fixtures/cli/twenty-errors.plant';
    const result = runCli(['check', path]);
    expect(result.status).toBe(1);
    const errorLines = new Set(
      result.stdout
        .split('\n')
        .map((line) => /:(\d+):\d+ error /.exec(line))
        .filter((match): match is RegExpExecArray => match !== null)
        .map((match) => Number(match[1])),
    );
    // Lines 3–22 each hold one deliberate mistake; 25–26 hold two more in a controller.
    for (let line = 3; line <= 22; line++) expect(errorLines, `line ${line}`).toContain(line);
    expect(errorLines).toContain(25);
    expect(errorLines).toContain(26);
    const json = checkJson(path);
    const trolley = json.files[0].plants.find((plant: { name: string }) => plant.name === 'trolley');
    expect(trolley.eigenvalues.map((e: { re: number }) => e.re)).toEqual([expect.closeTo(-0.8 / 2.5, 12), expect.closeTo(0, 12)]);
    expect(trolley.controllable).toBe(true);
  });

  it('reads standard input with -', () => {
    const text = readFileSync(join(root, 'samples/hoist.plant'), 'utf8');
    const result = runCli(['check', '-'], text);
    expect(result.status).toBe(0);
    expect(result.stdout).toContain('<stdin>: 0 errors');
  });

  it('exits 2 on usage and I/O errors without a stack trace', () => {
    for (const args of [[], ['check'], ['check', '--bogus', 'x.plant'], ['frobnicate'], ['check', 'no/such/file.plant'], ['export', 'samples/hoist.plant']]) {
      const result = runCli(args);
      expect(result.status, args.join(' ')).toBe(2);
      expect(result.stderr).toMatch(/^loopwright: /);
      expect(result.stderr).not.toMatch(/\n\s+at /);
    }
  });

  it('prints diagnostics as file:line:col severity code message, 1-based', () => {
    const result = runCli(['check', 'samples/isolation-table.plant']);
    const line = result.stdout.split('\n').find((entry) => entry.includes('control/zero-dc-gain')) ?? '';
    const text = readFileSync(join(root, 'samples/isolation-table.plant'), 'utf8').split('\n');
    const match = /^samples\/isolation-table\.plant:(\d+):(\d+) error control\/zero-dc-gain the plant has an invariant zero at s = 0/.exec(line);
    expect(match).not.toBeNull();
    const [lineNumber, column] = [Number(match![1]), Number(match![2])];
    expect(text[lineNumber - 1].slice(column - 1)).toMatch(/^track accel/);
  });
});
