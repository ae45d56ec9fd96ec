// The response panel: one webview per controller, fed with the server's controller record and
// refreshed when the document's analysis changes. Strict Content-Security-Policy with a nonce.
import { randomBytes } from 'node:crypto';
import * as vscode from 'vscode';
import type { ControllerDataResult, ControllerRef } from '../protocol';
import type { PanelReply, ReportMessage } from './messages';
import { panelHtml } from './panelHtml';

export type FetchControllerData = (ref: ControllerRef) => Promise<ControllerDataResult | null>;

export const responsePanelViewType = 'loopwright.response';

export class ResponsePanels implements vscode.Disposable {
  private readonly open = new Map<string, ResponsePanel>();

  constructor(
    private readonly extensionUri: vscode.Uri,
    private readonly fetch: FetchControllerData,
  ) {}

  async show(ref: ControllerRef): Promise<void> {
    const key = `${ref.uri}#${ref.controller}`;
    let panel = this.open.get(key);
    if (panel) {
      panel.reveal();
    } else {
      panel = new ResponsePanel(this.extensionUri, ref, this.fetch, () => this.open.delete(key));
      this.open.set(key, panel);
    }
    await panel.refresh();
  }

  /** Documents that have a panel open (the cursor is followed only there). */
  hasPanelFor(uri: string): boolean {
    for (const panel of this.open.values()) if (panel.ref.uri === uri) return true;
    return false;
  }

  /**
   * Follows the cursor: the most recently shown panel of this document switches to `controller`
   * (the controller block the cursor is in), unless a panel of that controller is already open.
   */
  async follow(uri: string, controller: string): Promise<void> {
    const target = `${uri}#${controller}`;
    if (this.open.has(target)) return;
    const panel = [...this.open.entries()].reverse().find(([, entry]) => entry.ref.uri === uri);
    if (!panel) return;
    const [key, entry] = panel;
    this.open.delete(key);
    entry.retarget({ uri, controller }, () => this.open.delete(target));
    this.open.set(target, entry);
    await entry.refresh();
  }

  /** Re-requests the data of every panel showing a controller of this document. */
  refreshDocument(uri: string): void {
    for (const panel of this.open.values()) if (panel.ref.uri === uri) void panel.refresh();
  }

  dispose(): void {
    for (const panel of [...this.open.values()]) panel.dispose();
    this.open.clear();
  }
}

class ResponsePanel {
  private readonly webview: vscode.WebviewPanel;
  private ready = false;
  private pending: ReportMessage | undefined;
  private generation = 0;

  constructor(
    extensionUri: vscode.Uri,
    public ref: ControllerRef,
    private readonly fetch: FetchControllerData,
    private onDispose: () => void,
  ) {
    const dist = vscode.Uri.joinPath(extensionUri, 'dist');
    this.webview = vscode.window.createWebviewPanel(
      responsePanelViewType,
      `Response: ${ref.controller}`,
      { viewColumn: vscode.ViewColumn.Beside, preserveFocus: true },
      { enableScripts: true, localResourceRoots: [dist], retainContextWhenHidden: false },
    );
    this.webview.iconPath = vscode.Uri.joinPath(extensionUri, 'client', 'media', 'icon.png');
    this.webview.webview.html = pageFor(this.webview.webview, dist, ref.controller);
    this.webview.webview.onDidReceiveMessage((reply: PanelReply) => {
      if (reply.type === 'ready') {
        this.ready = true;
        if (this.pending) void this.webview.webview.postMessage(this.pending);
      }
    });
    this.webview.onDidDispose(() => this.onDispose());
  }

  retarget(ref: ControllerRef, onDispose: () => void): void {
    this.ref = ref;
    this.onDispose = onDispose;
    this.webview.title = `Response: ${ref.controller}`;
  }

  reveal(): void {
    this.webview.reveal(undefined, true);
  }

  async refresh(): Promise<void> {
    const generation = ++this.generation;
    let message: ReportMessage;
    try {
      const result = await this.fetch(this.ref);
      if (generation !== this.generation) return; // a newer refresh is under way
      message = {
        type: 'report',
        title: `Response: ${this.ref.controller}`,
        report: result?.report ?? null,
        note: noteFor(result, this.ref.controller),
      };
    } catch (error) {
      if (generation !== this.generation) return;
      message = {
        type: 'report',
        title: `Response: ${this.ref.controller}`,
        report: null,
        note: `The language server did not answer: ${error instanceof Error ? error.message : String(error)}`,
      };
    }
    this.pending = message;
    if (this.ready) await this.webview.webview.postMessage(message);
  }

  dispose(): void {
    this.webview.dispose();
  }
}

function noteFor(result: ControllerDataResult | null, controller: string): string | undefined {
  if (!result) return 'The language server could not analyse this document; see the Loopwright output.';
  if (result.skipped?.reason === 'pending') return 'Analysis in progress…';
  if (!result.report) return `This document has no controller named “${controller}” any more.`;
  if (result.skipped) return `Analysis skipped: ${result.skipped.detail}.`;
  if (!result.report.designed) return `Controller “${controller}” is not designed yet; see the problems listed for it.`;
  return undefined;
}

function pageFor(webview: vscode.Webview, dist: vscode.Uri, controller: string): string {
  return panelHtml({
    cspSource: webview.cspSource,
    scriptUri: webview.asWebviewUri(vscode.Uri.joinPath(dist, 'webview.js')).toString(),
    styleUri: webview.asWebviewUri(vscode.Uri.joinPath(dist, 'webview.css')).toString(),
    nonce: randomBytes(16).toString('base64'),
    title: `Response: ${controller}`,
  });
}
