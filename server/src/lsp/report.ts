// `loopwright/report`: an HTML design report of the document, rendered by the shared report
// renderer when it is present; a plain fallback page otherwise.
import type { DocumentAnalysis } from '../analyze';
import { renderText } from '../render/text';

function escapeHtml(text: string): string {
  return text.replace(/[&<>"]/g, (c) => ({ '&': '&amp;', '<': '&lt;', '>': '&gt;', '"': '&quot;' })[c]!);
}

export function reportHtml(uri: string, _text: string, analysis: DocumentAnalysis, _version: string): string {
  const name = decodeURIComponent(uri.replace(/^.*\//, ''));
  return `<!doctype html><meta charset="utf-8"><title>${escapeHtml(name)}</title><pre>${escapeHtml(renderText(name, analysis))}</pre>`;
}
