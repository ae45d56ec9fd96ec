// Plain ide/model records → protocol types. No mathematics here, only field mapping.
import {
  CodeActionKind,
  CompletionItemKind,
  DiagnosticSeverity,
  FoldingRangeKind,
  InlayHintKind,
  InsertTextFormat,
  MarkupKind,
  SymbolKind,
  type CodeAction,
  type CodeLens,
  type CompletionItem,
  type Diagnostic as LspDiagnostic,
  type DocumentSymbol,
  type FoldingRange,
  type Hover,
  type InlayHint,
  type SemanticTokens,
  type SignatureHelp,
  type TextEdit as LspTextEdit,
} from 'vscode-languageserver';
import type { Diagnostic } from '../model/types';
import type { CodeFix } from '../ide/codeActions';
import type { CodeLensRecord } from '../ide/codeLens';
import type { CompletionKind, CompletionRecord } from '../ide/completion';
import type { OutlineKind, OutlineSymbol } from '../ide/documentSymbols';
import type { FoldingRecord } from '../ide/folding';
import type { HoverResult } from '../ide/hover';
import type { InlayHintRecord } from '../ide/inlayHints';
import {
  SEMANTIC_TOKEN_MODIFIERS,
  SEMANTIC_TOKEN_TYPES,
  type SemanticTokenRecord,
} from '../ide/semanticTokens';
import type { SignatureRecord } from '../ide/signatureHelp';
import type { TextEdit } from '../ide/edits';

export const DIAGNOSTIC_SOURCE = 'loopwright';

const SEVERITY: Record<Diagnostic['severity'], DiagnosticSeverity> = {
  error: DiagnosticSeverity.Error,
  warning: DiagnosticSeverity.Warning,
  info: DiagnosticSeverity.Information,
};

export function toLspDiagnostic(diagnostic: Diagnostic, uri: string): LspDiagnostic {
  const result: LspDiagnostic = {
    range: diagnostic.range,
    severity: SEVERITY[diagnostic.severity] ?? DiagnosticSeverity.Error,
    code: diagnostic.code,
    source: DIAGNOSTIC_SOURCE,
    message: diagnostic.message,
  };
  if (diagnostic.related && diagnostic.related.length > 0) {
    result.relatedInformation = diagnostic.related.map((related) => ({
      location: { uri, range: related.range },
      message: related.message,
    }));
  }
  if (diagnostic.data) result.data = diagnostic.data;
  return result;
}

export function fromLspDiagnostic(diagnostic: LspDiagnostic): Diagnostic {
  const severity =
    diagnostic.severity === DiagnosticSeverity.Warning ? 'warning' : diagnostic.severity === DiagnosticSeverity.Error || diagnostic.severity === undefined ? 'error' : 'info';
  const result: Diagnostic = { severity, code: String(diagnostic.code ?? ''), message: typeof diagnostic.message === 'string' ? diagnostic.message : diagnostic.message.value, range: diagnostic.range };
  if (diagnostic.data && typeof diagnostic.data === 'object') result.data = diagnostic.data as Diagnostic['data'];
  return result;
}

export function toLspHover(hover: HoverResult): Hover {
  return { contents: { kind: MarkupKind.Markdown, value: hover.markdown }, range: hover.range };
}

export function toLspCodeLens(lens: CodeLensRecord, uri: string): CodeLens {
  return {
    range: lens.range,
    command: {
      title: lens.title,
      command: lens.command,
      arguments: lens.command ? lens.arguments.map((argument) => ({ uri, ...argument })) : undefined,
    },
  };
}

export function toLspTextEdit(edit: TextEdit): LspTextEdit {
  return { range: edit.range, newText: edit.newText };
}

export function toLspCodeAction(fix: CodeFix, uri: string, lspDiagnostic: LspDiagnostic | undefined): CodeAction {
  return {
    title: fix.title,
    kind: CodeActionKind.QuickFix,
    diagnostics: lspDiagnostic ? [lspDiagnostic] : undefined,
    isPreferred: fix.isPreferred,
    edit: { changes: { [uri]: fix.edits.map(toLspTextEdit) } },
  };
}

const COMPLETION_KIND: Record<CompletionKind, CompletionItemKind> = {
  keyword: CompletionItemKind.Keyword,
  snippet: CompletionItemKind.Snippet,
  class: CompletionItemKind.Class,
  variable: CompletionItemKind.Variable,
  constant: CompletionItemKind.Constant,
  function: CompletionItemKind.Function,
  unit: CompletionItemKind.Unit,
  property: CompletionItemKind.Property,
  field: CompletionItemKind.Field,
  event: CompletionItemKind.Event,
  value: CompletionItemKind.Value,
};

export function toLspCompletionItem(record: CompletionRecord, snippetSupport: boolean): CompletionItem {
  const item: CompletionItem = { label: record.label, kind: COMPLETION_KIND[record.kind] };
  if (record.detail) item.detail = record.detail;
  if (record.documentation) item.documentation = { kind: MarkupKind.Markdown, value: record.documentation };
  if (record.sortText) item.sortText = record.sortText;
  if (record.insertText) {
    if (record.snippet && snippetSupport) {
      item.insertText = record.insertText;
      item.insertTextFormat = InsertTextFormat.Snippet;
    } else {
      item.insertText = record.snippet ? stripSnippet(record.insertText) : record.insertText;
      item.insertTextFormat = InsertTextFormat.PlainText;
    }
  }
  return item;
}

/** Plain text of a snippet for clients without snippet support: placeholders become their defaults. */
export function stripSnippet(snippet: string): string {
  return snippet
    .replace(/\$\{\d+\|([^,|}]*)[^}]*\|\}/g, '$1')
    .replace(/\$\{\d+:([^}]*)\}/g, '$1')
    .replace(/\$\d+/g, '');
}

const SYMBOL_KIND: Record<OutlineKind, SymbolKind> = {
  plant: SymbolKind.Class,
  controller: SymbolKind.Object,
  param: SymbolKind.Constant,
  state: SymbolKind.Variable,
  input: SymbolKind.Field,
  output: SymbolKind.Property,
  disturbance: SymbolKind.Event,
  matrix: SymbolKind.Array,
  equation: SymbolKind.Function,
  design: SymbolKind.Method,
};

export function toLspDocumentSymbol(symbol: OutlineSymbol): DocumentSymbol {
  return {
    name: symbol.name,
    detail: symbol.detail,
    kind: SYMBOL_KIND[symbol.kind],
    range: symbol.range,
    selectionRange: symbol.selectionRange,
    children: symbol.children.map(toLspDocumentSymbol),
  };
}

export function toLspFoldingRange(record: FoldingRecord): FoldingRange {
  const range: FoldingRange = { startLine: record.startLine, endLine: record.endLine };
  if (record.kind === 'comment') range.kind = FoldingRangeKind.Comment;
  else if (record.kind === 'region') range.kind = FoldingRangeKind.Region;
  return range;
}

export function toLspInlayHint(record: InlayHintRecord): InlayHint {
  return {
    position: record.position,
    label: record.label,
    kind: record.kind === 'type' ? InlayHintKind.Type : InlayHintKind.Parameter,
    paddingLeft: record.paddingLeft,
    paddingRight: record.paddingRight,
    tooltip: record.tooltip,
  };
}

export function toLspSignatureHelp(record: SignatureRecord): SignatureHelp {
  return {
    signatures: [
      {
        label: record.label,
        documentation: record.documentation,
        parameters: record.parameters.map((parameter) => ({ label: parameter.label, documentation: parameter.documentation })),
      },
    ],
    activeSignature: 0,
    activeParameter: record.activeParameter,
  };
}

export const semanticTokensLegend = {
  tokenTypes: [...SEMANTIC_TOKEN_TYPES],
  tokenModifiers: [...SEMANTIC_TOKEN_MODIFIERS],
};

/** The protocol's relative encoding: line delta, start delta, length, type index, modifier bits. */
export function toLspSemanticTokens(records: SemanticTokenRecord[]): SemanticTokens {
  const data: number[] = [];
  let previousLine = 0;
  let previousCharacter = 0;
  for (const record of records) {
    const lineDelta = record.line - previousLine;
    const characterDelta = lineDelta === 0 ? record.character - previousCharacter : record.character;
    let bits = 0;
    for (const modifier of record.modifiers) bits |= 1 << SEMANTIC_TOKEN_MODIFIERS.indexOf(modifier);
    data.push(lineDelta, characterDelta, record.length, SEMANTIC_TOKEN_TYPES.indexOf(record.type), bits);
    previousLine = record.line;
    previousCharacter = record.character;
  }
  return { data };
}
