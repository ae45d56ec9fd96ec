// Extension entry: starts the Loopwright language server (dist/server.cjs over node IPC) for
// `plant` documents, forwards the `loopwright` settings, and contributes the commands that show,
// copy or save what the server computes. The client itself computes no numbers.
import * as vscode from 'vscode';
import {
  CloseAction,
  ErrorAction,
  LanguageClient,
  State,
  TransportKind,
  type CloseHandlerResult,
  type ErrorHandler,
  type ErrorHandlerResult,
  type LanguageClientOptions,
  type ServerOptions,
} from 'vscode-languageclient/node';
import { registerCommands } from './commands';
import { ResponsePanels } from './panel/responsePanel';
import { RestartBudget } from './restartBudget';
import {
  AnalysisUpdatedNotification,
  ControllerDataRequest,
  ControllersRequest,
  type AnalysisUpdatedParams,
  type ControllersResult,
  type ControllerDataParams,
  type ControllerDataResult,
} from './protocol';

let client: LanguageClient | undefined;

/** Restart policy after the server process ends unexpectedly (see RestartBudget). */
export class RestartPolicy implements ErrorHandler {
  private readonly budget = new RestartBudget();
  constructor(private readonly output: vscode.OutputChannel) {}

  error(_error: Error, _message: unknown, count: number | undefined): ErrorHandlerResult {
    // Transport errors: keep going unless the connection keeps failing.
    return { action: (count ?? 0) <= 3 ? ErrorAction.Continue : ErrorAction.Shutdown, handled: false };
  }

  closed(): CloseHandlerResult {
    if (!this.budget.allowRestart(Date.now())) {
      const minutes = this.budget.windowMs / 60_000;
      const message = `The Loopwright language server stopped ${this.budget.limit + 1} times in ${minutes} minutes and was not restarted. Run “Loopwright: Restart Language Server” after fixing the cause (see the Loopwright output).`;
      return { action: CloseAction.DoNotRestart, message };
    }
    this.output.appendLine(`[client] language server stopped unexpectedly; restarting (${this.budget.used}/${this.budget.limit}).`);
    return { action: CloseAction.Restart, handled: true };
  }

  /** Called on a deliberate restart, so earlier crashes do not count against the user's fresh start. */
  reset(): void {
    this.budget.reset();
  }
}

export async function activate(context: vscode.ExtensionContext): Promise<void> {
  const output = vscode.window.createOutputChannel('Loopwright', { log: true });
  const serverModule = vscode.Uri.joinPath(context.extensionUri, 'dist', 'server.cjs').fsPath;
  const serverOptions: ServerOptions = {
    run: { module: serverModule, transport: TransportKind.ipc },
    debug: { module: serverModule, transport: TransportKind.ipc, options: { execArgv: ['--nolazy', '--inspect=6019'] } },
  };
  const restartPolicy = new RestartPolicy(output);
  const clientOptions: LanguageClientOptions = {
    documentSelector: [{ language: 'plant' }],
    synchronize: { configurationSection: 'loopwright' },
    initializationOptions: { settings: JSON.parse(JSON.stringify(vscode.workspace.getConfiguration('loopwright'))) },
    outputChannel: output,
    errorHandler: restartPolicy,
  };
  const languageClient = new LanguageClient('loopwright', 'Loopwright', serverOptions, clientOptions);
  client = languageClient;

  const status = vscode.window.createStatusBarItem('loopwright.status', vscode.StatusBarAlignment.Right, 10);
  status.name = 'Loopwright';
  status.command = 'loopwright.restartServer';
  const showState = (state: State) => {
    status.text = state === State.Running ? '$(pulse) Loopwright' : state === State.Starting ? '$(sync~spin) Loopwright' : '$(debug-disconnect) Loopwright';
    status.tooltip =
      state === State.Running ? 'Loopwright language server running' : state === State.Starting ? 'Loopwright language server starting' : 'Loopwright language server stopped — click to restart';
  };
  showState(State.Starting);
  const updateVisibility = () => {
    if (vscode.window.activeTextEditor?.document.languageId === 'plant') status.show();
    else status.hide();
  };
  updateVisibility();

  const fetchControllerData = (params: ControllerDataParams) =>
    languageClient.sendRequest<ControllerDataResult | null>(ControllerDataRequest, params);
  const panels = new ResponsePanels(context.extensionUri, fetchControllerData);

  // Panels also refresh on edits (after the server's debounce) in case the server sends no update notice.
  const refreshTimers = new Map<string, ReturnType<typeof setTimeout>>();
  let cursorTimer: ReturnType<typeof setTimeout> | undefined;
  const scheduleRefresh = (uri: string) => {
    clearTimeout(refreshTimers.get(uri));
    const delay = vscode.workspace.getConfiguration('loopwright').get<number>('debounceMs', 150) + 350;
    refreshTimers.set(uri, setTimeout(() => panels.refreshDocument(uri), delay));
  };

  context.subscriptions.push(
    output,
    status,
    panels,
    languageClient.onDidChangeState((event) => showState(event.newState)),
    vscode.window.onDidChangeActiveTextEditor(updateVisibility),
    vscode.workspace.onDidChangeTextDocument((event) => {
      if (event.document.languageId === 'plant' && event.contentChanges.length > 0) scheduleRefresh(event.document.uri.toString());
    }),
    languageClient.onNotification(AnalysisUpdatedNotification, (params: AnalysisUpdatedParams) => {
      clearTimeout(refreshTimers.get(params.uri));
      panels.refreshDocument(params.uri);
    }),
    { dispose: () => refreshTimers.forEach((timer) => clearTimeout(timer)) },
    // The response panel follows the controller block under the cursor.
    vscode.window.onDidChangeTextEditorSelection((event) => {
      const document = event.textEditor.document;
      const uri = document.uri.toString();
      if (document.languageId !== 'plant' || !panels.hasPanelFor(uri)) return;
      clearTimeout(cursorTimer);
      const line = event.selections[0]?.active.line ?? 0;
      cursorTimer = setTimeout(() => {
        void languageClient.sendRequest<ControllersResult | null>(ControllersRequest, { uri }).then((result) => {
          const above = (result?.controllers ?? []).filter((c) => c.line <= line).sort((a, b) => b.line - a.line);
          if (above[0]) void panels.follow(uri, above[0].name);
        }, () => undefined);
      }, 200);
    }),
    { dispose: () => clearTimeout(cursorTimer) },
    ...registerCommands({
      client: languageClient,
      panels,
      output,
      restart: async () => {
        restartPolicy.reset();
        if (languageClient.state === State.Stopped) await languageClient.start();
        else await languageClient.restart();
      },
    }),
  );

  try {
    await languageClient.start();
  } catch (error) {
    output.appendLine(`[client] the language server did not start: ${error instanceof Error ? error.message : String(error)}`);
    void vscode.window.showErrorMessage('The Loopwright language server did not start; see the Loopwright output for details.');
  }
}

export async function deactivate(): Promise<void> {
  if (client) await client.stop();
  client = undefined;
}
