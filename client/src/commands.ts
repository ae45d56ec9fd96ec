// The extension's commands. Code lenses pass a ControllerRef; from the command palette the
// controller is picked from the active plant document. Files are written only where the user
// chooses in a save dialog.
import * as vscode from 'vscode';
import type { LanguageClient } from 'vscode-languageclient/node';
import type { ResponsePanels } from './panel/responsePanel';
import {
  Commands,
  ControllersRequest,
  ExportRequest,
  ReportRequest,
  type ControllerRef,
  type ControllersResult,
  type ExportFormat,
  type ExportResult,
  type ReportResult,
} from './protocol';

export interface CommandContext {
  client: LanguageClient;
  panels: ResponsePanels;
  output: vscode.OutputChannel;
  restart: () => Promise<void>;
}

/** Accepts what a code lens sends (`{uri, controller}` with a string or Uri) and nothing else. */
export function asControllerRef(value: unknown): ControllerRef | undefined {
  if (typeof value !== 'object' || value === null) return undefined;
  const candidate = value as { uri?: unknown; controller?: unknown };
  if (typeof candidate.controller !== 'string') return undefined;
  const uri = candidate.uri instanceof vscode.Uri ? candidate.uri.toString() : candidate.uri;
  return typeof uri === 'string' ? { uri, controller: candidate.controller } : undefined;
}

function activePlantDocument(): vscode.TextDocument | undefined {
  const document = vscode.window.activeTextEditor?.document;
  return document?.languageId === 'plant' ? document : undefined;
}

async function pickController(context: CommandContext, argument: unknown): Promise<ControllerRef | undefined> {
  const given = asControllerRef(argument);
  if (given) return given;
  const document = activePlantDocument();
  if (!document) {
    void vscode.window.showInformationMessage('Open a .plant file with a controller block first.');
    return undefined;
  }
  const uri = document.uri.toString();
  const controllers = (await context.client.sendRequest<ControllersResult | null>(ControllersRequest, { uri }))?.controllers ?? [];
  if (controllers.length === 0) {
    void vscode.window.showInformationMessage('This plant file has no controller block.');
    return undefined;
  }
  if (controllers.length === 1) return { uri, controller: controllers[0].name };
  // Prefer the controller under the cursor; otherwise ask.
  const cursorLine = vscode.window.activeTextEditor?.selection.active.line ?? 0;
  const above = controllers.filter((c) => c.line <= cursorLine).sort((a, b) => b.line - a.line);
  const picked = await vscode.window.showQuickPick(
    controllers.map((c) => ({
      label: c.name,
      description: `for ${c.plant}${c.designed ? '' : ' — not designed'}`,
      picked: c === above[0],
    })),
    { placeHolder: 'Which controller?' },
  );
  return picked ? { uri, controller: picked.label } : undefined;
}

async function requestExport(context: CommandContext, ref: ControllerRef, format: ExportFormat): Promise<string | undefined> {
  const result = await context.client.sendRequest<ExportResult | null>(ExportRequest, { ...ref, format });
  if (!result || result.text === null) {
    void vscode.window.showWarningMessage(`No gains for “${ref.controller}”: ${result?.reason ?? 'the controller is not designed'}.`);
    return undefined;
  }
  return result.text;
}

function defaultTarget(documentUri: string, fileName: string): vscode.Uri | undefined {
  const uri = vscode.Uri.parse(documentUri);
  return uri.scheme === 'untitled' ? undefined : vscode.Uri.joinPath(uri, '..', fileName);
}

/** Runs a command body, reporting failures in words instead of leaving a rejected promise. */
function guarded(context: CommandContext, name: string, body: (argument: unknown) => Promise<void>) {
  return async (argument: unknown) => {
    try {
      await body(argument);
    } catch (error) {
      const detail = error instanceof Error ? error.message : String(error);
      context.output.appendLine(`[client] ${name} failed: ${detail}`);
      void vscode.window.showErrorMessage(`Loopwright: ${name} failed: ${detail}`);
    }
  };
}

export function registerCommands(context: CommandContext): vscode.Disposable[] {
  return [
    vscode.commands.registerCommand(
      Commands.copyGains,
      guarded(context, 'copying the gains', async (argument) => {
        const ref = await pickController(context, argument);
        if (!ref) return;
        const text = await requestExport(context, ref, 'text');
        if (text === undefined) return;
        await vscode.env.clipboard.writeText(text);
        vscode.window.setStatusBarMessage(`Gains of ${ref.controller} copied`, 4000);
      }),
    ),
    vscode.commands.registerCommand(
      Commands.showResponse,
      guarded(context, 'opening the response panel', async (argument) => {
        const ref = await pickController(context, argument);
        if (ref) await context.panels.show(ref);
      }),
    ),
    vscode.commands.registerCommand(
      Commands.exportGains,
      guarded(context, 'exporting the gains', async (argument) => {
        const ref = await pickController(context, argument);
        if (!ref) return;
        const choice = await vscode.window.showQuickPick(
          [
            { label: 'C header', description: 'constant arrays for firmware', format: 'c' as const, extension: 'h' },
            { label: 'JSON', description: 'gains, prescaler and poles as data', format: 'json' as const, extension: 'json' },
          ],
          { placeHolder: `Export the gains of ${ref.controller} as…` },
        );
        if (!choice) return;
        const text = await requestExport(context, ref, choice.format);
        if (text === undefined) return;
        const target = await vscode.window.showSaveDialog({
          defaultUri: defaultTarget(ref.uri, `${ref.controller}-gains.${choice.extension}`),
          filters: { [choice.label]: [choice.extension] },
          saveLabel: 'Export',
        });
        if (!target) return;
        await vscode.workspace.fs.writeFile(target, new TextEncoder().encode(text));
        void vscode.window.showInformationMessage(`Gains of ${ref.controller} written to ${vscode.workspace.asRelativePath(target)}.`);
      }),
    ),
    vscode.commands.registerCommand(
      Commands.writeReport,
      guarded(context, 'writing the design report', async (argument) => {
        const given = typeof argument === 'object' && argument !== null && 'uri' in argument ? String((argument as { uri: unknown }).uri) : undefined;
        const uri = given ?? activePlantDocument()?.uri.toString();
        if (!uri) {
          void vscode.window.showInformationMessage('Open a .plant file first.');
          return;
        }
        const base = vscode.Uri.parse(uri).path.split('/').pop()?.replace(/\.plant$/, '') || 'design';
        const target = await vscode.window.showSaveDialog({
          defaultUri: defaultTarget(uri, `${base}-report.html`),
          filters: { 'HTML report': ['html'] },
          saveLabel: 'Write Report',
        });
        if (!target) return;
        const result = await context.client.sendRequest<ReportResult | null>(ReportRequest, { uri });
        if (!result?.html) {
          void vscode.window.showWarningMessage('The analysis of this document is not finished yet; try again in a moment.');
          return;
        }
        const html = result.html;
        await vscode.workspace.fs.writeFile(target, new TextEncoder().encode(html));
        void vscode.window.showInformationMessage(`Design report written to ${vscode.workspace.asRelativePath(target)}.`);
      }),
    ),
    vscode.commands.registerCommand(
      Commands.restartServer,
      guarded(context, 'restarting the language server', async () => {
        context.output.appendLine('[client] restart requested');
        await context.restart();
      }),
    ),
  ];
}
