// `node test/fuzz/run.mjs --count 100000 --seed 1`: the full-size fuzz run of the whole pipeline
// (text → parse → check → analyse → JSON), bundled with esbuild like test/bench/run.mjs. Prints
// the figures docs/robustness.md records; exit code 1 when any invariant was broken.
import { build } from 'esbuild';
import { mkdtempSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { dirname, join } from 'node:path';
import { createRequire } from 'node:module';
import { fileURLToPath } from 'node:url';

const option = (name, fallback) => {
  const at = process.argv.indexOf(`--${name}`);
  return at >= 0 && process.argv[at + 1] !== undefined ? Number(process.argv[at + 1]) : fallback;
};
const count = option('count', 10000);
const seed = option('seed', 1);
// --from N: start at input N (a multiple of 100), to split one run over processes.
const from = option('from', 0);

const root = join(dirname(fileURLToPath(import.meta.url)), '..', '..');
const scratch = mkdtempSync(join(tmpdir(), 'loopwright-fuzz-'));
const bundle = join(scratch, 'harness.cjs');
await build({ absWorkingDir: root, entryPoints: ['test/fuzz/harness.ts'], bundle: true, platform: 'node', format: 'cjs', target: 'node20', outfile: bundle, logLevel: 'warning' });
const harness = createRequire(import.meta.url)(bundle);

function print(figures, write) {
  write(`Fuzz run: seed ${seed}, count ${count}${from ? `, inputs from ${from}` : ''}`);
  write(`  inputs                       ${figures.inputs} (${Object.entries(figures.byGenerator).map(([name, n]) => `${name} ${n}`).join(', ')})`);
  write(`  uncaught exceptions          ${figures.uncaughtExceptions}`);
  write(`  analyses over budget         ${figures.overBudget} (most iterations in one analysis: ${figures.maxIterations})`);
  write(`  NaN/Infinity in JSON         ${figures.nonFiniteInJson}`);
  write(`  diagnostics out of range     ${figures.outOfRange}`);
  write(`  silent non-convergence       ${figures.silentNonConvergence} (kernels that ran out of budget: ${figures.nonConvergedKernels})`);
  write(`  unexplained nulls            ${figures.unexplainedNulls}`);
  write(`  time                         ${(figures.milliseconds / 1000).toFixed(1)} s`);
}
let lastReport = 0;
const figures = harness.runFuzz(root, count, seed, (done, partial) => {
  if (done - lastReport >= 1000) {
    lastReport = done;
    print(partial, (line) => process.stderr.write(`${line}\n`));
  }
}, from);
const examplesFile = join(scratch, 'violations.json');
writeFileSync(examplesFile, JSON.stringify(figures.examples, null, 2));
print(figures, (line) => console.log(line));
const broken = figures.uncaughtExceptions + figures.overBudget + figures.nonFiniteInJson + figures.outOfRange + figures.silentNonConvergence + figures.unexplainedNulls;
if (broken) console.log(`  first violations written to ${examplesFile}`);
process.exit(broken ? 1 : 0);
