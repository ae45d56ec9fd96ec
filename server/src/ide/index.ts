// Editor features as pure functions of the fast check / analysis records and a position.
// The language server converts these plain records to protocol types (server/src/lsp).
export type { AnalysisView } from './view';
export { hoverAt, type HoverResult } from './hover';
export { codeLenses, type CodeLensRecord, type LensArgument, type LensCommand } from './codeLens';
export { defaultLensSettings, type LensSettings } from './lensSettings';
export { codeActions, type CodeFix } from './codeActions';
export { completions, type CompletionRecord, type CompletionKind } from './completion';
export { documentSymbols, type OutlineSymbol, type OutlineKind } from './documentSymbols';
export { definitionAt, referencesAt, highlightsAt, symbolAt } from './navigation';
export { renameAt, prepareRename, type RenameResult } from './rename';
export { formatDocument, formatText } from './format';
export {
  semanticTokens,
  SEMANTIC_TOKEN_TYPES,
  SEMANTIC_TOKEN_MODIFIERS,
  type SemanticTokenRecord,
} from './semanticTokens';
export { foldingRanges, type FoldingRecord } from './folding';
export { inlayHints, type InlayHintRecord } from './inlayHints';
export { signatureHelp, type SignatureRecord } from './signatureHelp';
export { applyEdits, type TextEdit } from './edits';
export { offsetAt, positionAt } from './text';
