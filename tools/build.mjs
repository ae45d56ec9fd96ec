// Bundles the command-line tool, the language server (and its analysis worker) and the
// extension client with esbuild into dist/ (not committed). Run by `npm ci` (prepare).
import { build } from 'esbuild';
import { existsSync } from 'node:fs';
import { dirname, join } from 'node:path';
import { fileURLToPath } from 'node:url';

const root = join(dirname(fileURLToPath(import.meta.url)), '..');
const entries = [
  { in: 'server/src/cli/main.ts', out: 'cli' },
  { in: 'server/src/lsp/main.ts', out: 'server' },
  { in: 'server/src/lsp/worker.ts', out: 'worker' },
  { in: 'client/src/extension.ts', out: 'client' },
];

const missing = entries.filter((entry) => !existsSync(join(root, entry.in)));
for (const entry of missing) console.warn(`build: ${entry.in} not present yet, skipped`);

await build({
  absWorkingDir: root,
  entryPoints: entries.filter((entry) => !missing.includes(entry)),
  outdir: 'dist',
  outExtension: { '.js': '.cjs' },
  bundle: true,
  platform: 'node',
  target: 'node20',
  format: 'cjs',
  external: ['vscode'],
  sourcemap: true,
  logLevel: 'warning',
});

// The response panel's script and styles run inside a webview (a browser context): dist/webview.js + .css.
const webviewEntry = 'client/src/panel/webview.ts';
if (existsSync(join(root, webviewEntry))) {
  await build({
    absWorkingDir: root,
    entryPoints: { webview: webviewEntry },
    outdir: 'dist',
    bundle: true,
    platform: 'browser',
    target: 'es2022',
    format: 'iife',
    minify: true,
    sourcemap: true,
    logLevel: 'warning',
  });
}

// The design report's script: the same plot module, inlined into the HTML by `loopwright report`.
const reportEntry = 'client/src/report/reportPage.ts';
if (existsSync(join(root, reportEntry))) {
  await build({
    absWorkingDir: root,
    entryPoints: { report: reportEntry },
    outdir: 'dist',
    bundle: true,
    platform: 'browser',
    target: 'es2022',
    format: 'iife',
    minify: true,
    logLevel: 'warning',
  });
}
