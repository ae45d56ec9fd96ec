// Cuts the token stream into statements before parsing, so that an error in one statement can
// never run into the next one. Rules (from the language definition):
// - a newline ends a statement, except inside ( ) and [ ] and after a binary operator or comma;
// - inside [ ] (innermost bracket) a newline is a row break and is kept as a token;
// - `{` and `}` are block structure and always stand alone;
// - a line that clearly starts a new statement (a statement keyword, `}`, or `name =` / `name'`)
//   ends an unfinished statement above it even inside open brackets, so a missing `]` or a
//   dangling operator cannot swallow the following lines.
import type { IToken, TokenType } from 'chevrotain';
import * as T from './tokens';

/** Deepest bracket nesting accepted; deeper input is reported, not parsed (keeps the stack safe). */
export const MAX_NESTING = 64;

export interface Statement {
  kind: 'statement';
  /** Significant tokens of the statement (Newline tokens appear only as matrix row breaks). */
  tokens: IToken[];
  start: number;
  end: number;
  /** The bracket that went past MAX_NESTING, when the statement is too deep to parse. */
  tooDeep?: IToken;
}

export interface BraceUnit {
  kind: 'open' | 'close';
  token: IToken;
}

export type StatementUnit = Statement | BraceUnit;

const CONTINUATION_AFTER: ReadonlySet<TokenType> = new Set([
  T.Plus,
  T.Minus,
  T.Star,
  T.Slash,
  T.Caret,
  T.Comma,
  T.Equals,
  T.LessEqual,
  T.Less,
]);

/** Statements whose comma-separated parts are `name = value` (a `name =` line continues them). */
const NAMED_VALUE_STATEMENTS: ReadonlySet<TokenType> = new Set([
  T.keywordTokens.lqr,
  T.keywordTokens.observer,
  T.keywordTokens.around,
]);

function isStatementKeyword(tokenType: TokenType): boolean {
  return T.isKeywordToken(tokenType) && T.STATEMENT_KEYWORDS.has(tokenType.name.slice(3));
}

export function cutStatements(tokens: IToken[]): StatementUnit[] {
  const units: StatementUnit[] = [];
  let current: IToken[] = [];
  let tooDeep: IToken | undefined;
  const stack: TokenType[] = [];
  const openCount = new Map<TokenType, number>([
    [T.LParen, 0],
    [T.LSquare, 0],
  ]);

  const flush = (): void => {
    while (current.length > 0 && current[current.length - 1].tokenType === T.Newline) current.pop();
    if (current.length > 0) {
      const last = current[current.length - 1];
      units.push({
        kind: 'statement',
        tokens: current,
        start: current[0].startOffset,
        end: last.startOffset + last.image.length,
        tooDeep,
      });
    }
    current = [];
    tooDeep = undefined;
    stack.length = 0;
    openCount.set(T.LParen, 0).set(T.LSquare, 0);
  };

  /** Does the line starting at tokens[index] begin a new statement? */
  const startsStatement = (index: number, afterComma: boolean): boolean => {
    const token = tokens[index];
    if (!token) return false;
    if (token.tokenType === T.RCurly || token.tokenType === T.LCurly) return true;
    if (isStatementKeyword(token.tokenType)) return true;
    if (token.tokenType !== T.Identifier) return false;
    const after = tokens[index + 1];
    if (!after) return false;
    if (after.tokenType === T.Prime) return true;
    if (after.tokenType !== T.Equals) return false;
    // `R = ...` after a comma continues `lqr Q = ..., R = ...`; elsewhere it is a new statement.
    const head = current[0];
    return !(afterComma && stack.length === 0 && head && NAMED_VALUE_STATEMENTS.has(head.tokenType));
  };

  for (let index = 0; index < tokens.length; index++) {
    const token = tokens[index];
    const type = token.tokenType;
    if (type === T.LCurly || type === T.RCurly) {
      flush();
      units.push({ kind: type === T.LCurly ? 'open' : 'close', token });
      continue;
    }
    if (type === T.Newline) {
      let next = index + 1;
      while (next < tokens.length && tokens[next].tokenType === T.Newline) next++;
      const previous = current[current.length - 1];
      if (!previous) {
        index = next - 1;
        continue;
      }
      const afterOperator = CONTINUATION_AFTER.has(previous.tokenType);
      const afterComma = previous.tokenType === T.Comma;
      if (startsStatement(next, afterComma) || next >= tokens.length) {
        flush();
      } else if (stack.length === 0) {
        if (!afterOperator) flush();
      } else if (stack[stack.length - 1] === T.LSquare && !afterOperator && previous.tokenType !== T.Newline) {
        current.push(token); // a row break inside a matrix
      }
      index = next - 1;
      continue;
    }
    if (type === T.LParen || type === T.LSquare) {
      stack.push(type);
      openCount.set(type, openCount.get(type)! + 1);
      if (stack.length > MAX_NESTING && !tooDeep) tooDeep = token;
    } else if (type === T.RParen || type === T.RSquare) {
      const opener = type === T.RParen ? T.LParen : T.LSquare;
      // Unmatched closers are left for the parser to report; only search a stack that can match
      // (keeps garbage input linear).
      if (openCount.get(opener)! > 0) {
        const at = stack.lastIndexOf(opener);
        for (let k = at; k < stack.length; k++) openCount.set(stack[k], openCount.get(stack[k])! - 1);
        stack.length = at;
      }
    }
    current.push(token);
  }
  flush();
  return units;
}
