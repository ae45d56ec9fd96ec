// `loopwright/export`: one controller's gains as clipboard text, a C header or JSON. The C and
// JSON forms are the renderers the CLI uses; the text form is the language's own notation.
import type { DocumentAnalysis } from '../analyze';
import { renderCHeader } from '../render/cHeader';
import { renderExportJson } from '../render/exportJson';
import type { Rows } from '../model/types';

export type ExportFormat = 'text' | 'c' | 'json';

function matrixText(rows: Rows): string {
  return '[' + rows.map((row) => row.map((value) => String(value)).join(', ')).join('; ') + ']';
}

export function exportController(
  analysis: DocumentAnalysis,
  controllerName: string,
  format: ExportFormat,
  identity: { version: string; sourceHash: string },
): { text: string | null; reason?: string } {
  const index = analysis.model.controllers.findIndex((controller) => controller.name === controllerName);
  if (index < 0) return { text: null, reason: `no controller named ${controllerName}` };
  const report = analysis.controllers[index];
  if (!report || !report.designed || !report.K) return { text: null, reason: `controller ${controllerName} has no valid design` };
  if (format === 'text') {
    const lines = [`# ${report.name} for ${report.plant}${report.samplePeriod ? `, sample period ${report.samplePeriod} s` : ''}`];
    lines.push(`K = ${matrixText(report.K)}`);
    if (report.Ki) lines.push(`Ki = ${matrixText(report.Ki)}`);
    if (report.prescaler) lines.push(`N = ${matrixText(report.prescaler)}`);
    const observer = report.implementation?.observer;
    if (observer) lines.push(`L = ${matrixText(observer.L)}  # ${observer.form} estimator`);
    return { text: lines.join('\n') + '\n' };
  }
  if (!report.implementation) return { text: null, reason: `controller ${controllerName} has no implementation record` };
  const full = { tool: 'loopwright', version: identity.version, plant: report.plant, controller: report.name, sourceHash: identity.sourceHash };
  return {
    text: format === 'c' ? renderCHeader(report.implementation, full, 'double') : renderExportJson(report.implementation, full),
  };
}
