// The same server over the transports and entry points editors use: node IPC (the VS Code
// client), `loopwright lsp --stdio` through the command-line tool, settings pulled with
// workspace/configuration.
import { fork, spawn } from 'node:child_process';
import { join } from 'node:path';
import { afterEach, beforeAll, describe, expect, it } from 'vitest';
import { createMessageConnection, IPCMessageReader, IPCMessageWriter, StreamMessageReader, StreamMessageWriter, type MessageConnection } from 'vscode-jsonrpc/node';
import { ensureBuilt, LspSession, root } from './lspClient';

const MODEL = `plant p {
  states x
  inputs u
  outputs y
  A = [-1]
  B = [1]
  C = [1]
}

controller c for p {
  poles = [-3]
  track y
}
`;

const cleanups: (() => Promise<void> | void)[] = [];

beforeAll(() => ensureBuilt());

afterEach(async () => {
  while (cleanups.length) await cleanups.pop()!();
});

async function initializeAndOpen(connection: MessageConnection): Promise<{ name: string; diagnostics: unknown[] }> {
  const published = new Promise<{ diagnostics: unknown[] }>((resolve) =>
    connection.onNotification('textDocument/publishDiagnostics', (params: { diagnostics: unknown[] }) => resolve(params)),
  );
  connection.listen();
  const result = (await connection.sendRequest('initialize', { processId: process.pid, rootUri: null, capabilities: {} })) as {
    serverInfo: { name: string };
  };
  await connection.sendNotification('initialized', {});
  await connection.sendNotification('textDocument/didOpen', { textDocument: { uri: 'file:///t/p.plant', languageId: 'plant', version: 1, text: MODEL } });
  const { diagnostics } = await published;
  return { name: result.serverInfo.name, diagnostics };
}

async function shutdown(connection: MessageConnection, exited: Promise<unknown>): Promise<void> {
  await connection.sendRequest('shutdown');
  await connection.sendNotification('exit');
  await exited;
  connection.dispose();
}

describe('transports', () => {
  it('runs over node IPC, as the VS Code client starts it', async () => {
    const child = fork(join(root, 'dist', 'server.cjs'), ['--node-ipc'], { stdio: ['ignore', 'ignore', 'pipe', 'ipc'] });
    const exited = new Promise((resolve) => child.on('exit', resolve));
    cleanups.push(() => void child.kill());
    const connection = createMessageConnection(new IPCMessageReader(child), new IPCMessageWriter(child));
    const { name, diagnostics } = await initializeAndOpen(connection);
    expect(name).toBe('loopwright');
    expect(diagnostics).toEqual([]);
    await shutdown(connection, exited);
  });

  it('runs as `loopwright lsp --stdio` from the command-line bundle', async () => {
    const child = spawn(process.execPath, [join(root, 'dist', 'cli.cjs'), 'lsp', '--stdio'], { stdio: ['pipe', 'pipe', 'pipe'] });
    const exited = new Promise((resolve) => child.on('exit', resolve));
    cleanups.push(() => void child.kill());
    const connection = createMessageConnection(new StreamMessageReader(child.stdout!), new StreamMessageWriter(child.stdin!));
    const { name, diagnostics } = await initializeAndOpen(connection);
    expect(name).toBe('loopwright');
    expect(diagnostics).toEqual([]);
    await shutdown(connection, exited);
  });

  it('pulls its settings with workspace/configuration (lenses switched off)', async () => {
    const session = await LspSession.start({ configurationPull: true, settings: { debounceMs: 0, lenses: false } });
    cleanups.push(() => session.stop());
    const uri = 'file:///t/settings.plant';
    await session.open(uri, MODEL);
    await session.waitForAnalysis(uri, 1);
    expect(await session.request('textDocument/codeLens', { textDocument: { uri } })).toEqual([]);
  });
});
