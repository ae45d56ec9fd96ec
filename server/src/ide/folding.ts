// Folding: plant and controller blocks, multi-line matrices, runs of comment lines.
import type { FastCheck } from '../analyze';
import { itemExpressions, walkExpression } from './symbolIndex';
import { lex } from './tokens';
import { positionAt } from './text';

export interface FoldingRecord {
  startLine: number;
  endLine: number;
  kind?: 'comment' | 'region';
}

export function foldingRanges(fast: FastCheck): FoldingRecord[] {
  const folds: FoldingRecord[] = [];
  for (const declaration of fast.parse.document.declarations) {
    const { start, end } = declaration.range;
    // Keep the closing brace visible: fold up to the line before it.
    const endLine = fast.text[declaration.endOffset - 1] === '}' ? end.line - 1 : end.line;
    if (endLine > start.line) folds.push({ startLine: start.line, endLine, kind: 'region' });
    for (const item of declaration.items) {
      for (const expression of itemExpressions(item)) {
        walkExpression(expression, (node) => {
          if (node.kind === 'matrix' && node.range.end.line > node.range.start.line) {
            folds.push({ startLine: node.range.start.line, endLine: node.range.end.line });
          }
        });
      }
    }
  }
  let run: { start: number; end: number } | null = null;
  const flush = () => {
    if (run && run.end > run.start) folds.push({ startLine: run.start, endLine: run.end, kind: 'comment' });
    run = null;
  };
  for (const comment of lex(fast.text).comments) {
    const { line, character } = positionAt(fast.text, comment.startOffset);
    const wholeLine = fast.text.slice(comment.startOffset - character, comment.startOffset).trim() === '';
    if (!wholeLine) continue;
    if (run && line === run.end + 1) run.end = line;
    else {
      flush();
      run = { start: line, end: line };
    }
  }
  flush();
  return folds.sort((a, b) => a.startLine - b.startLine);
}
