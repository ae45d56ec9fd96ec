/// <reference lib="dom" />
// Script of the response panel (runs inside the webview, bundled to dist/webview.js).
// Receives the server's controller record from the extension and draws it with the shared plots.
import 'uplot/dist/uPlot.min.css';
import './webview.css';
import { renderControllerPlots, themeFromCss, type PlotData, type PlotHandle } from '../plots/index';
import type { PanelMessage } from './messages';

declare function acquireVsCodeApi(): { postMessage(message: unknown): void; setState(state: unknown): void; getState(): unknown };

const vscode = acquireVsCodeApi();
const status = document.getElementById('status') as HTMLElement;
const plots = document.getElementById('plots') as HTMLElement;
let handle: PlotHandle | undefined;
let current: PlotData | undefined;

function draw(): void {
  handle?.destroy();
  handle = undefined;
  if (!current) return;
  handle = renderControllerPlots(plots, current, themeFromCss());
  vscode.postMessage({ type: 'rendered' });
}

window.addEventListener('message', (event: MessageEvent<PanelMessage>) => {
  const message = event.data;
  if (message.type !== 'report') return;
  document.title = message.title;
  status.textContent = message.note ?? '';
  status.hidden = !message.note;
  current = (message.report ?? undefined) as PlotData | undefined;
  vscode.setState({ report: current, title: message.title, note: message.note });
  if (current) draw();
  else {
    handle?.destroy();
    handle = undefined;
  }
});

// Follow theme switches (the editor changes the body class) and width changes.
new MutationObserver(() => draw()).observe(document.body, { attributes: true, attributeFilter: ['class'] });
let resizeQueued = false;
new ResizeObserver(() => {
  if (resizeQueued) return;
  resizeQueued = true;
  requestAnimationFrame(() => {
    resizeQueued = false;
    handle?.resize();
  });
}).observe(plots);

const saved = vscode.getState() as { report?: PlotData; note?: string } | undefined;
if (saved?.report) {
  current = saved.report;
  draw();
}
vscode.postMessage({ type: 'ready' });
