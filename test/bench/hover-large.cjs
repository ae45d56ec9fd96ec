// Hover and completion latency on a 500-state model (issue target: medians under 50 ms while the
// slow analyses run or are skipped by the size limit): requests sent right after each edit.
// Run by test/bench/run.mjs after the build; prints one line.
const { spawn } = require('child_process');
const { join } = require('path');
const root = join(__dirname, '..', '..');
const rpc = require(join(root, 'node_modules/vscode-jsonrpc/lib/node/main.js'));
const n = 500;
const rows = [];
for (let i = 0; i < n; i++) { const row = []; for (let j = 0; j < n; j++) row.push(i === j ? '-2*k' : Math.abs(i - j) === 1 ? 'k' : '0'); rows.push(row.join(', ')); }
const states = Array.from({ length: n }, (_, i) => `T${i + 1}`);
const text = ['plant rod {', '  param k = 0.5', '  param g = 1', `  states ${states.join(', ')}`, '  inputs heater', '  outputs tip',
  `  A = [${rows.join(';\n       ')}]`, `  B = [${states.map((_, i) => (i === 0 ? 'g' : '0')).join('; ')}]`, `  C = [${states.map((_, i) => (i === n - 1 ? '1' : '0')).join(', ')}]`, '}',
  'controller warm for rod {', '  lqr Q = identity(500), R = 1', '  track tip', '}', ''].join('\n');
const child = spawn(process.execPath, [join(root, 'dist/server.cjs'), '--stdio']);
const conn = rpc.createMessageConnection(new rpc.StreamMessageReader(child.stdout), new rpc.StreamMessageWriter(child.stdin));
conn.listen();
conn.onRequest('workspace/configuration', (p) => p.items.map(() => ({ debounceMs: 0 })));
(async () => {
  await conn.sendRequest('initialize', { processId: null, rootUri: null, capabilities: {}, initializationOptions: { debounceMs: 0 } });
  conn.sendNotification('initialized', {});
  const uri = 'file:///h500.plant';
  conn.sendNotification('textDocument/didOpen', { textDocument: { uri, languageId: 'plant', version: 1, text } });
  const hover = [], completion = [];
  const median = (a) => a.slice().sort((x, y) => x - y)[a.length >> 1];
  for (let round = 0; round < 10; round++) {
    conn.sendNotification('textDocument/didChange', { textDocument: { uri, version: round + 2 }, contentChanges: [{ range: { start: { line: 1, character: 12 }, end: { line: 1, character: 15 } }, text: round % 2 ? '0.6' : '0.5' }] });
    for (let k = 0; k < 3; k++) {
      let t = performance.now();
      await conn.sendRequest('textDocument/hover', { textDocument: { uri }, position: { line: 1, character: 8 } });
      hover.push(performance.now() - t);
      t = performance.now();
      await conn.sendRequest('textDocument/completion', { textDocument: { uri }, position: { line: 11, character: 2 } });
      completion.push(performance.now() - t);
    }
  }
  console.log(`500-state model, requests right after each edit: hover median ${median(hover).toFixed(1)} ms (max ${Math.max(...hover).toFixed(0)}), completion median ${median(completion).toFixed(1)} ms (max ${Math.max(...completion).toFixed(0)})`);
  child.kill();
  process.exit(0);
})();
