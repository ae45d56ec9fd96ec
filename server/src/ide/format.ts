// Formatting: consistent indentation (two spaces per block level), no trailing spaces, at most
// one blank line in a row, one final newline, and matrix literals with `, ` between entries and
// right-aligned columns, later rows under the first entry. Comments and the spacing inside
// other statements are kept as written. Idempotent: formatting formatted text changes nothing.
import { parsePlantText } from '../../../grammar/src/index';
import type { Expr, MatrixExpr } from '../../../grammar/src/ast';
import type { TextEdit } from './edits';
import { renderMatrix } from './codeActions';
import { itemExpressions } from './symbolIndex';
import { lex, tokenName } from './tokens';
import { lineBreakOf, positionAt } from './text';

const INDENT = '  ';

export function formatDocument(text: string): TextEdit[] {
  const formatted = formatText(text);
  return formatted === text ? [] : lineEdits(text, formatted);
}

export function formatText(text: string): string {
  const eol = lineBreakOf(text);
  let current = reindent(text, eol);
  for (let round = 0; round < 4; round++) {
    const next = alignMatrices(current, eol);
    if (next === current) break;
    current = next;
  }
  return current;
}

/** Pass 1: indentation by block depth, trailing spaces, blank lines, final newline. */
function reindent(text: string, eol: string): string {
  const lines = text.split(/\r\n|\r|\n/);
  const { tokens } = lex(text);
  // Per line: brace depth and bracket depth at its start, and whether it starts with `}`.
  const braceAtStart = new Array<number>(lines.length).fill(0);
  const bracketAtStart = new Array<number>(lines.length).fill(0);
  const startsWithClose = new Array<boolean>(lines.length).fill(false);
  const firstTokenSeen = new Array<boolean>(lines.length).fill(false);
  let braces = 0;
  let brackets = 0;
  let filled = 0; // lines [0, filled) have their start depths
  const fillUpTo = (line: number) => {
    for (; filled <= line && filled < lines.length; filled++) {
      braceAtStart[filled] = braces;
      bracketAtStart[filled] = brackets;
    }
  };
  for (const token of tokens) {
    const name = tokenName(token);
    const tokenLine = positionAt(text, token.startOffset).line;
    fillUpTo(tokenLine);
    if (name === 'Newline') continue;
    if (!firstTokenSeen[tokenLine]) {
      firstTokenSeen[tokenLine] = true;
      startsWithClose[tokenLine] = name === 'RCurly';
    }
    if (name === 'LCurly') braces++;
    else if (name === 'RCurly') braces = Math.max(0, braces - 1);
    else if (name === 'LSquare' || name === 'LParen') brackets++;
    else if (name === 'RSquare' || name === 'RParen') brackets = Math.max(0, brackets - 1);
  }
  fillUpTo(lines.length - 1);
  const out: string[] = [];
  let delta = 0;
  for (let i = 0; i < lines.length; i++) {
    const raw = lines[i].replace(/[ \t]+$/, '');
    const content = raw.trimStart();
    if (content === '') {
      if (out.length > 0 && out[out.length - 1] !== '') out.push('');
      continue;
    }
    if (bracketAtStart[i] > 0) {
      // A continuation line inside brackets: keep its place relative to the statement.
      const indent = Math.max(0, raw.length - content.length + delta);
      out.push(' '.repeat(indent) + content);
      continue;
    }
    const level = Math.max(0, braceAtStart[i] - (startsWithClose[i] ? 1 : 0));
    const indent = INDENT.repeat(level);
    delta = indent.length - (raw.length - content.length);
    out.push(indent + content);
  }
  while (out.length > 0 && out[out.length - 1] === '') out.pop();
  return out.length === 0 ? '' : out.join(eol) + eol;
}

/** Pass 2: rewrite matrix literals (outermost only) that hold no comments. */
function alignMatrices(text: string, eol: string): string {
  const parse = parsePlantText(text);
  if (parse.diagnostics.some((diagnostic) => diagnostic.severity === 'error')) return text;
  const matrices: MatrixExpr[] = [];
  const collect = (expression: Expr) => {
    if (expression.kind === 'matrix') {
      matrices.push(expression);
      return;
    }
    if (expression.kind === 'unary') collect(expression.operand);
    else if (expression.kind === 'binary') {
      collect(expression.left);
      collect(expression.right);
    } else if (expression.kind === 'call') expression.args.forEach(collect);
  };
  for (const declaration of parse.document.declarations) {
    for (const item of declaration.items) itemExpressions(item).forEach(collect);
  }
  // Rewrite from the last matrix to the first, so earlier offsets stay valid. A matrix after
  // another on the same line is measured before that one changes; the caller repeats the pass
  // until nothing changes, which settles such lines.
  let result = text;
  for (const matrix of [...matrices].sort((a, b) => b.startOffset - a.startOffset)) {
    const source = text.slice(matrix.startOffset, matrix.endOffset);
    if (source.includes('#') || !source.startsWith('[') || !source.endsWith(']')) continue;
    const cells = matrix.rows.map((row) => row.entries.map((entry) => text.slice(entry.startOffset, entry.endOffset)));
    if (cells.some((row) => row.some((cell) => /[\r\n]/.test(cell)))) continue;
    const normalised = cells.map((row) => row.map((cell) => cell.replace(/[ \t]+/g, ' ').trim()));
    const multiline = /[\r\n]/.test(source);
    const column = positionAt(text, matrix.startOffset).character;
    const rendered = renderMatrix(normalised, column, eol, multiline);
    if (rendered !== source) result = result.slice(0, matrix.startOffset) + rendered + result.slice(matrix.endOffset);
  }
  return result;
}

/** Edits turning `before` into `after`: changed lines between a common prefix and suffix. */
function lineEdits(before: string, after: string): TextEdit[] {
  const a = before.split(/(?<=\r\n|\r(?!\n)|\n)/);
  const b = after.split(/(?<=\r\n|\r(?!\n)|\n)/);
  let prefix = 0;
  while (prefix < a.length && prefix < b.length && a[prefix] === b[prefix]) prefix++;
  let suffix = 0;
  while (suffix < a.length - prefix && suffix < b.length - prefix && a[a.length - 1 - suffix] === b[b.length - 1 - suffix]) suffix++;
  const startOffset = a.slice(0, prefix).join('').length;
  const endOffset = before.length - a.slice(a.length - suffix).join('').length;
  const newText = b.slice(prefix, b.length - suffix).join('');
  return [{ range: { start: positionAt(before, startOffset), end: positionAt(before, endOffset) }, newText }];
}
