// `loopwright/report`: the self-contained HTML design report (the renderer the CLI uses), with
// the plot script bundled beside the server (dist/report.js); a plain page when it is missing.
import { existsSync, readFileSync } from 'node:fs';
import { createHash } from 'node:crypto';
import { join } from 'node:path';
import type { DocumentAnalysis } from '../analyze';
import { renderHtmlReport } from '../render/html';
import { renderText } from '../render/text';

function escapeHtml(text: string): string {
  return text.replace(/[&<>"]/g, (c) => ({ '&': '&amp;', '<': '&lt;', '>': '&gt;', '"': '&quot;' })[c]!);
}

export function reportHtml(uri: string, text: string, analysis: DocumentAnalysis, version: string): string {
  let name = uri.replace(/^.*\//, '');
  try {
    name = decodeURIComponent(name);
  } catch {
    // keep the encoded name
  }
  const directory = typeof __dirname === 'string' ? __dirname : '.';
  const scriptPath = join(directory, 'report.js');
  const stylePath = join(directory, 'report.css');
  if (!existsSync(scriptPath)) {
    return `<!doctype html><meta charset="utf-8"><title>${escapeHtml(name)}</title><pre>${escapeHtml(renderText(name, analysis))}</pre>`;
  }
  return renderHtmlReport(
    name,
    text,
    analysis,
    { tool: 'loopwright', version, sourceHash: createHash('sha256').update(text).digest('hex') },
    { script: readFileSync(scriptPath, 'utf8'), style: existsSync(stylePath) ? readFileSync(stylePath, 'utf8') : '' },
  );
}
