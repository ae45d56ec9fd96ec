// Entry of the bundled server (dist/server.cjs). The transport comes from the command line:
// `--stdio` (other editors, `loopwright lsp --stdio`) or `--node-ipc` (the VS Code client).
import { createConnection, ProposedFeatures, StreamMessageReader, StreamMessageWriter } from 'vscode-languageserver/node';
import { startServer } from './server';

export { startServer } from './server';

let started = false;

/** Starts the server with the transport named on the command line. */
export function main(): void {
  if (started) return;
  started = true;
  startServer(createConnection(ProposedFeatures.all));
}

/** Starts the server on standard input/output (what `loopwright lsp --stdio` calls). */
export function startStdioServer(): void {
  if (started) return;
  started = true;
  startServer(createConnection(ProposedFeatures.all, new StreamMessageReader(process.stdin), new StreamMessageWriter(process.stdout)));
}

const TRANSPORT = /^--(stdio|node-ipc|socket=|pipe=)/;
if (process.argv.some((argument) => TRANSPORT.test(argument)) && !process.argv.includes('--no-autostart')) main();
