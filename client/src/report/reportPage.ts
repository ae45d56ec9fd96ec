/// <reference lib="dom" />
// Script of the self-contained HTML design report (bundled to dist/report.js and inlined by
// `loopwright report`): draws each controller's plots with the same module as the response panel.
import 'uplot/dist/uPlot.min.css';
import { renderControllerPlots, type PlotData, type PlotTheme } from '../plots/index';

function reportTheme(): PlotTheme {
  const dark = window.matchMedia?.('(prefers-color-scheme: dark)').matches ?? false;
  return dark
    ? { foreground: '#e4e4e4', muted: '#a8a8a8', grid: '#ffffff22', background: '#1d1f21', fontFamily: 'system-ui, sans-serif',
        palette: ['#6aa8ff', '#f0a050', '#62c27a', '#b48ee8', '#d8c05a'], limit: '#e26d6d' }
    : { foreground: '#222', muted: '#666', grid: '#00000018', background: '#fff', fontFamily: 'system-ui, sans-serif',
        palette: ['#2f6bc1', '#c86f1d', '#2e8a4a', '#7b4fb5', '#a88d16'], limit: '#b83a3a' };
}

const dataElement = document.getElementById('lw-data');
const controllers = dataElement ? (JSON.parse(dataElement.textContent ?? '[]') as PlotData[]) : [];
let rendered = 0;
controllers.forEach((data, index) => {
  const host = document.getElementById(`lw-plots-${index}`);
  if (!host) return;
  renderControllerPlots(host, data, reportTheme());
  rendered++;
});
document.body.dataset.plotsRendered = String(rendered);
