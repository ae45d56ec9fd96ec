// TextMate grammar generated from the token table in tokens.ts (same patterns, same keywords),
// so editor highlighting cannot drift from the lexer. The checked-in grammar/plant.tmLanguage.json
// is compared against this by a test (regenerate with UPDATE_FIXTURES=1).
import type { TokenType } from 'chevrotain';
import * as T from './tokens';

interface TextMatePattern {
  name?: string;
  match?: string;
  captures?: Record<string, { name: string }>;
  include?: string;
  comment?: string;
}

export interface TextMateGrammar {
  $schema: string;
  name: string;
  scopeName: string;
  fileTypes: string[];
  patterns: TextMatePattern[];
  repository: Record<string, { patterns: TextMatePattern[] }>;
}

/** JavaScript regex source → Oniguruma: `\uXXXX` escapes become `\x{XXXX}`. */
function toOniguruma(source: string): string {
  return source.replace(/\\u([0-9A-Fa-f]{4})/g, '\\x{$1}');
}

function patternSource(tokenType: TokenType): string {
  const pattern = tokenType.PATTERN;
  if (!(pattern instanceof RegExp)) throw new Error(`token ${tokenType.name} has no regular expression`);
  return toOniguruma(pattern.source);
}

function scopeOf(tokenType: TokenType): string {
  const scope = T.TOKEN_SCOPES.get(tokenType);
  if (!scope) throw new Error(`token ${tokenType.name} has no TextMate scope`);
  return scope;
}

function escapeWord(word: string): string {
  return word.replace(/[.*+?^${}()|[\]\\]/g, '\\$&');
}

function alternation(words: readonly string[]): string {
  // Longest first so that `outputs` is not cut to `output`.
  return [...words].sort((a, b) => b.length - a.length || a.localeCompare(b)).map(escapeWord).join('|');
}

/** Operator and punctuation tokens, in lexer order (so `<=` is tried before `<`). */
const SYMBOL_TOKENS: TokenType[] = T.allTokens.filter(
  (tokenType) =>
    tokenType !== T.Identifier &&
    tokenType !== T.Comment &&
    tokenType !== T.NumberLiteral &&
    tokenType !== T.ImaginaryNumber &&
    !T.isKeywordToken(tokenType) &&
    T.TOKEN_SCOPES.has(tokenType),
);

export function buildTextMateGrammar(): TextMateGrammar {
  const name = patternSource(T.Identifier);
  const word = `(?![${toOniguruma('A-Za-z0-9_\\u00C0-\\u024F\\u0370-\\u03FF')}])`;
  const before = `(?<![${toOniguruma('A-Za-z0-9_\\u00C0-\\u024F\\u0370-\\u03FF')}.])`;
  const unitNames = T.UNIT_NAMES.filter((unit) => unit !== '%');
  const keywordScope = scopeOf(T.keywordTokens.plant);

  return {
    $schema: 'https://raw.githubusercontent.com/martinring/tmlanguage/master/tmlanguage.json',
    name: 'Plant',
    scopeName: 'source.plant',
    fileTypes: ['plant'],
    patterns: [
      { include: '#comment' },
      { include: '#declaration' },
      { include: '#keyword' },
      { include: '#number' },
      { include: '#function' },
      { include: '#constant' },
      { include: '#symbol' },
      { include: '#identifier' },
    ],
    repository: {
      comment: {
        patterns: [{ name: scopeOf(T.Comment), match: patternSource(T.Comment) }],
      },
      declaration: {
        patterns: [
          {
            comment: 'plant <name>',
            match: `\\b(plant)\\s+(${name})`,
            captures: {
              '1': { name: keywordScope },
              '2': { name: T.NAME_SCOPES.declarationName },
            },
          },
          {
            comment: 'controller <name> for <plant>',
            match: `\\b(controller)\\s+(${name})(?:\\s+(for)\\s+(${name}))?`,
            captures: {
              '1': { name: keywordScope },
              '2': { name: T.NAME_SCOPES.declarationName },
              '3': { name: keywordScope },
              '4': { name: T.NAME_SCOPES.declarationName },
            },
          },
        ],
      },
      keyword: {
        patterns: [{ name: keywordScope, match: `${before}(?:${alternation(T.KEYWORDS)})${word}` }],
      },
      number: {
        patterns: [
          {
            comment: 'imaginary literal such as 3j or 2.5i',
            match: patternSource(T.ImaginaryNumber),
            name: scopeOf(T.ImaginaryNumber),
          },
          {
            comment: 'number with an optional unit: 5 ms, 200 Hz',
            match: `(${patternSource(T.NumberLiteral)})(?:\\s*(${alternation(unitNames)})${word})?`,
            captures: {
              '1': { name: scopeOf(T.NumberLiteral) },
              '2': { name: T.NAME_SCOPES.unit },
            },
          },
        ],
      },
      function: {
        patterns: [
          {
            match: `${before}(?:${alternation(T.FUNCTION_NAMES)})(?=\\s*\\()`,
            name: T.NAME_SCOPES.function,
          },
        ],
      },
      constant: {
        patterns: [
          { match: `${before}(?:${alternation(T.CONSTANT_NAMES)})${word}`, name: T.NAME_SCOPES.constant },
        ],
      },
      symbol: {
        patterns: SYMBOL_TOKENS.map((tokenType) => ({
          name: scopeOf(tokenType),
          match: patternSource(tokenType),
        })),
      },
      identifier: {
        patterns: [{ name: scopeOf(T.Identifier), match: name }],
      },
    },
  };
}
