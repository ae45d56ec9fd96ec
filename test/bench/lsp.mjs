// Language-server latency figures (run after the build: `node test/bench/lsp.mjs`). No assertions.
//   - didChange → publishDiagnostics of the fast checks, and → the full analysis
//     (loopwright/analysisUpdated), median and 95th percentile over 200 edits, debounce 0,
//     for generated 10- and 100-state models;
//   - the largest model again in alternating blocks with and without the analysis helper thread,
//     and with and without the Riccati warm start (LOOPWRIGHT_WARM_START=0: every version solved
//     afresh, as a first analysis or a large edit is);
//   - hover latency while a 200-state model analyses (median).
// `--timeline [--states N]` instead prints where the time of one N-state analysis (default 100) goes, per thread: median
// milliseconds from the coordinator's job start to each mark of server/src/lsp/trace.ts.
// `--compare DIR` instead measures this build against the build in another checkout DIR (its
// dist/server.cjs), 100 states, in alternating blocks of 50 edits, and prints both medians.
// `--soak N` instead replays N seeded random edits (default 10,000) with requests in between
// and reports whether the server stayed up and answered everything.
import { spawn } from 'node:child_process';
import { appendFileSync, existsSync, mkdtempSync, readFileSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { dirname, join } from 'node:path';
import { performance } from 'node:perf_hooks';
import { fileURLToPath } from 'node:url';
import rpc from 'vscode-jsonrpc/node';

const root = join(dirname(fileURLToPath(import.meta.url)), '..', '..');
const serverBundle = join(root, 'dist', 'server.cjs');
if (!existsSync(serverBundle)) {
  console.error('dist/server.cjs is missing: run `node tools/build.mjs` first');
  process.exit(1);
}

const args = process.argv.slice(2);

// The machine's CPU ticks from /proc/stat (Linux; null elsewhere): the share the hypervisor took
// (steal) while a measurement ran. A high share marks a loaded shared machine; a low one does not
// clear it (contention the hypervisor does not count as steal leaves no trace here).
function machineTicks() {
  if (!existsSync('/proc/stat')) return null;
  const fields = readFileSync('/proc/stat', 'utf8').split('\n')[0].trim().split(/\s+/).slice(1).map(Number);
  return { steal: fields[7] ?? 0, total: fields.reduce((sum, value) => sum + value, 0) };
}
const stealPercent = (before, after) =>
  before && after && after.total > before.total ? ((100 * (after.steal - before.steal)) / (after.total - before.total)).toFixed(1) : '—';
const option = (name, fallback) => {
  const index = args.indexOf(name);
  return index >= 0 && args[index + 1] !== undefined ? Number(args[index + 1]) : fallback;
};

function startSession(settings, env = {}, bundle = serverBundle) {
  const child = spawn(process.execPath, [bundle, '--stdio'], { cwd: root, stdio: ['pipe', 'pipe', 'pipe'], env: { ...process.env, ...env } });
  const connection = rpc.createMessageConnection(new rpc.StreamMessageReader(child.stdout), new rpc.StreamMessageWriter(child.stdin));
  const listeners = new Set();
  const emit = (event) => listeners.forEach((listener) => listener(event));
  const logs = [];
  let exited = null;
  child.on('exit', (code) => (exited = code));
  child.stderr.on('data', (chunk) => logs.push(String(chunk)));
  connection.onNotification('textDocument/publishDiagnostics', (params) => emit({ kind: 'diagnostics', time: performance.now(), ...params }));
  connection.onNotification('loopwright/analysisUpdated', (params) => emit({ kind: 'analysed', time: performance.now(), ...params }));
  connection.onNotification('window/logMessage', (params) => logs.push(params.message));
  connection.onRequest('workspace/codeLens/refresh', () => null);
  connection.onRequest('workspace/inlayHint/refresh', () => null);
  connection.listen();
  const waitFor = (test) =>
    new Promise((resolve) => {
      const listener = (event) => {
        if (test(event)) {
          listeners.delete(listener);
          resolve(event);
        }
      };
      listeners.add(listener);
    });
  return {
    connection,
    logs,
    waitFor,
    get exited() {
      return exited;
    },
    async initialize() {
      await connection.sendRequest('initialize', { processId: process.pid, rootUri: null, capabilities: {}, initializationOptions: { settings } });
      await connection.sendNotification('initialized', {});
    },
    async stop() {
      try {
        await connection.sendRequest('shutdown');
        await connection.sendNotification('exit');
      } catch {
        /* gone */
      }
      connection.dispose();
      setTimeout(() => child.kill(), 1000).unref();
    },
  };
}

/** A heated rod cut into n segments (demo scenario): tridiagonal conduction, heater at one end. */
function ladderModel(n) {
  const rows = [];
  for (let i = 0; i < n; i++) {
    const row = [];
    for (let j = 0; j < n; j++) {
      if (i === j) row.push(i === 0 || i === n - 1 ? '-k - h' : '-2*k');
      else if (Math.abs(i - j) === 1) row.push('k');
      else row.push('0');
    }
    rows.push(row.join(', '));
  }
  const states = Array.from({ length: n }, (_, i) => `T${i + 1}`);
  const b = states.map((_, i) => (i === 0 ? 'g' : '0')).join('; ');
  const c = states.map((_, i) => (i === n - 1 ? '1' : '0')).join(', ');
  const text = [
    `# heated rod, ${n} segments (generated for the benchmark)`,
    `plant rod {`,
    `  param k = 0.5`,
    `  param h = 0.05`,
    `  param g = 1`,
    `  states ${states.join(', ')}`,
    `  inputs heater`,
    `  outputs tip`,
    `  A = [${rows.join(';\n       ')}]`,
    `  B = [${b}]`,
    `  C = [${c}]`,
    `}`,
    ``,
    `controller warm for rod {`,
    `  lqr Q = identity(${n}), R = 1`,
    `  track tip`,
    `}`,
    ``,
  ].join('\n');
  return text;
}

const percentile = (values, p) => {
  const sorted = [...values].sort((a, b) => a - b);
  if (sorted.length === 0) return NaN;
  return sorted[Math.min(sorted.length - 1, Math.ceil((p / 100) * sorted.length) - 1)];
};
const ms = (value) => (Number.isFinite(value) ? value.toFixed(1) : '—');

// A mark of this process in the server's trace file (same epoch clock as server/src/lsp/trace.ts).
const clientMark = (file, label, time) => appendFileSync(file, `${(performance.timeOrigin + time).toFixed(1)} ${label}\n`);

async function measureEdits(n, edits, env = {}, firstEdit = 0, bundle = serverBundle) {
  const session = startSession({ debounceMs: 0 }, env, bundle);
  await session.initialize();
  const uri = `file:///bench/rod${n}.plant`;
  const text = ladderModel(n);
  const opened = session.waitFor((e) => e.kind === 'analysed' && e.uri === uri && e.version === 1);
  await session.connection.sendNotification('textDocument/didOpen', { textDocument: { uri, languageId: 'plant', version: 1, text } });
  await opened;
  const line = 2; // `  param k = 0.5`
  const fast = [];
  const full = [];
  for (let i = 0; i < edits; i++) {
    const version = i + 2;
    // 0.5001, 0.5002, …: every edit is a text the server has not seen; only the LQR design's
    // Riccati solve starts from the previous version's solution (the warm start, ≥ 40 states).
    const value = (0.5 + (firstEdit + i + 1) / 10000).toFixed(4);
    const fastEvent = session.waitFor((e) => e.kind === 'diagnostics' && e.uri === uri && e.version === version);
    const fullEvent = session.waitFor((e) => e.kind === 'analysed' && e.uri === uri && e.version === version);
    const start = performance.now();
    if (env.LOOPWRIGHT_TRACE) clientMark(env.LOOPWRIGHT_TRACE, 'client: didChange sent', start);
    await session.connection.sendNotification('textDocument/didChange', {
      textDocument: { uri, version },
      contentChanges: [{ range: { start: { line, character: 12 }, end: { line, character: 12 + (i === 0 ? 3 : 6) } }, text: value }],
    });
    const fastTime = (await fastEvent).time;
    const fullTime = (await fullEvent).time;
    fast.push(fastTime - start);
    full.push(fullTime - start);
    if (env.LOOPWRIGHT_TRACE) {
      clientMark(env.LOOPWRIGHT_TRACE, 'client: fast diagnostics', fastTime);
      clientMark(env.LOOPWRIGHT_TRACE, 'client: full analysis', fullTime);
    }
  }
  await session.stop();
  return { fast, full };
}

async function measureHoverDuringAnalysis(n, hovers) {
  const session = startSession({ debounceMs: 0 });
  await session.initialize();
  const uri = `file:///bench/rod${n}.plant`;
  const text = ladderModel(n);
  const opened = session.waitFor((e) => e.kind === 'analysed' && e.uri === uri && e.version === 1);
  await session.connection.sendNotification('textDocument/didOpen', { textDocument: { uri, languageId: 'plant', version: 1, text } });
  await opened;
  const latencies = [];
  const analyses = [];
  let during = 0;
  let round = 0;
  while (latencies.length < hovers && round < 20) {
    round++;
    const version = round + 1;
    let analysed = false;
    const fastEvent = session.waitFor((e) => e.kind === 'diagnostics' && e.uri === uri && e.version === version);
    const sent = performance.now();
    const done = session
      .waitFor((e) => e.kind === 'analysed' && e.uri === uri && e.version === version)
      .then((event) => {
        analysed = true;
        analyses.push(event.time - sent);
      });
    await session.connection.sendNotification('textDocument/didChange', {
      textDocument: { uri, version },
      contentChanges: [{ range: { start: { line: 2, character: 12 }, end: { line: 2, character: 15 } }, text: round % 2 ? '0.6' : '0.5' }],
    });
    await fastEvent; // the fast check is done; the slow analysis now runs in the worker
    while (!analysed && latencies.length < hovers) {
      const start = performance.now();
      await session.connection.sendRequest('textDocument/hover', { textDocument: { uri }, position: { line: 2, character: 8 } });
      const elapsed = performance.now() - start;
      if (!analysed) {
        latencies.push(elapsed);
        during++;
      }
    }
    await done;
  }
  await session.stop();
  return { latencies, during, analyses };
}

const ALPHABET = "abxyzJKQR0123456789.,;=+-*/^'()[]{}#jis \n";
function seededRandom(seed) {
  let state = seed >>> 0;
  return () => {
    state = (state + 0x6d2b79f5) >>> 0;
    let t = state;
    t = Math.imul(t ^ (t >>> 15), t | 1);
    t ^= t + Math.imul(t ^ (t >>> 7), t | 61);
    return ((t ^ (t >>> 14)) >>> 0) / 4294967296;
  };
}
const positionOf = (text, offset) => {
  const before = text.slice(0, offset).split('\n');
  return { line: before.length - 1, character: before[before.length - 1].length };
};

async function runSoak(edits) {
  // `--model FILE` soaks another model (e.g. one with large all-number matrices).
  const modelIndex = args.indexOf('--model');
  const samples = modelIndex >= 0 ? args[modelIndex + 1] : join(root, 'samples', 'hoist.plant');
  let text = existsSync(samples) ? readFileSync(samples, 'utf8') : ladderModel(4);
  const session = startSession({ debounceMs: 10 });
  await session.initialize();
  const uri = 'file:///bench/soak.plant';
  await session.connection.sendNotification('textDocument/didOpen', { textDocument: { uri, languageId: 'plant', version: 1, text } });
  const random = seededRandom(20_261_202);
  let failures = 0;
  const started = performance.now();
  for (let i = 0; i < edits; i++) {
    const version = i + 2;
    const offset = Math.floor(random() * (text.length + 1));
    let change;
    if (random() < 0.55 || text.length === 0) {
      const character = ALPHABET[Math.floor(random() * ALPHABET.length)];
      const at = positionOf(text, offset);
      change = { range: { start: at, end: at }, text: character };
      text = text.slice(0, offset) + character + text.slice(offset);
    } else {
      const end = Math.min(text.length, offset + 1 + Math.floor(random() * 3));
      change = { range: { start: positionOf(text, offset), end: positionOf(text, end) }, text: '' };
      text = text.slice(0, offset) + text.slice(end);
    }
    const published = session.waitFor((e) => e.kind === 'diagnostics' && e.uri === uri && e.version === version);
    await session.connection.sendNotification('textDocument/didChange', { textDocument: { uri, version }, contentChanges: [change] });
    if (i % 25 === 24) {
      const position = positionOf(text, Math.floor(random() * (text.length + 1)));
      for (const method of ['textDocument/hover', 'textDocument/completion', 'textDocument/signatureHelp']) {
        await session.connection.sendRequest(method, { textDocument: { uri }, position }).catch(() => failures++);
      }
      for (const method of ['textDocument/codeLens', 'textDocument/semanticTokens/full', 'textDocument/documentSymbol', 'textDocument/foldingRange']) {
        await session.connection.sendRequest(method, { textDocument: { uri } }).catch(() => failures++);
      }
      await session.connection
        .sendRequest('textDocument/formatting', { textDocument: { uri }, options: { tabSize: 2, insertSpaces: true } })
        .catch(() => failures++);
    }
    await published;
  }
  const finalVersion = edits + 1;
  await session.waitFor((e) => e.kind === 'analysed' && e.uri === uri && e.version === finalVersion);
  const seconds = (performance.now() - started) / 1000;
  const logged = session.logs.filter((line) => /failed/.test(line));
  console.log(`soak: ${edits} random edits in ${seconds.toFixed(1)} s; server ${session.exited === null ? 'up' : `exited (${session.exited})`}; failed requests ${failures}; logged failures ${logged.length}`);
  for (const line of logged.slice(0, 5)) console.log(`  ${line.split('\n')[0]}`);
  await session.stop();
}

async function printTimeline(n, edits) {
  const directory = mkdtempSync(join(tmpdir(), 'loopwright-trace-'));
  const file = join(directory, 'trace.log');
  const { full } = await measureEdits(n, edits, { LOOPWRIGHT_TRACE: file });
  const marks = readFileSync(file, 'utf8').trim().split('\n').map((line) => {
    const space = line.indexOf(' ');
    return { time: Number(line.slice(0, space)), label: line.slice(space + 1) };
  });
  rmSync(directory, { recursive: true, force: true });
  marks.sort((a, b) => a.time - b.time);
  // One group per edit, from the client's didChange to its result; offsets are measured from the
  // coordinator's job start (marks before it, on the client and the server's main thread, are negative).
  const groups = [];
  for (const mark of marks) {
    if (mark.label === 'client: didChange sent') groups.push({ marks: [], collections: new Map() });
    else if (!groups.length) continue; // the didOpen's analysis
    const group = groups[groups.length - 1];
    if (mark.label.includes(': gc ')) {
      // "<thread>: gc kind <k> <ms> ms": summed per thread and job.
      const [thread, rest] = mark.label.split(': gc ');
      group.collections.set(thread, (group.collections.get(thread) ?? 0) + Number(rest.split(' ')[2]));
    } else group.marks.push(mark);
  }
  const measured = [];
  for (const group of groups) {
    const start = group.marks.find((mark) => mark.label === 'coordinator: job start');
    if (!start) continue;
    const offsets = new Map();
    for (const mark of group.marks) if (!offsets.has(mark.label)) offsets.set(mark.label, mark.time - start.time);
    measured.push({ offsets, collections: group.collections });
  }
  const labels = [...new Set(measured.flatMap((job) => [...job.offsets.keys()]))];
  const rows = labels.map((label) => [label, percentile(measured.map((job) => job.offsets.get(label)).filter((v) => v !== undefined), 50)]);
  rows.sort((a, b) => a[1] - b[1]);
  console.log(`${n}-state model, ${measured.length} edits: median ms after the coordinator starts the job`);
  for (const [label, offset] of rows) console.log(`${ms(offset).padStart(8)}  ${label}`);
  console.log(`${ms(percentile(full, 50)).padStart(8)}  didChange → full diagnostics (client side, from didChange)`);
  for (const thread of ['coordinator', 'helper']) {
    const totals = measured.map((job) => job.collections.get(thread) ?? 0);
    console.log(`${ms(percentile(totals, 50)).padStart(8)}  ${thread}: garbage collection per job (median of the sum of pauses ≥ 1 ms)`);
  }
}

async function compareWith(otherRoot, n, edits) {
  const otherBundle = join(otherRoot, 'dist', 'server.cjs');
  if (!existsSync(otherBundle)) throw new Error(`${otherBundle} is missing: build that checkout first`);
  const here = [];
  const there = [];
  for (let block = 0; block < Math.ceil(edits / 50); block++) {
    there.push(...(await measureEdits(n, 50, {}, 2000 + block * 50, otherBundle)).full);
    here.push(...(await measureEdits(n, 50, {}, 2000 + block * 50)).full);
  }
  const hereMedian = percentile(here, 50);
  const thereMedian = percentile(there, 50);
  console.log(`${n} states, alternating blocks of 50 edits, full p50: this build ${ms(hereMedian)} ms, ${otherRoot} ${ms(thereMedian)} ms (ratio ${(hereMedian / thereMedian).toFixed(2)}; ${here.length} edits each)`);
  console.log(`  p95: this build ${ms(percentile(here, 95))} ms, other ${ms(percentile(there, 95))} ms`);
}

if (args.includes('--compare')) {
  await compareWith(args[args.indexOf('--compare') + 1], option('--states', 100), option('--edits', 200));
} else if (args.includes('--timeline')) {
  await printTimeline(option('--states', 100), option('--edits', 40));
} else if (args.includes('--soak')) {
  await runSoak(option('--soak', 10_000) || 10_000);
} else {
  const edits = option('--edits', 200);
  const rows = [];
  const sizes = args.includes('--sizes') ? String(args[args.indexOf('--sizes') + 1]).split(',').map(Number) : [10, 100];
  for (const n of sizes) {
    const ticksBefore = machineTicks();
    const { fast, full } = await measureEdits(n, edits);
    rows.push([`${n} states`, ms(percentile(fast, 50)), ms(percentile(fast, 95)), ms(percentile(full, 50)), ms(percentile(full, 95)), stealPercent(ticksBefore, machineTicks())]);
  }
  // The analysis helper thread on and off, side by side: blocks of 50 edits alternate between a
  // server with the helper and one without (LOOPWRIGHT_ANALYSIS_THREADS=1), so machine load
  // falls on both alike.
  const largest = Math.max(...sizes);
  const withHelper = [];
  const withoutHelper = [];
  for (let block = 0; block < Math.ceil(edits / 50); block++) {
    withHelper.push(...(await measureEdits(largest, 50, {}, 1000 + block * 50)).full);
    withoutHelper.push(...(await measureEdits(largest, 50, { LOOPWRIGHT_ANALYSIS_THREADS: '1' }, 1000 + block * 50)).full);
  }
  const warm = [];
  const cold = [];
  for (let block = 0; block < Math.ceil(edits / 100); block++) {
    warm.push(...(await measureEdits(largest, 50, {}, 3000 + block * 50)).full);
    cold.push(...(await measureEdits(largest, 50, { LOOPWRIGHT_WARM_START: '0' }, 3000 + block * 50)).full);
  }
  const hover = await measureHoverDuringAnalysis(200, option('--hovers', 50));
  console.log(`didChange → diagnostics, debounce 0, ${edits} edits (milliseconds)`);
  console.log('model       fast p50  fast p95  full p50  full p95  steal %');
  for (const row of rows) console.log(`${row[0].padEnd(10)}  ${row.slice(1).map((cell) => cell.padStart(8)).join('  ')}`);
  const helperMedian = percentile(withHelper, 50);
  const singleMedian = percentile(withoutHelper, 50);
  console.log(
    `${largest} states, alternating blocks: full p50 ${ms(helperMedian)} ms with the helper thread, ${ms(singleMedian)} ms with one analysis thread` +
      ` (ratio ${(helperMedian / singleMedian).toFixed(2)}; ${withHelper.length} edits each)`,
  );
  console.log(
    `${largest} states, alternating blocks: full p50 ${ms(percentile(warm, 50))} ms with the Riccati warm start, ${ms(percentile(cold, 50))} ms solving afresh` +
      ` (ratio ${(percentile(warm, 50) / percentile(cold, 50)).toFixed(2)}; ${warm.length} edits each)`,
  );
  console.log(
    `hover while a 200-state model analyses: median ${ms(percentile(hover.latencies, 50))} ms, p95 ${ms(percentile(hover.latencies, 95))} ms over ${hover.during} hovers` +
      ` (its full analysis: median ${ms(percentile(hover.analyses, 50))} ms over ${hover.analyses.length} edits)`,
  );
}
