// Re-lexing for features that must work on broken text (completion, signature help,
// semantic tokens, folding, formatting): the grammar's own lexer, so nothing drifts.
import type { IToken } from 'chevrotain';
import { plantLexer } from '../../../grammar/src/tokens';

export interface LexedText {
  /** Significant tokens and newlines, in order. */
  tokens: IToken[];
  /** Comment tokens, in order. */
  comments: IToken[];
}

const cache = new Map<string, LexedText>();

export function lex(text: string): LexedText {
  const cached = cache.get(text);
  if (cached) return cached;
  const result = plantLexer.tokenize(text);
  const lexed = { tokens: result.tokens, comments: (result.groups.comments as IToken[] | undefined) ?? [] };
  if (cache.size >= 4) cache.delete(cache.keys().next().value as string);
  cache.set(text, lexed);
  return lexed;
}

export function tokenName(token: IToken): string {
  return token.tokenType.name;
}

export function isKeyword(token: IToken, word?: string): boolean {
  return token.tokenType.name.startsWith('Kw_') && (word === undefined || token.image === word);
}

/** End offset (exclusive) of a token. */
export function tokenEnd(token: IToken): number {
  return token.startOffset + token.image.length;
}
