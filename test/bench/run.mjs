// `npm run bench`: prints median times of each analysis for n = 10, 50, 100, 200 and, where
// Python with SciPy is present, the same computations in SciPy measured in the same run, with
// the ratio. Figures only; nothing here asserts a time (machines are shared and noisy).
import { build } from 'esbuild';
import { spawnSync } from 'node:child_process';
import { mkdtempSync, writeFileSync, existsSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { dirname, join } from 'node:path';
import { createRequire } from 'node:module';
import { fileURLToPath } from 'node:url';

const root = join(dirname(fileURLToPath(import.meta.url)), '..', '..');
const scratch = mkdtempSync(join(tmpdir(), 'loopwright-bench-'));
const bundle = join(scratch, 'kernels.cjs');
await build({ absWorkingDir: root, entryPoints: ['test/bench/kernels.ts'], bundle: true, platform: 'node', format: 'cjs', target: 'node20', outfile: bundle, logLevel: 'warning' });
const kernels = createRequire(import.meta.url)(bundle);

// Seeded generator (mulberry32) so both sides see the same matrices.
function generator(seed) {
  let state = seed >>> 0;
  return () => {
    state = (state + 0x6d2b79f5) >>> 0;
    let t = state;
    t = Math.imul(t ^ (t >>> 15), t | 1);
    t ^= t + Math.imul(t ^ (t >>> 7), t | 61);
    return ((t ^ (t >>> 14)) >>> 0) / 4294967296;
  };
}
const randomMatrix = (random, rows, cols, scale = 1) =>
  Array.from({ length: rows }, () => Array.from({ length: cols }, () => (2 * random() - 1) * scale));

function median(samples) {
  const sorted = [...samples].sort((a, b) => a - b);
  const middle = sorted.length >> 1;
  return sorted.length % 2 ? sorted[middle] : (sorted[middle - 1] + sorted[middle]) / 2;
}
// Process CPU time (user + system) per call: on a shared, loaded machine wall-clock time also
// counts the time this process waited for a core, which says nothing about the code.
// Every timed call computes afresh: the eigenvalue memo (numeric/eigenvectors.ts) would otherwise
// answer the repeated calls on the same matrix.
function medianMs(fn, repeats) {
  fn();
  const samples = [];
  for (let i = 0; i < repeats; i++) {
    kernels.forgetRecentEigenvalues();
    const start = process.cpuUsage();
    fn();
    const used = process.cpuUsage(start);
    samples.push((used.user + used.system) / 1000);
  }
  return median(samples);
}
const repeatsFor = (n) => (n <= 10 ? 50 : n <= 50 ? 15 : n <= 100 ? 7 : 3);

// ---------------------------------------------------------------- parse and check (issue target: 200 states < 50 ms)
function matrixFormModel(n, random) {
  const names = Array.from({ length: n }, (_, i) => `x${i + 1}`);
  const rows = (r, c) => randomMatrix(random, r, c).map((row) => row.map((v) => v.toFixed(6)).join(', ')).join(';\n    ');
  return `plant big {\n  states ${names.join(', ')}\n  inputs u1, u2\n  outputs y1\n  A = [${rows(n, n)}]\n  B = [${rows(n, 2)}]\n  C = [${rows(1, n)}]\n}\n`;
}
console.log('Parse + check of a matrix-form plant (text → checked model), median CPU ms');
for (const n of [10, 50, 100, 200]) {
  const text = matrixFormModel(n, generator(n));
  const ms = medianMs(() => kernels.checkText(text), n === 200 ? 21 : 31);
  console.log(`  n = ${String(n).padStart(3)}: ${ms.toFixed(2)} ms  (${(text.length / 1024).toFixed(0)} KiB of text)`);
}

// ---------------------------------------------------------------- analyses vs SciPy
const cases = [];
for (const n of [10, 50, 100, 200]) {
  const random = generator(1000 + n);
  const m = Math.max(1, Math.round(n / 10));
  const A = randomMatrix(random, n, n, 1 / Math.sqrt(n));
  const B = randomMatrix(random, n, m);
  const Ad = A.map((row) => row.map((v) => 0.5 * v)); // spectral radius below 1 for the discrete case
  const poles = Array.from({ length: n }, (_, i) => -1 - (99 * i) / Math.max(1, n - 1));
  const repeats = repeatsFor(n);
  cases.push({ kind: 'eigenvalues', name: `eigenvalues n=${n}`, n, A, B, repeats });
  cases.push({ kind: 'svd', name: `singular values n=${n}`, n, A, B, repeats });
  cases.push({ kind: 'expm', name: `matrix exponential n=${n}`, n, A, B, repeats });
  cases.push({ kind: 'care', name: `continuous Riccati n=${n} m=${m}`, n, A, B, repeats });
  cases.push({ kind: 'dare', name: `discrete Riccati n=${n} m=${m}`, n, A: Ad, B, repeats });
  cases.push({ kind: 'placement', name: `robust placement n=${n} m=${m}`, n, A, B, poles, repeats: Math.min(repeats, 5), skipScipy: n > 60 });
}

function runOurs(testCase) {
  const { A, B, n } = testCase;
  const eye = (k) => Array.from({ length: k }, (_, i) => Array.from({ length: k }, (_, j) => (i === j ? 1 : 0)));
  const Q = eye(n), R = eye(B[0].length);
  switch (testCase.kind) {
    case 'eigenvalues': return medianMs(() => kernels.eigenvalues(A), testCase.repeats);
    case 'svd': return medianMs(() => kernels.singularValues(A), testCase.repeats);
    case 'expm': return medianMs(() => kernels.matrixExponential(A), testCase.repeats);
    case 'care': return medianMs(() => kernels.solveContinuousRiccati(A, B, Q, R), testCase.repeats);
    case 'dare': return medianMs(() => kernels.solveDiscreteRiccati(A, B, Q, R), testCase.repeats);
    case 'placement': {
      const poles = testCase.poles.map((re) => ({ re, im: 0 }));
      const settings = kernels.resolveSettings();
      return medianMs(() => kernels.placePoles(A, B, poles, settings), testCase.repeats);
    }
  }
  return NaN;
}

let scipy = {};
const python = spawnSync('python3', ['-c', 'import scipy, numpy; print(scipy.__version__, numpy.__version__)'], { encoding: 'utf8' });
if (python.status === 0) {
  const casesFile = join(scratch, 'cases.json');
  writeFileSync(casesFile, JSON.stringify(cases));
  // One BLAS thread, like Loopwright's single-threaded kernels; the OpenBLAS core-type overrides
  // some machines set for old OpenBLAS builds slow a current NumPy, so they are dropped here only.
  const env = { ...process.env, OPENBLAS_NUM_THREADS: '1', OMP_NUM_THREADS: '1', MKL_NUM_THREADS: '1' };
  delete env.OPENBLAS_CORETYPE;
  delete env.OPENBLAS_L2_SIZE;
  const run = spawnSync('python3', [join(root, 'test/bench/scipy_bench.py'), casesFile], { encoding: 'utf8', maxBuffer: 1 << 26, env });
  if (run.status === 0) {
    scipy = JSON.parse(run.stdout);
    console.log(`(SciPy side: ${scipy._blas.join('; ')})`);
  }
  else console.log(`(SciPy timing failed: ${run.stderr.split('\n').slice(-3).join(' ')})`);
  console.log(`\nAnalyses, median ms — Loopwright vs SciPy ${python.stdout.trim().replace(' ', ' / NumPy ')} in the same run (CPU ms per call on both sides)`);
} else {
  console.log('\nAnalyses, median CPU ms (Python with SciPy not found: no side-by-side figures)');
}
console.log(`  ${'analysis'.padEnd(36)} ${'loopwright'.padStart(11)} ${'scipy'.padStart(10)} ${'ratio'.padStart(7)}`);
for (const testCase of cases) {
  let ours;
  try {
    ours = runOurs(testCase);
  } catch (error) {
    console.log(`  ${testCase.name.padEnd(36)} failed: ${error.message}`);
    continue;
  }
  const theirs = scipy[testCase.name];
  const ratio = typeof theirs === 'number' && theirs > 0 ? `${(ours / theirs).toFixed(2)}×` : '—';
  const theirsText = typeof theirs === 'number' ? theirs.toFixed(2) : testCase.skipScipy ? 'skipped' : '—';
  console.log(`  ${testCase.name.padEnd(36)} ${ours.toFixed(2).padStart(11)} ${theirsText.padStart(10)} ${ratio.padStart(7)}`);
}
console.log('  (ratio > 1: Loopwright slower. SciPy placement is skipped above n = 60, where it takes seconds.)');

// ---------------------------------------------------------------- the engine's analyses one by one
// Each analysis of a controller design on the same random plants (stabilised by LQR first), so
// every analysis the engine runs has a figure per size. No SciPy counterpart for most of them.
console.log('\nEngine analyses on the same plants, median CPU ms');
const analysisNames = ['modes', 'controllability (staircase + PBH margin)', 'invariant zeros', 'set-point gains', 'LQR design', 'zero-order hold', 'step response (linear)', 'loop margins'];
console.log(`  ${'analysis'.padEnd(42)} ${[10, 50, 100, 200].map((n) => `n=${n}`.padStart(10)).join('')}`);
const perSize = {};
for (const n of [10, 50, 100, 200]) {
  const random = generator(2000 + n);
  const m = Math.max(1, Math.round(n / 10));
  const A = randomMatrix(random, n, n, 1 / Math.sqrt(n)).map((row, i) => row.map((v, j) => (i === j ? v - 0.5 : v)));
  const B = randomMatrix(random, n, m);
  const C = randomMatrix(random, 1, n);
  const D = [new Array(m).fill(0)];
  const eye = (k) => Array.from({ length: k }, (_, i) => Array.from({ length: k }, (_, j) => (i === j ? 1 : 0)));
  const lqr = kernels.designLqr(A, B, eye(n), eye(m), undefined, 'continuous');
  const K = lqr.K;
  const settings = kernels.resolveSettings();
  const repeats = Math.max(3, Math.min(15, Math.round(300 / n)));
  perSize[n] = {
    'modes': medianMs(() => kernels.analyzeModes(A, 'continuous'), repeats),
    'controllability (staircase + PBH margin)': n <= 60 ? medianMs(() => kernels.analyzeControllability(A, B, 'continuous'), repeats) : medianMs(() => kernels.analyzeControllability(A, B, 'continuous', { computeMargin: false }), repeats),
    'invariant zeros': medianMs(() => kernels.invariantZeros(A, B, C, D), repeats),
    'set-point gains': medianMs(() => kernels.setpointGains(A, B, C, D, [0], K, 'continuous', settings), repeats),
    'LQR design': medianMs(() => kernels.designLqr(A, B, eye(n), eye(m), undefined, 'continuous'), repeats),
    'zero-order hold': medianMs(() => kernels.discretiseZeroOrderHold(A, B, 0.01), repeats),
    'step response (linear)': medianMs(() => kernels.simulateStepResponses({ domain: 'continuous', A, B, C, D, K, tracked: [0], points: settings.simulationPoints }), Math.max(3, Math.round(repeats / 3))),
    'loop margins': medianMs(() => kernels.loopMargins(kernels.stateFeedbackLoop(A, B, K), 'continuous'), Math.max(3, Math.round(repeats / 3))),
  };
}
for (const name of analysisNames) {
  console.log(`  ${name.padEnd(42)} ${[10, 50, 100, 200].map((n) => perSize[n][name].toFixed(2).padStart(10)).join('')}`);
}
console.log('  (controllability above n = 60: staircase only; the PBH margin is left out of live analysis there)');

// ---------------------------------------------------------------- language server latency
const lspBench = join(root, 'test/bench/lsp.mjs');
if (existsSync(lspBench)) {
  console.log('');
  const run = spawnSync(process.execPath, [lspBench], { stdio: 'inherit' });
  if (run.status !== 0) console.log('(language-server bench failed)');
}

// ---------------------------------------------------------------- a 500-state model in the server
{
  const run = spawnSync(process.execPath, [join(root, 'test/bench/hover-large.cjs')], { stdio: 'inherit' });
  if (run.status !== 0) console.log('(500-state latency bench failed)');
}
