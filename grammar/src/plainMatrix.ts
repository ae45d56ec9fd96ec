// Folding of large all-number matrices. A 200-state plant has a 40,000-entry A matrix; running
// each entry through the general expression rules dominates parse time. When the bracket
// contents are only signed number literals, commas and row breaks, and are well formed, the
// tree is built here directly (identical to what the grammar builds) and the tokens are
// replaced by one `PlainNumberMatrix` token. Anything unusual falls back to the grammar, which
// also reports the errors.
import { createTokenInstance, type IToken } from 'chevrotain';
import type { Expr, MatrixExpr, MatrixRow, NumberExpr } from './ast';
import type { LineIndex } from './positions';
import * as T from './tokens';

/** Smaller matrices go through the grammar (cheap, and keeps that path exercised). */
export const FOLD_MIN_ENTRIES = 64;

function numberNode(token: IToken, lines: LineIndex): NumberExpr {
  const imaginary = token.tokenType === T.ImaginaryNumber;
  const start = token.startOffset;
  const end = start + token.image.length;
  return {
    kind: 'number',
    value: Number(imaginary ? token.image.slice(0, -1) : token.image),
    imaginary,
    text: token.image,
    range: lines.range(start, end),
    startOffset: start,
    endOffset: end,
  };
}

/** Try to read tokens[open] = `[` … matching `]`; undefined when anything is not plain. */
function readPlainMatrix(
  tokens: IToken[],
  open: number,
  lines: LineIndex,
): { node: MatrixExpr; close: number; entryCount: number } | undefined {
  const rows: MatrixRow[] = [];
  let entries: Expr[] = [];
  let afterComma = false;
  let entryCount = 0;
  const endRow = (): void => {
    if (entries.length === 0) return;
    const first = entries[0];
    const last = entries[entries.length - 1];
    rows.push({ kind: 'row', entries, ...lines.span(first.startOffset, last.endOffset) });
    entries = [];
  };
  for (let index = open + 1; index < tokens.length; index++) {
    const token = tokens[index];
    const type = token.tokenType;
    if (type === T.RSquare || type === T.Semicolon || type === T.Newline) {
      if (afterComma) return undefined;
      endRow();
      if (type === T.RSquare) {
        const start = tokens[open].startOffset;
        const end = token.startOffset + token.image.length;
        return { node: { kind: 'matrix', rows, ...lines.span(start, end) }, close: index, entryCount };
      }
      continue;
    }
    if (type === T.Comma) {
      if (entries.length === 0 || afterComma) return undefined;
      afterComma = true;
      continue;
    }
    let sign: IToken | undefined;
    let number = token;
    if (type === T.Minus || type === T.Plus) {
      sign = token;
      number = tokens[++index];
      if (!number) return undefined;
    }
    if (number.tokenType !== T.NumberLiteral && number.tokenType !== T.ImaginaryNumber) return undefined;
    if (entries.length > 0 && !afterComma) return undefined;
    const follower = tokens[index + 1]?.tokenType;
    if (follower !== T.Comma && follower !== T.Semicolon && follower !== T.Newline && follower !== T.RSquare) {
      return undefined;
    }
    const literal = numberNode(number, lines);
    const entry: Expr = sign
      ? {
          kind: 'unary',
          op: sign.image as '+' | '-',
          operand: literal,
          ...lines.span(sign.startOffset, literal.endOffset),
        }
      : literal;
    entries.push(entry);
    entryCount++;
    afterComma = false;
  }
  return undefined;
}

/**
 * Replace each large plain-number matrix by one PlainNumberMatrix token; its tree is stored in
 * `folded`. Returns the original array when nothing was folded.
 */
export function foldPlainNumberMatrices(
  tokens: IToken[],
  lines: LineIndex,
  folded: Map<IToken, MatrixExpr>,
  minEntries = FOLD_MIN_ENTRIES,
): IToken[] {
  let out: IToken[] | undefined;
  for (let index = 0; index < tokens.length; index++) {
    const token = tokens[index];
    if (token.tokenType === T.LSquare) {
      const plain = readPlainMatrix(tokens, index, lines);
      if (plain && plain.entryCount >= minEntries) {
        out ??= tokens.slice(0, index);
        const end = plain.node.endOffset;
        const image = lines.text.slice(token.startOffset, end);
        const replacement = createTokenInstance(T.PlainNumberMatrix, image, token.startOffset, end - 1, NaN, NaN, NaN, NaN);
        folded.set(replacement, plain.node);
        out.push(replacement);
        index = plain.close;
        continue;
      }
      if (plain) {
        // Small plain matrix: keep its tokens, skip past it (no need to re-scan nested brackets).
        if (out) for (let k = index; k <= plain.close; k++) out.push(tokens[k]);
        index = plain.close;
        continue;
      }
    }
    out?.push(token);
  }
  return out ?? tokens;
}
