// Bundles the command-line tool, the language server (and its analysis worker) and the
// extension client for Node, and the two browser scripts (the response panel's webview and the
// design report's plots), with esbuild into dist/ (not committed). Run by `npm ci` (prepare).
import { build } from 'esbuild';
import { dirname, join } from 'node:path';
import { fileURLToPath } from 'node:url';

const root = join(dirname(fileURLToPath(import.meta.url)), '..');
const common = { absWorkingDir: root, outdir: 'dist', bundle: true, logLevel: 'warning' };

await build({
  ...common,
  entryPoints: {
    cli: 'server/src/cli/main.ts',
    server: 'server/src/lsp/main.ts',
    worker: 'server/src/lsp/worker.ts',
    client: 'client/src/extension.ts',
  },
  outExtension: { '.js': '.cjs' },
  platform: 'node',
  target: 'node20',
  format: 'cjs',
  external: ['vscode'],
  sourcemap: true,
});

// Browser contexts: the response panel (dist/webview.js + .css) and the self-contained design
// report (dist/report.js + .css, inlined by `loopwright report`) share the plot module.
await build({
  ...common,
  entryPoints: { webview: 'client/src/panel/webview.ts', report: 'client/src/report/reportPage.ts' },
  platform: 'browser',
  target: 'es2022',
  format: 'iife',
  minify: true,
});
