// A real JSON-RPC client for the bundled server (node dist/server.cjs --stdio): no mocks.
// Tests wait on notifications (published diagnostics, analysis-updated), never on sleeps.
import { spawn, spawnSync, type ChildProcess } from 'node:child_process';
import { readdirSync, statSync } from 'node:fs';
import { dirname, join } from 'node:path';
import { fileURLToPath } from 'node:url';
import {
  createMessageConnection,
  StreamMessageReader,
  StreamMessageWriter,
  type MessageConnection,
} from 'vscode-jsonrpc/node';
import type { Position } from '../../grammar/src/ast';

export const root = join(dirname(fileURLToPath(import.meta.url)), '..', '..');
const serverBundle = join(root, 'dist', 'server.cjs');

function newestSource(directory: string): number {
  let newest = 0;
  for (const entry of readdirSync(directory, { withFileTypes: true })) {
    const path = join(directory, entry.name);
    if (entry.isDirectory()) newest = Math.max(newest, newestSource(path));
    else if (entry.name.endsWith('.ts')) newest = Math.max(newest, statSync(path).mtimeMs);
  }
  return newest;
}

/** Builds dist/ with the project's build script unless the server bundle is newer than the sources. */
export function ensureBuilt(): void {
  let bundleTime = 0;
  try {
    bundleTime = Math.min(statSync(serverBundle).mtimeMs, statSync(join(root, 'dist', 'worker.cjs')).mtimeMs);
  } catch {
    bundleTime = 0;
  }
  const sources = Math.max(newestSource(join(root, 'server', 'src')), newestSource(join(root, 'grammar', 'src')));
  if (bundleTime > sources) return;
  const result = spawnSync(process.execPath, [join(root, 'tools', 'build.mjs')], { cwd: root, encoding: 'utf8' });
  if (result.status !== 0) throw new Error(`build failed:\n${result.stderr}\n${result.stdout}`);
}

export interface PublishedDiagnostics {
  uri: string;
  version?: number;
  diagnostics: {
    range: { start: Position; end: Position };
    severity?: number;
    code?: string | number;
    message: string;
    data?: unknown;
  }[];
}

type Waiter<T> = { test: (value: T) => boolean; resolve: (value: T) => void };

/** Splits a fixture at its cursor marker `|`: the text without it and the marker's position. */
export function withCursor(marked: string): { text: string; position: Position } {
  const offset = marked.indexOf('|');
  if (offset < 0) throw new Error('fixture has no | cursor marker');
  const text = marked.slice(0, offset) + marked.slice(offset + 1);
  const before = text.slice(0, offset).split('\n');
  return { text, position: { line: before.length - 1, character: before[before.length - 1].length } };
}

export class LspSession {
  readonly connection: MessageConnection;
  readonly published: PublishedDiagnostics[] = [];
  readonly analysed: { uri: string; version: number }[] = [];
  readonly stderr: string[] = [];
  private readonly diagnosticWaiters: Waiter<PublishedDiagnostics>[] = [];
  private readonly analysedWaiters: Waiter<{ uri: string; version: number }>[] = [];
  private exited: number | null = null;
  private versions = new Map<string, number>();

  private constructor(readonly child: ChildProcess) {
    this.connection = createMessageConnection(new StreamMessageReader(child.stdout!), new StreamMessageWriter(child.stdin!));
    child.stderr!.on('data', (chunk) => this.stderr.push(String(chunk)));
    child.on('exit', (code) => (this.exited = code ?? -1));
    this.connection.onNotification('textDocument/publishDiagnostics', (params: PublishedDiagnostics) => {
      this.published.push(params);
      for (const waiter of [...this.diagnosticWaiters]) {
        if (waiter.test(params)) {
          this.diagnosticWaiters.splice(this.diagnosticWaiters.indexOf(waiter), 1);
          waiter.resolve(params);
        }
      }
    });
    this.connection.onNotification('loopwright/analysisUpdated', (params: { uri: string; version: number }) => {
      this.analysed.push(params);
      for (const waiter of [...this.analysedWaiters]) {
        if (waiter.test(params)) {
          this.analysedWaiters.splice(this.analysedWaiters.indexOf(waiter), 1);
          waiter.resolve(params);
        }
      }
    });
    this.connection.onNotification('window/logMessage', (params: { message: string }) => {
      this.stderr.push(params.message);
    });
    this.connection.onRequest('workspace/configuration', (params: { items: unknown[] }) => params.items.map(() => this.configuration));
    this.connection.onRequest('workspace/codeLens/refresh', () => null);
    this.connection.onRequest('workspace/inlayHint/refresh', () => null);
    this.connection.onRequest('client/registerCapability', () => null);
    this.connection.listen();
  }

  configuration: Record<string, unknown> = {};

  static async start(options: { settings?: Record<string, unknown>; configurationPull?: boolean; env?: Record<string, string> } = {}): Promise<LspSession> {
    const child = spawn(process.execPath, [serverBundle, '--stdio'], { cwd: root, stdio: ['pipe', 'pipe', 'pipe'], env: { ...process.env, ...options.env } });
    const session = new LspSession(child);
    session.configuration = options.settings ?? {};
    session.initializeResult = await session.connection.sendRequest('initialize', {
      processId: process.pid,
      rootUri: null,
      capabilities: {
        workspace: { configuration: options.configurationPull ?? false, codeLens: { refreshSupport: true } },
        textDocument: {
          completion: { completionItem: { snippetSupport: true } },
          publishDiagnostics: { versionSupport: true, relatedInformation: true },
        },
      },
      initializationOptions: { settings: options.settings ?? {} },
    });
    await session.connection.sendNotification('initialized', {});
    return session;
  }

  initializeResult: unknown;

  get exitCode(): number | null {
    return this.exited;
  }

  /** Resolves with the first published diagnostics (already received or future) that pass the test. */
  waitForDiagnostics(test: (params: PublishedDiagnostics) => boolean): Promise<PublishedDiagnostics> {
    const seen = this.published.find(test);
    if (seen) return Promise.resolve(seen);
    return new Promise((resolve) => this.diagnosticWaiters.push({ test, resolve }));
  }

  /** Resolves when the slow analysis of that version was published. */
  waitForAnalysis(uri: string, version: number): Promise<{ uri: string; version: number }> {
    const test = (params: { uri: string; version: number }) => params.uri === uri && params.version === version;
    const seen = this.analysed.find(test);
    if (seen) return Promise.resolve(seen);
    return new Promise((resolve) => this.analysedWaiters.push({ test, resolve }));
  }

  /** The last diagnostics published for a document. */
  lastDiagnostics(uri: string): PublishedDiagnostics | undefined {
    for (let i = this.published.length - 1; i >= 0; i--) if (this.published[i].uri === uri) return this.published[i];
    return undefined;
  }

  version(uri: string): number {
    return this.versions.get(uri) ?? 0;
  }

  async open(uri: string, text: string): Promise<number> {
    this.versions.set(uri, 1);
    await this.connection.sendNotification('textDocument/didOpen', { textDocument: { uri, languageId: 'plant', version: 1, text } });
    return 1;
  }

  /** Sends incremental changes; returns the new version. */
  async change(uri: string, changes: { range?: { start: Position; end: Position }; text: string }[]): Promise<number> {
    const version = this.version(uri) + 1;
    this.versions.set(uri, version);
    await this.connection.sendNotification('textDocument/didChange', { textDocument: { uri, version }, contentChanges: changes });
    return version;
  }

  request<R>(method: string, params: unknown): Promise<R> {
    return this.connection.sendRequest(method, params) as Promise<R>;
  }

  async stop(): Promise<void> {
    try {
      await this.connection.sendRequest('shutdown');
      await this.connection.sendNotification('exit');
    } catch {
      // already gone
    }
    this.connection.dispose();
    if (this.exited === null) {
      await new Promise<void>((resolve) => {
        const timer = setTimeout(() => {
          this.child.kill();
          resolve();
        }, 2000);
        this.child.on('exit', () => {
          clearTimeout(timer);
          resolve();
        });
      });
    }
  }
}

/** Applies protocol text edits to a text (edits do not overlap). */
export function applyLspEdits(text: string, edits: { range: { start: Position; end: Position }; newText: string }[]): string {
  const lines = text.split('\n');
  const offset = (p: Position) => {
    let total = 0;
    for (let line = 0; line < p.line && line < lines.length; line++) total += lines[line].length + 1;
    return total + p.character;
  };
  const resolved = edits.map((edit) => ({ start: offset(edit.range.start), end: offset(edit.range.end), text: edit.newText }));
  resolved.sort((a, b) => b.start - a.start);
  let result = text;
  for (const edit of resolved) result = result.slice(0, edit.start) + edit.text + result.slice(edit.end);
  return result;
}
