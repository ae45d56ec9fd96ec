// The self-contained HTML design report for reviews: the model, every verdict, the gains, the
// plots (drawn by the same plot module as the editor's response panel) and the cautions.
// One file, no network: the plot script and styles are inlined under a nonce-based policy.
import { randomBytes } from 'node:crypto';
import type { DocumentAnalysis } from '../analyze';
import type { Complex, Rows } from '../model/types';
import { formatComplex, formatNumber, formatPoleList } from './format';
import { jsonSafe } from './json';
import { diagnosticLine, SAFETY_CAUTION } from './text';

export interface ReportAssets {
  /** The bundled plot script (dist/report.js) and its styles (dist/report.css). */
  script: string;
  style: string;
}

export interface ReportIdentity {
  tool: string;
  version: string;
  sourceHash: string;
}

function escapeHtml(text: string): string {
  return text.replace(/[&<>"']/g, (c) => ({ '&': '&amp;', '<': '&lt;', '>': '&gt;', '"': '&quot;', "'": '&#39;' })[c] as string);
}

/** JSON inside a <script type="application/json"> must not close the element. */
function scriptSafeJson(value: unknown): string {
  return JSON.stringify(value).replace(/</g, '\\u003c').replace(/>/g, '\\u003e').replace(/&/g, '\\u0026');
}

function matrixTable(name: string, rows: Rows | null | undefined, rowNames?: string[], columnNames?: string[]): string {
  if (!rows || rows.length === 0) return '';
  const header = columnNames ? `<tr><th></th>${columnNames.map((c) => `<th>${escapeHtml(c)}</th>`).join('')}</tr>` : '';
  const body = rows
    .map((row, i) => `<tr>${rowNames ? `<th>${escapeHtml(rowNames[i] ?? '')}</th>` : '<th></th>'}${row.map((v) => `<td>${formatNumber(v, 6)}</td>`).join('')}</tr>`)
    .join('');
  return `<figure class="matrix"><figcaption>${escapeHtml(name)}</figcaption><table>${header}${body}</table></figure>`;
}

function poleCell(values: Complex[] | null | undefined): string {
  return values && values.length ? escapeHtml(formatPoleList(values)) : '—';
}

const STYLE = `
:root { color-scheme: light dark; --fg: #1f2328; --muted: #5b636d; --line: #d5d9de; --bad: #b3261e; --warn: #8a5a00; --ok: #1c6b3a; --band: #f4f6f8; }
@media (prefers-color-scheme: dark) { :root { --fg: #e6e6e6; --muted: #a5adb7; --line: #3b4048; --bad: #ff8a80; --warn: #ffcf66; --ok: #7bd88f; --band: #23272d; } body { background: #1b1d20; } }
body { font: 15px/1.5 system-ui, sans-serif; color: var(--fg); max-width: 1100px; margin: 2rem auto; padding: 0 1.2rem; }
h1 { font-size: 1.6rem; margin-bottom: .2rem; } h2 { border-bottom: 2px solid var(--line); padding-bottom: .2rem; margin-top: 2.2rem; }
.meta { color: var(--muted); font-size: .85rem; }
.caution { border-left: 4px solid var(--warn); background: var(--band); padding: .6rem 1rem; }
pre.source { background: var(--band); padding: .8rem; overflow-x: auto; font-size: .85rem; }
table { border-collapse: collapse; font-variant-numeric: tabular-nums; }
td, th { border: 1px solid var(--line); padding: .15rem .5rem; text-align: right; }
th { color: var(--muted); font-weight: 600; }
figure.matrix { display: inline-block; margin: .4rem 1.2rem .4rem 0; vertical-align: top; }
figure.matrix figcaption { font-weight: 600; }
dl.facts { display: grid; grid-template-columns: max-content 1fr; gap: .2rem 1rem; }
dl.facts dt { color: var(--muted); }
.sev-error { color: var(--bad); } .sev-warning { color: var(--warn); } .sev-info { color: var(--muted); }
ul.findings { list-style: none; padding-left: 0; } ul.findings li { margin: .2rem 0; font-family: ui-monospace, monospace; font-size: .85rem; }
`;

export function renderHtmlReport(
  path: string,
  source: string,
  analysis: DocumentAnalysis,
  identity: ReportIdentity,
  assets: ReportAssets,
): string {
  const nonce = randomBytes(16).toString('base64');
  const sections: string[] = [];
  const plotData: unknown[] = [];

  analysis.model.plants.forEach((plant, index) => {
    const report = analysis.plants[index];
    const stateNames = plant.states.map((s) => s.name);
    const inputNames = plant.inputs.map((s) => s.name);
    const outputNames = plant.outputs.map((s) => s.name);
    const facts: [string, string][] = [
      ['form', plant.form],
      ['states', stateNames.join(', ')],
      ['inputs', inputNames.join(', ')],
      ['outputs', outputNames.join(', ')],
    ];
    if (plant.operatingPoint) {
      facts.push(['operating point', `x0 = [${plant.operatingPoint.states.map((v) => formatNumber(v)).join(', ')}], u0 = [${plant.operatingPoint.inputs.map((v) => formatNumber(v)).join(', ')}] — the model is in deviation variables${plant.operatingPoint.isEquilibrium ? '' : ' (not an equilibrium)'}`]);
    }
    if (report?.analysed) {
      facts.push(['open-loop poles', `${poleCell(report.eigenvalues)} (${report.stability ?? '—'})`]);
      facts.push(['controllable', report.controllable === null ? '—' : report.controllable ? 'yes' : `no (uncontrollable: ${poleCell(report.uncontrollableModes.map((m) => m.value))})`]);
      facts.push(['observable', report.observable === null ? '—' : report.observable ? 'yes' : `no (unobservable: ${poleCell(report.unobservableModes.map((m) => m.value))})`]);
      if (report.controllabilityMargin !== null) facts.push(['controllability margin', formatNumber(report.controllabilityMargin, 3)]);
      if (report.invariantZeros) facts.push(['invariant zeros', poleCell(report.invariantZeros)]);
    } else {
      facts.push(['analysis', plant.usable ? (analysis.skipped?.detail ?? 'not analysed') : 'not analysed: the model has errors']);
    }
    const modes = report?.modes.length
      ? `<table><tr><th>pole</th><th>ω<sub>n</sub> (rad/s)</th><th>ζ</th><th>τ (s)</th><th>stability</th></tr>${report.modes
          .map((m) => `<tr><td>${escapeHtml(formatComplex(m.value))}</td><td>${formatNumber(m.naturalFrequency, 4)}</td><td>${formatNumber(m.dampingRatio, 4)}</td><td>${formatNumber(m.timeConstant, 4)}</td><td>${m.stability}</td></tr>`)
          .join('')}</table>`
      : '';
    const matrices = plant.usable
      ? [
          matrixTable('A', plant.A, stateNames, stateNames),
          matrixTable('B', plant.B, stateNames, inputNames),
          matrixTable('C', plant.C, outputNames, stateNames),
          matrixTable('D', plant.D, outputNames, inputNames),
        ].join('')
      : '';
    sections.push(
      `<section class="plant"><h2>Plant ${escapeHtml(plant.name)}</h2><dl class="facts">${facts
        .map(([k, v]) => `<dt>${escapeHtml(k)}</dt><dd>${escapeHtml(v)}</dd>`)
        .join('')}</dl>${matrices}${modes}</section>`,
    );
  });

  analysis.model.controllers.forEach((controller, index) => {
    const report = analysis.controllers[index];
    const plant = controller.plantIndex === null ? undefined : analysis.model.plants[controller.plantIndex];
    const stateNames = plant?.states.map((s) => s.name) ?? [];
    const inputNames = plant?.inputs.map((s) => s.name) ?? [];
    const parts: string[] = [`<h2>Controller ${escapeHtml(controller.name)} for ${escapeHtml(controller.plantName)}</h2>`];
    if (!report?.designed) {
      parts.push('<p class="sev-error">Not designed — see the findings below.</p>');
    } else {
      const facts: [string, string][] = [
        ['design', `${report.method ?? '—'}, ${report.domain}${report.samplePeriod !== null ? `, T = ${formatNumber(report.samplePeriod)} s` : ''}`],
        [`closed-loop poles (${report.domain === 'discrete' ? 'z' : 's'})`, poleCell(report.closedLoopPoles)],
      ];
      if (report.trackedOutputs.length) {
        facts.push(['tracked outputs', report.trackedOutputs.join(', ')]);
      }
      for (const response of report.step) {
        const m = response.metrics;
        facts.push([
          `step ${response.steppedOutput} → ${formatNumber(m.setpoint)}`,
          `rise ${formatNumber(m.riseTime, 3)} s, settling (2 %) ${formatNumber(m.settlingTime, 3)} s, overshoot ${formatNumber(m.overshootPercent, 3)} %, steady-state error ${formatNumber(m.steadyStateError, 3)}`,
        ]);
      }
      parts.push(`<dl class="facts">${facts.map(([k, v]) => `<dt>${escapeHtml(k)}</dt><dd>${escapeHtml(v)}</dd>`).join('')}</dl>`);
      const integratorNames = controller.integral?.outputs.map((i) => `ξ(${plant?.outputs[i]?.name ?? i})`) ?? [];
      parts.push(matrixTable('K (u = −K x …)', report.K, inputNames, stateNames));
      if (report.Ki) parts.push(matrixTable('Ki (… − Ki ξ, ξ′ = r − y)', report.Ki, inputNames, integratorNames));
      if (report.prescaler) parts.push(matrixTable('prescaler N', report.prescaler, inputNames, report.trackedOutputs));
      if (report.dcGain) parts.push(matrixTable('closed-loop DC gain', report.dcGain, report.trackedOutputs, report.trackedOutputs));
      const observer = report.implementation?.observer;
      if (observer) parts.push(matrixTable(`observer gain L (${observer.form} form)`, observer.L, stateNames, plant?.outputs.map((s) => s.name)));
      parts.push(`<div class="plots" id="lw-plots-${plotData.length}"></div>`);
      plotData.push(jsonSafe({ ...report, diagnostics: undefined, implementation: undefined }));
    }
    sections.push(`<section class="controller">${parts.join('')}</section>`);
  });

  const findings = analysis.diagnostics.length
    ? `<ul class="findings">${analysis.diagnostics
        .map((d) => `<li class="sev-${d.severity}">${escapeHtml(diagnosticLine(path, d))}</li>`)
        .join('')}</ul>`
    : '<p>No findings.</p>';

  const policy = `default-src 'none'; script-src 'nonce-${nonce}'; style-src 'nonce-${nonce}' 'unsafe-inline'; img-src data:; font-src data:`;
  return `<!DOCTYPE html>
<html lang="en">
<head>
<meta charset="utf-8">
<meta http-equiv="Content-Security-Policy" content="${policy}">
<meta name="viewport" content="width=device-width, initial-scale=1">
<title>Design report — ${escapeHtml(path)}</title>
<style nonce="${nonce}">${STYLE}</style>
<style nonce="${nonce}">${assets.style}</style>
</head>
<body>
<h1>Design report</h1>
<p class="meta">${escapeHtml(path)} · source sha256 ${escapeHtml(identity.sourceHash)} · ${escapeHtml(identity.tool)} ${escapeHtml(identity.version)}</p>
<p class="caution"><strong>Caution.</strong> ${escapeHtml(SAFETY_CAUTION)}</p>
${sections.join('\n')}
<h2>Findings</h2>
${findings}
<h2>Model source</h2>
<pre class="source">${escapeHtml(source)}</pre>
<script type="application/json" id="lw-data">${scriptSafeJson(plotData)}</script>
<script nonce="${nonce}">${assets.script.replace(/<\/script/gi, '<\\/script')}</script>
</body>
</html>
`;
}
