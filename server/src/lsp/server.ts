// The language server: document sync, one analysis per document version, and protocol
// handlers that call the pure ide/ functions and convert their records (./convert).
//   - every change: fast checks (syntax, names, shapes) on this thread, diagnostics published
//     at once, stamped with the version; diagnostics of the previous slow analysis ride along,
//     moved with the edit, so warnings do not flicker while typing;
//   - after `loopwright.debounceMs` without edits: slow analyses in a worker thread; a newer
//     edit abandons the older run; a result is published only if its version is still current;
//   - requests answer from the latest fast check (and the slow reports of the same version).
import { createHash } from 'node:crypto';
import { join } from 'node:path';
import {
  CodeLensRefreshRequest,
  DidChangeConfigurationNotification,
  TextDocumentSyncKind,
  type Connection,
  type Diagnostic as LspDiagnostic,
  type InitializeParams,
  type InitializeResult,
  type TextDocumentContentChangeEvent,
} from 'vscode-languageserver';
import { TextDocument } from 'vscode-languageserver-textdocument';
import { byPosition, checkText, largestPlant, type DocumentAnalysis, type FastCheck } from '../analyze';
import type { Diagnostic } from '../model/types';
import { codeActions } from '../ide/codeActions';
import { codeLenses } from '../ide/codeLens';
import { completions } from '../ide/completion';
import { documentSymbols } from '../ide/documentSymbols';
import { foldingRanges } from '../ide/folding';
import { formatDocument } from '../ide/format';
import { hoverAt } from '../ide/hover';
import { inlayHints } from '../ide/inlayHints';
import { definitionAt, highlightsAt, referencesAt } from '../ide/navigation';
import { prepareRename, renameAt } from '../ide/rename';
import { semanticTokens } from '../ide/semanticTokens';
import { signatureHelp } from '../ide/signatureHelp';
import { controllerReportAt, type AnalysisView } from '../ide/view';
import { AnalysisRunner } from './analysisRunner';
import { traceMark } from './trace';
import {
  fromLspDiagnostic,
  semanticTokensLegend,
  toLspCodeAction,
  toLspCodeLens,
  toLspCompletionItem,
  toLspDiagnostic,
  toLspDocumentSymbol,
  toLspFoldingRange,
  toLspHover,
  toLspInlayHint,
  toLspSemanticTokens,
  toLspSignatureHelp,
  toLspTextEdit,
} from './convert';
import { exportController, type ExportFormat } from './exportGains';
import { reportHtml } from './report';
import { defaultServerSettings, numberFromEnvironment, readServerSettings, settingsFromInitializationOptions, type ServerSettings } from './settings';
import { shiftRange } from './shiftRanges';
import type { SlowResult } from './slowAnalysis';

export const SERVER_NAME = 'loopwright';
export const SERVER_VERSION = '0.1.0';

/** Custom protocol shared with the client (client/src/protocol.ts holds the same names). */
export const ANALYSIS_UPDATED = 'loopwright/analysisUpdated';
const CONTROLLERS_REQUEST = 'loopwright/controllers';
const CONTROLLER_DATA_REQUEST = 'loopwright/controllerData';
const EXPORT_REQUEST = 'loopwright/export';
const REPORT_REQUEST = 'loopwright/report';

/**
 * A fast check at least this long (ms) is worth overlapping with the worker's start (no debounce);
 * LOOPWRIGHT_EARLY_SLOW_MS overrides it (tests use 0 to take that path on every document).
 */
const EARLY_SLOW_AFTER_FAST_MS = numberFromEnvironment('LOOPWRIGHT_EARLY_SLOW_MS') ?? 10;

interface DocumentState {
  /** The text as the editor has it now. */
  document: TextDocument;
  /** Fast check of `fastVersion` (lags `document` only while a deferred check is pending). */
  fast: FastCheck;
  fastVersion: number;
  /** The slow analysis of `fastVersion`, once it arrived. */
  slow: SlowResult | null;
  /** The last slow result of an earlier version (lenses and hovers show it, marked stale). */
  previous: SlowResult | null;
  /** Slow-only diagnostics of the last analysed version, moved along with every later edit. */
  carried: Diagnostic[];
  fastTimer: ReturnType<typeof setTimeout> | null;
  /** Cancels the scheduled slow analysis (a timer, or an immediate without debounce). */
  slowTimer: (() => void) | null;
  /** How long the last fast check took and when it ended (ms), to coalesce bursts on big models. */
  fastDuration: number;
  fastEnded: number;
}

export interface ServerOptions {
  /** Path of the bundled worker; defaults to worker.cjs beside the running bundle. */
  workerPath?: string | null;
}

function defaultWorkerPath(): string | null {
  return typeof __dirname === 'string' ? join(__dirname, 'worker.cjs') : null;
}

export function startServer(connection: Connection, options: ServerOptions = {}): void {
  const documents = new Map<string, DocumentState>();
  let settings: ServerSettings = defaultServerSettings;
  let capabilities: InitializeParams['capabilities'] = {};
  let configurationPull = false;
  const log = (message: string) => connection.console.error(message);
  const runner = new AnalysisRunner(options.workerPath === undefined ? defaultWorkerPath() : options.workerPath, log);

  /** Every handler answers; a failure is logged and gives the empty answer. */
  function guard<P, R>(name: string, empty: R, handler: (params: P) => R | Promise<R>): (params: P) => Promise<R> {
    return async (params: P) => {
      try {
        return await handler(params);
      } catch (error) {
        log(`${name} failed: ${error instanceof Error ? error.stack ?? error.message : String(error)}`);
        return empty;
      }
    };
  }

  function viewOf(state: DocumentState): AnalysisView {
    if (!state.slow) {
      if (!state.previous) return state.fast;
      // Reports of an earlier version, looked up by name by the ide functions.
      return { ...state.fast, plants: state.previous.plants, controllers: state.previous.controllers, settings: state.previous.settings, stale: true };
    }
    return {
      ...state.fast,
      diagnostics: state.slow.diagnostics,
      plants: state.slow.plants,
      controllers: state.slow.controllers,
      settings: state.slow.settings,
      skipped: state.slow.skipped,
    };
  }

  function fullAnalysis(state: DocumentState): DocumentAnalysis | null {
    if (!state.slow) return null;
    const view = viewOf(state);
    if (!view.plants || !view.controllers || !view.settings) return null;
    return view as DocumentAnalysis;
  }

  function publish(state: DocumentState, diagnostics: Diagnostic[]): void {
    const uri = state.document.uri;
    void connection.sendDiagnostics({
      uri,
      version: state.document.version,
      diagnostics: diagnostics.map((diagnostic) => toLspDiagnostic(diagnostic, uri)),
    });
  }

  function moveCarried(carried: Diagnostic[], changes: TextDocumentContentChangeEvent[]): Diagnostic[] {
    let moved = carried;
    for (const change of changes) {
      if (!('range' in change) || !change.range) return [];
      const next: Diagnostic[] = [];
      for (const diagnostic of moved) {
        const range = shiftRange(diagnostic.range, { range: change.range, text: change.text });
        if (range) next.push({ ...diagnostic, range, related: undefined });
      }
      moved = next;
    }
    return moved;
  }

  function stopTimers(state: DocumentState): void {
    if (state.fastTimer) clearTimeout(state.fastTimer);
    state.slowTimer?.();
    state.fastTimer = null;
    state.slowTimer = null;
  }

  function openDocument(document: TextDocument): void {
    const old = documents.get(document.uri);
    if (old) stopTimers(old);
    runner.cancel(document.uri);
    const state: DocumentState = {
      document,
      fast: checkText(''),
      fastVersion: -1,
      slow: null,
      previous: null,
      carried: [],
      fastTimer: null,
      slowTimer: null,
      fastDuration: 0,
      fastEnded: 0,
    };
    documents.set(document.uri, state);
    runFast(state);
  }

  function changeDocument(state: DocumentState, changes: TextDocumentContentChangeEvent[], version: number): void {
    traceMark('server: change received');
    state.document = TextDocument.update(state.document, changes, version);
    state.carried = moveCarried(state.carried, changes);
    stopTimers(state);
    runner.cancel(state.document.uri);
    // Edits arriving faster than the fast check runs (a big model) are coalesced: the check waits
    // as long as the last one took, and a newer edit replaces the wait.
    const sinceLast = performance.now() - state.fastEnded;
    if (sinceLast >= state.fastDuration) runFast(state);
    else {
      state.fastTimer = setTimeout(() => {
        state.fastTimer = null;
        if (documents.get(state.document.uri) === state) runFast(state);
      }, Math.min(state.fastDuration, 250));
    }
  }

  /** Fast checks of the current text, published at once; then the slow analyses are scheduled. */
  function runFast(state: DocumentState): void {
    const started = performance.now();
    // Without a debounce, a document whose fast check takes long (a large plant) hands its text
    // to the worker first: the worker's own parse then overlaps this check instead of following it.
    const startedEarly = settings.debounceMs <= 0 && state.fastDuration >= EARLY_SLOW_AFTER_FAST_MS;
    if (startedEarly) void analyseSlow(state, state.document.version, state.document.getText());
    try {
      state.fast = checkText(state.document.getText());
    } catch (error) {
      log(`fast check failed: ${error instanceof Error ? error.stack ?? error.message : String(error)}`);
      return;
    }
    state.fastVersion = state.document.version;
    state.previous = state.slow ?? state.previous;
    state.slow = null;
    state.fastEnded = performance.now();
    state.fastDuration = state.fastEnded - started;
    publish(state, [...state.fast.diagnostics, ...state.carried].sort(byPosition));
    traceMark('server: fast diagnostics published');
    if (!startedEarly) scheduleSlow(state);
  }

  /** Brings the fast check up to the current text (before answering with edits). */
  function flush(state: DocumentState): DocumentState {
    if (state.fastTimer || state.fastVersion !== state.document.version) {
      if (state.fastTimer) clearTimeout(state.fastTimer);
      state.fastTimer = null;
      runFast(state);
    }
    return state;
  }

  function scheduleSlow(state: DocumentState): void {
    state.slowTimer?.();
    const start = () => {
      state.slowTimer = null;
      if (documents.get(state.document.uri) === state) void analyseSlow(state, state.fastVersion, state.fast.text);
    };
    // Even without debounce, wait one turn: an edit already queued then replaces this one cheaply.
    // That turn is an immediate, not a zero timeout, which Node stretches to a millisecond.
    if (settings.debounceMs > 0) {
      const timer = setTimeout(start, settings.debounceMs);
      state.slowTimer = () => clearTimeout(timer);
    } else {
      const immediate = setImmediate(start);
      state.slowTimer = () => clearImmediate(immediate);
    }
  }

  /** The slow analyses of `text` (version `version`); published only if the document is still at that version and its fast check too. */
  async function analyseSlow(state: DocumentState, version: number, text: string): Promise<void> {
    const uri = state.document.uri;
    const outcome = await runner.analyse(uri, version, text, settings.analysis, largestPlant(state.fast));
    traceMark('server: analysis resumed');
    // A result for an older text is never published.
    if (documents.get(uri) !== state || state.fastVersion !== version || state.document.version !== version) return;
    if ('superseded' in outcome) return;
    if ('error' in outcome) {
      log(`analysis of ${uri} (version ${version}) failed: ${outcome.error}`);
      state.carried = [];
      publish(state, state.fast.diagnostics);
    } else {
      state.slow = outcome.result;
      state.carried = outcome.result.slowDiagnostics;
      publish(state, outcome.result.diagnostics);
    }
    void connection.sendNotification(ANALYSIS_UPDATED, { uri, version });
    traceMark('server: analysis published');
    if (capabilities.workspace?.codeLens?.refreshSupport) void connection.sendRequest(CodeLensRefreshRequest.type).catch(() => undefined);
    if (capabilities.workspace?.inlayHint?.refreshSupport) void connection.languages.inlayHint.refresh().catch(() => undefined);
  }

  async function pullSettings(): Promise<void> {
    if (!configurationPull) return;
    try {
      const raw = await connection.workspace.getConfiguration({ section: 'loopwright' });
      settings = readServerSettings(raw);
    } catch (error) {
      log(`reading settings failed: ${error instanceof Error ? error.message : String(error)}`);
    }
  }

  function reanalyseAll(): void {
    for (const state of documents.values()) {
      stopTimers(state);
      runner.cancel(state.document.uri);
      runFast(state);
    }
  }

  connection.onInitialize((params): InitializeResult => {
    capabilities = params.capabilities;
    settings = settingsFromInitializationOptions(params.initializationOptions);
    configurationPull = !!capabilities.workspace?.configuration;
    return {
      capabilities: {
        textDocumentSync: { openClose: true, change: TextDocumentSyncKind.Incremental, save: false },
        hoverProvider: true,
        // No trigger characters: a list popping up after a space or comma would take the Enter of a matrix row.
        completionProvider: { resolveProvider: false },
        signatureHelpProvider: { triggerCharacters: ['(', ','], retriggerCharacters: [','] },
        definitionProvider: true,
        referencesProvider: true,
        documentHighlightProvider: true,
        documentSymbolProvider: { label: 'Loopwright' },
        codeActionProvider: { codeActionKinds: ['quickfix'] },
        codeLensProvider: { resolveProvider: false },
        documentFormattingProvider: true,
        renameProvider: { prepareProvider: true },
        foldingRangeProvider: true,
        semanticTokensProvider: { legend: semanticTokensLegend, full: true, range: false },
        inlayHintProvider: { resolveProvider: false },
      },
      serverInfo: { name: SERVER_NAME, version: SERVER_VERSION },
    };
  });

  connection.onInitialized(async () => {
    runner.warm();
    if (configurationPull) {
      await pullSettings();
      if (capabilities.workspace?.didChangeConfiguration?.dynamicRegistration) {
        void connection.client.register(DidChangeConfigurationNotification.type, { section: 'loopwright' }).catch(() => undefined);
      }
      reanalyseAll();
    }
  });

  connection.onDidChangeConfiguration(async (params) => {
    try {
      if (configurationPull) await pullSettings();
      else {
        const section = (params.settings as Record<string, unknown> | null)?.loopwright;
        if (section !== undefined) settings = readServerSettings(section);
      }
      reanalyseAll();
    } catch (error) {
      log(`settings change failed: ${error instanceof Error ? error.message : String(error)}`);
    }
  });

  connection.onDidOpenTextDocument((params) => {
    const { uri, languageId, version, text } = params.textDocument;
    try {
      openDocument(TextDocument.create(uri, languageId, version, text));
    } catch (error) {
      log(`open failed: ${error instanceof Error ? error.stack ?? error.message : String(error)}`);
    }
  });

  connection.onDidChangeTextDocument((params) => {
    const state = documents.get(params.textDocument.uri);
    if (!state) return;
    try {
      changeDocument(state, params.contentChanges, params.textDocument.version);
    } catch (error) {
      log(`change failed: ${error instanceof Error ? error.stack ?? error.message : String(error)}`);
    }
  });

  connection.onDidCloseTextDocument((params) => {
    const uri = params.textDocument.uri;
    const state = documents.get(uri);
    if (state) stopTimers(state);
    runner.cancel(uri);
    runner.forget(uri);
    documents.delete(uri);
    void connection.sendDiagnostics({ uri, diagnostics: [] });
  });

  const stateOf = (uri: string) => documents.get(uri);

  connection.onHover(
    guard('hover', null, (params) => {
      const state = stateOf(params.textDocument.uri);
      const hover = state && hoverAt(viewOf(state), params.position);
      return hover ? toLspHover(hover) : null;
    }),
  );

  connection.onCompletion(
    guard('completion', [], (params) => {
      const state = stateOf(params.textDocument.uri);
      if (!state) return [];
      const snippets = !!capabilities.textDocument?.completion?.completionItem?.snippetSupport;
      return completions(state.fast, params.position).map((record) => toLspCompletionItem(record, snippets));
    }),
  );

  connection.onSignatureHelp(
    guard('signature help', null, (params) => {
      const state = stateOf(params.textDocument.uri);
      const help = state && signatureHelp(state.fast, params.position);
      return help ? toLspSignatureHelp(help) : null;
    }),
  );

  connection.onDefinition(
    guard('definition', null, (params) => {
      const state = stateOf(params.textDocument.uri);
      const range = state && definitionAt(state.fast, params.position);
      return range ? { uri: params.textDocument.uri, range } : null;
    }),
  );

  connection.onReferences(
    guard('references', [], (params) => {
      const state = stateOf(params.textDocument.uri);
      if (!state) return [];
      return referencesAt(state.fast, params.position, params.context.includeDeclaration).map((range) => ({ uri: params.textDocument.uri, range }));
    }),
  );

  connection.onDocumentHighlight(
    guard('highlight', [], (params) => {
      const state = stateOf(params.textDocument.uri);
      if (!state) return [];
      return highlightsAt(state.fast, params.position).map((highlight) => ({ range: highlight.range, kind: highlight.write ? 3 : 2 }));
    }),
  );

  connection.onDocumentSymbol(
    guard('document symbols', [], (params) => {
      const state = stateOf(params.textDocument.uri);
      return state ? documentSymbols(state.fast).map(toLspDocumentSymbol) : [];
    }),
  );

  connection.onCodeAction(
    guard('code actions', [], (params) => {
      const state = stateOf(params.textDocument.uri);
      if (!state) return [];
      const view = viewOf(flush(state));
      // Prefer our own record of each diagnostic (the client may drop `data`).
      const pairs = params.context.diagnostics.map((lsp) => {
        const own = view.diagnostics.find(
          (diagnostic) =>
            diagnostic.code === String(lsp.code ?? '') &&
            diagnostic.range.start.line === lsp.range.start.line &&
            diagnostic.range.start.character === lsp.range.start.character &&
            diagnostic.range.end.line === lsp.range.end.line &&
            diagnostic.range.end.character === lsp.range.end.character,
        );
        return { lsp, own: own ?? fromLspDiagnostic(lsp) };
      });
      const fixes = codeActions(view, params.range, pairs.map((pair) => pair.own));
      return fixes.map((fix) => toLspCodeAction(fix, params.textDocument.uri, pairs.find((pair) => pair.own === fix.diagnostic)?.lsp as LspDiagnostic | undefined));
    }),
  );

  connection.onCodeLens(
    guard('code lenses', [], (params) => {
      const state = stateOf(params.textDocument.uri);
      if (!state) return [];
      return codeLenses(viewOf(state), settings.lenses).map((lens) => toLspCodeLens(lens, params.textDocument.uri));
    }),
  );

  connection.onDocumentFormatting(
    guard('formatting', [], (params) => {
      const state = stateOf(params.textDocument.uri);
      return state ? formatDocument(flush(state).fast.text).map(toLspTextEdit) : [];
    }),
  );

  connection.onPrepareRename(
    guard('prepare rename', null, (params) => {
      const state = stateOf(params.textDocument.uri);
      return state ? prepareRename(flush(state).fast, params.position) : null;
    }),
  );

  connection.onRenameRequest(async (params) => {
    const state = stateOf(params.textDocument.uri);
    if (!state) return null;
    let result;
    try {
      result = renameAt(flush(state).fast, params.position, params.newName);
    } catch (error) {
      log(`rename failed: ${error instanceof Error ? error.stack ?? error.message : String(error)}`);
      return null;
    }
    if ('error' in result) throw new Error(result.error); // shown to the user by the client
    return { changes: { [params.textDocument.uri]: result.edits.map(toLspTextEdit) } };
  });

  connection.onFoldingRanges(
    guard('folding', [], (params) => {
      const state = stateOf(params.textDocument.uri);
      return state ? foldingRanges(state.fast).map(toLspFoldingRange) : [];
    }),
  );

  connection.languages.semanticTokens.on(
    guard('semantic tokens', { data: [] }, (params) => {
      const state = stateOf(params.textDocument.uri);
      return state ? toLspSemanticTokens(semanticTokens(state.fast)) : { data: [] };
    }),
  );

  connection.languages.inlayHint.on(
    guard('inlay hints', [], (params) => {
      const state = stateOf(params.textDocument.uri);
      return state ? inlayHints(state.fast, params.range).map(toLspInlayHint) : [];
    }),
  );

  // ---------------------------------------------------------------- client protocol

  connection.onRequest(
    CONTROLLERS_REQUEST,
    guard('controllers', { controllers: [] }, (params: { uri: string }) => {
      const state = stateOf(params.uri);
      if (!state) return { controllers: [] };
      const view = viewOf(state);
      return {
        controllers: view.model.controllers.map((controller, index) => ({
          name: controller.name,
          plant: controller.plantName,
          designed: controllerReportAt(view, index)?.designed ?? false,
          line: controller.range.start.line,
        })),
      };
    }),
  );

  connection.onRequest(
    CONTROLLER_DATA_REQUEST,
    guard('controller data', null, (params: { uri: string; controller: string }) => {
      const state = stateOf(params.uri);
      if (!state) return { report: null, plant: null, version: -1 };
      const analysis = fullAnalysis(state);
      const version = state.document.version;
      if (!analysis) return { report: null, plant: null, version, skipped: { reason: 'pending', detail: 'analysis in progress' } };
      const index = analysis.model.controllers.findIndex((controller) => controller.name === params.controller);
      const report = index >= 0 ? analysis.controllers[index] ?? null : null;
      const plantIndex = index >= 0 ? analysis.model.controllers[index].plantIndex : null;
      const plant = plantIndex === null ? null : analysis.plants[plantIndex] ?? null;
      return { report, plant, version, ...(analysis.skipped ? { skipped: analysis.skipped } : {}) };
    }),
  );

  connection.onRequest(
    EXPORT_REQUEST,
    guard('export', { text: null, reason: 'export failed (see the server log)' }, (params: { uri: string; controller: string; format: ExportFormat }) => {
      const state = stateOf(params.uri);
      const analysis = state && fullAnalysis(state);
      if (!state || !analysis) return { text: null, reason: 'the analysis is not finished yet' };
      const sourceHash = createHash('sha256').update(state.fast.text).digest('hex');
      return exportController(analysis, params.controller, params.format, { version: SERVER_VERSION, sourceHash });
    }),
  );

  connection.onRequest(
    REPORT_REQUEST,
    guard('report', { html: '' }, async (params: { uri: string }) => {
      const state = stateOf(params.uri);
      const analysis = state && fullAnalysis(state);
      if (!state || !analysis) return { html: '' };
      return { html: reportHtml(params.uri, state.fast.text, analysis, SERVER_VERSION) };
    }),
  );

  connection.onShutdown(() => {
    for (const state of documents.values()) stopTimers(state);
    runner.dispose();
  });

  connection.listen();
}
