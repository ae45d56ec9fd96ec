/// <reference lib="dom" />
// Plots of one controller's analysis record, drawn into a container element. Pure with respect
// to the data: no editor API, no messaging, no numbers computed here (every value comes from
// the server's record); used by the response panel and by the HTML design report.
// Line charts use uPlot (MIT, canvas); the pole map is a small SVG drawn here.
import uPlot from 'uplot';
import { drawPoleMap } from './poleMap';
import { formatNumber, type PlotData, type PlotTheme, type Series } from './types';

export type { PlotData, PlotTheme } from './types';
export { formatNumber } from './types';

export interface PlotHandle {
  /** Re-lays the charts out at the container's current width. */
  resize(): void;
  destroy(): void;
}

/** Reads the plot colours from the editor's theme variables (falls back to neutral greys outside the editor). */
export function themeFromCss(element: HTMLElement = document.body): PlotTheme {
  const style = getComputedStyle(element);
  const read = (name: string, fallback: string) => style.getPropertyValue(name).trim() || fallback;
  return {
    foreground: read('--vscode-editor-foreground', '#333'),
    muted: read('--vscode-descriptionForeground', '#777'),
    grid: read('--vscode-editorWidget-border', read('--vscode-panel-border', '#8884')),
    background: read('--vscode-editor-background', '#fff'),
    fontFamily: read('--vscode-font-family', 'sans-serif'),
    palette: [
      read('--vscode-charts-blue', '#3a7bd5'),
      read('--vscode-charts-orange', '#d9822b'),
      read('--vscode-charts-green', '#3f9d58'),
      read('--vscode-charts-purple', '#8a5cc2'),
      read('--vscode-charts-yellow', '#bfa22a'),
    ],
    limit: read('--vscode-charts-red', '#c94545'),
  };
}

interface Panel {
  element: HTMLElement;
  chart?: uPlot;
  build: (width: number) => uPlot | undefined;
}

const chartHeight = 220;

/** Draws step response, control inputs, pole map and (when present) the frequency response. */
export function renderControllerPlots(container: HTMLElement, data: PlotData, theme: PlotTheme): PlotHandle {
  container.replaceChildren();
  container.classList.add('lw-plots');
  const panels: Panel[] = [];
  const syncKey = `lw-time-${Math.random().toString(36).slice(2)}`;

  const addSection = (title: string, kind: string): HTMLElement => {
    const section = document.createElement('section');
    section.className = `lw-plot lw-plot-${kind}`;
    section.dataset.plot = kind;
    const heading = document.createElement('h3');
    heading.textContent = title;
    section.append(heading);
    container.append(section);
    return section;
  };

  const step = data.step[0];
  if (step && step.time.length > 1) {
    const outputs: Series[] = step.outputs.map((s) => ({ label: s.name, values: s.values }));
    for (const [variant, dash] of [['saturated', [6, 4]], ['antiWindup', [2, 3]], ['nonlinear', [10, 3, 2, 3]]] as const) {
      const extra = step[variant];
      if (!extra) continue;
      for (const s of extra.outputs) outputs.push({ label: `${s.name} (${variantLabel(variant)})`, values: s.values, dash: [...dash] });
    }
    if (Number.isFinite(step.metrics.setpoint)) {
      outputs.push({ label: 'set-point', values: step.time.map(() => step.metrics.setpoint), dash: [1, 4], colour: theme.muted });
    }
    const section = addSection(`Step response: ${step.steppedOutput}`, 'outputs');
    panels.push(linePanel(section, step.time, outputs, { x: 'time (s)', y: step.outputs.map((o) => o.name).join(', ') || 'output' }, theme, syncKey));

    const inputs: Series[] = step.inputs.map((s) => ({ label: s.name, values: s.values }));
    for (const [variant, dash] of [['saturated', [6, 4]], ['antiWindup', [2, 3]], ['nonlinear', [10, 3, 2, 3]]] as const) {
      const extra = step[variant];
      if (!extra) continue;
      for (const s of extra.inputs) inputs.push({ label: `${s.name} (${variantLabel(variant)})`, values: s.values, dash: [...dash] });
    }
    for (const s of step.inputs) {
      if (!s.limit) continue;
      const [low, high] = s.limit;
      inputs.push({ label: `${s.name} upper limit`, values: step.time.map(() => high), dash: [8, 3, 1, 3], colour: theme.limit });
      inputs.push({ label: `${s.name} lower limit`, values: step.time.map(() => low), dash: [8, 3, 1, 3], colour: theme.limit });
    }
    const inputSection = addSection('Control inputs', 'inputs');
    panels.push(linePanel(inputSection, step.time, inputs, { x: 'time (s)', y: step.inputs.map((i) => i.name).join(', ') || 'input' }, theme, syncKey));
    container.append(metricsTable(step.metrics));
  } else {
    const note = document.createElement('p');
    note.className = 'lw-empty';
    note.textContent = 'No step response: the controller is not designed yet or has no step request.';
    container.append(note);
  }

  const poleSection = addSection(data.domain === 'discrete' ? 'Closed-loop poles (z-plane)' : 'Closed-loop poles (s-plane)', 'poles');
  const poleHost = document.createElement('div');
  poleSection.append(poleHost);
  panels.push({
    element: poleHost,
    build: (width) => {
      drawPoleMap(poleHost, data, theme, Math.min(width, 420));
      return undefined;
    },
  });

  const frequency = data.details?.frequencyResponse;
  if (frequency && frequency.omega.length > 1) {
    const key = `lw-freq-${Math.random().toString(36).slice(2)}`;
    const magnitude = addSection('Frequency response: magnitude', 'magnitude');
    panels.push(linePanel(magnitude, frequency.omega, [{ label: 'magnitude', values: frequency.magnitudeDb }], { x: 'frequency (rad/s)', y: 'magnitude (dB)' }, theme, key, true));
    const phase = addSection('Frequency response: phase', 'phase');
    panels.push(linePanel(phase, frequency.omega, [{ label: 'phase', values: frequency.phaseDeg }], { x: 'frequency (rad/s)', y: 'phase (deg)' }, theme, key, true));
  }

  const layout = () => {
    const width = Math.max(280, Math.floor(container.clientWidth || 640) - 8);
    for (const panel of panels) {
      if (panel.chart) panel.chart.setSize({ width, height: chartHeight });
      else panel.chart = panel.build(width); // the pole map redraws itself each time
    }
  };
  layout();
  container.dataset.rendered = 'true';
  return {
    resize: layout,
    destroy: () => {
      for (const panel of panels) panel.chart?.destroy();
      container.replaceChildren();
      delete container.dataset.rendered;
    },
  };
}

function variantLabel(variant: 'saturated' | 'antiWindup' | 'nonlinear'): string {
  return variant === 'saturated' ? 'with limits' : variant === 'antiWindup' ? 'anti-windup' : 'nonlinear model';
}

function linePanel(
  section: HTMLElement,
  x: number[],
  series: Series[],
  labels: { x: string; y: string },
  theme: PlotTheme,
  syncKey: string,
  logX = false,
): Panel {
  const host = document.createElement('div');
  section.append(host);
  const font = `12px ${theme.fontFamily}`;
  const axis = (label: string): uPlot.Axis => ({
    label,
    stroke: theme.foreground,
    font,
    labelFont: font,
    grid: { stroke: theme.grid, width: 1 },
    ticks: { stroke: theme.grid, width: 1 },
  });
  return {
    element: host,
    build: (width) =>
      new uPlot(
        {
          width,
          height: chartHeight,
          scales: { x: { time: false, ...(logX ? { distr: 3 } : {}) } },
          axes: [axis(labels.x), axis(labels.y)],
          cursor: { sync: { key: syncKey } },
          legend: { live: true },
          series: [
            { label: labels.x },
            ...series.map((s, i) => ({
              label: s.label,
              stroke: s.colour ?? theme.palette[i % theme.palette.length],
              width: 1.75,
              ...(s.dash ? { dash: s.dash } : {}),
              points: { show: false },
              value: (_u: uPlot, v: number | null) => (v === null ? '—' : formatNumber(v)),
            })),
          ],
        },
        [x, ...series.map((s) => s.values)] as uPlot.AlignedData,
        host,
      ),
  };
}

function metricsTable(metrics: PlotData['step'][number]['metrics']): HTMLElement {
  const table = document.createElement('table');
  table.className = 'lw-metrics';
  const rows: [string, string][] = [
    ['set-point', formatNumber(metrics.setpoint)],
    ['final value', formatNumber(metrics.finalValue)],
    ['rise time 10–90 %', withUnit(metrics.riseTime, 's')],
    ['settling time 2 %', withUnit(metrics.settlingTime, 's')],
    ['overshoot', withUnit(metrics.overshootPercent, '%')],
    ['undershoot', withUnit(metrics.undershootPercent, '%')],
    ['steady-state error', formatNumber(metrics.steadyStateError)],
    ...metrics.peakInput.map((p): [string, string] => [
      `range of ${p.input}`,
      (p.min !== undefined && p.max !== undefined ? `${formatNumber(p.min)} … ${formatNumber(p.max)}` : formatNumber(p.value)) +
        (p.limit ? ` (limit ${formatNumber(p.limit[0])} … ${formatNumber(p.limit[1])})` : ''),
    ]),
  ];
  for (const [name, value] of rows) {
    const row = table.insertRow();
    const head = document.createElement('th');
    head.scope = 'row';
    head.textContent = name;
    row.append(head);
    row.insertCell().textContent = value;
  }
  return table;
}

function withUnit(value: number | null, unit: string): string {
  return value === null ? '—' : `${formatNumber(value)} ${unit}`;
}
