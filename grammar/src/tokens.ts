// The one token list of the plant language. The lexer, the parser and the TextMate grammar
// are all derived from it, so highlighting cannot drift from what the parser accepts.
import { createToken, Lexer, type CustomPatternMatcherReturn, type TokenType } from 'chevrotain';
import { foldThresholdNow, scanPlainMatrix } from './plainMatrix';

/** Letters allowed in names: ASCII, Latin-1/Latin Extended, Greek (engineers like θ, ω). */
const NAME_START = 'A-Za-z_\\u00C0-\\u00D6\\u00D8-\\u00F6\\u00F8-\\u024F\\u0370-\\u03FF';
const NAME_REST = `${NAME_START}0-9`;

export const Identifier = createToken({
  name: 'Identifier',
  pattern: new RegExp(`[${NAME_START}][${NAME_REST}]*`),
});

/** Reserved words, in the order of the language definition. */
export const KEYWORDS = [
  'plant',
  'controller',
  'for',
  'param',
  'states',
  'inputs',
  'outputs',
  'disturbances',
  'output',
  'transfer',
  'around',
  'poles',
  'pole',
  'lqr',
  'spec',
  'track',
  'integral',
  'observer',
  'noise',
  'sample',
  'delay',
  'limit',
  'in',
  'step',
  'to',
] as const;

export type Keyword = (typeof KEYWORDS)[number];

/** Keywords that begin a statement (used to stop a broken statement before the next one). */
export const STATEMENT_KEYWORDS: ReadonlySet<string> = new Set<string>([
  'plant',
  'controller',
  'param',
  'states',
  'inputs',
  'outputs',
  'disturbances',
  'output',
  'transfer',
  'around',
  'poles',
  'lqr',
  'spec',
  'track',
  'integral',
  'observer',
  'sample',
  'delay',
  'limit',
  'step',
]);

/** Unit suffixes recognised after a number (`5 ms`, `200 Hz`, `5 %`). */
export const UNIT_NAMES = ['s', 'ms', 'us', 'ns', 'min', 'Hz', 'kHz', '%'] as const;

/** Built-in functions (checked by the model; listed here for completion and highlighting). */
export const FUNCTION_NAMES = [
  'sin',
  'cos',
  'tan',
  'exp',
  'log',
  'sqrt',
  'tanh',
  'abs',
  'diag',
  'identity',
  'zeros',
] as const;

/** Named constants the model understands. */
export const CONSTANT_NAMES = ['pi'] as const;

function keywordToken(word: string): TokenType {
  return createToken({
    name: `Kw_${word}`,
    pattern: new RegExp(word),
    longer_alt: Identifier,
  });
}

export const keywordTokens: Record<Keyword, TokenType> = Object.fromEntries(
  KEYWORDS.map((word) => [word, keywordToken(word)]),
) as Record<Keyword, TokenType>;

const NUMBER_BODY = '(?:[0-9]+(?:\\.[0-9]*)?|\\.[0-9]+)(?:[eE][+-]?[0-9]+)?';

/** `3j`, `2.5i`, `1e-3j`: an imaginary literal (the suffix must not run into a name). */
export const ImaginaryNumber = createToken({
  name: 'ImaginaryNumber',
  pattern: new RegExp(`${NUMBER_BODY}[ij](?![${NAME_REST}])`),
});

export const NumberLiteral = createToken({
  name: 'NumberLiteral',
  pattern: new RegExp(NUMBER_BODY),
});

export const LessEqual = createToken({ name: 'LessEqual', pattern: /<=/ });
export const Less = createToken({ name: 'Less', pattern: /</ });
export const Plus = createToken({ name: 'Plus', pattern: /\+/ });
export const Minus = createToken({ name: 'Minus', pattern: /-/ });
export const Star = createToken({ name: 'Star', pattern: /\*/ });
export const Slash = createToken({ name: 'Slash', pattern: /\// });
export const Caret = createToken({ name: 'Caret', pattern: /\^/ });
export const Equals = createToken({ name: 'Equals', pattern: /=/ });
export const Comma = createToken({ name: 'Comma', pattern: /,/ });
export const Semicolon = createToken({ name: 'Semicolon', pattern: /;/ });
export const Prime = createToken({ name: 'Prime', pattern: /'/ });
export const LParen = createToken({ name: 'LParen', pattern: /\(/ });
export const RParen = createToken({ name: 'RParen', pattern: /\)/ });
export const LSquare = createToken({ name: 'LSquare', pattern: /\[/ });
export const RSquare = createToken({ name: 'RSquare', pattern: /\]/ });
export const LCurly = createToken({ name: 'LCurly', pattern: /\{/ });
export const RCurly = createToken({ name: 'RCurly', pattern: /\}/ });
export const Percent = createToken({ name: 'Percent', pattern: /%/ });

const NAME_AT = new RegExp(`[${NAME_START}][${NAME_REST}]*`, 'y');
const RESERVED_WORDS: ReadonlySet<string> = new Set<string>(KEYWORDS);
/** End of the name at `start` as the lexer reads it (longest match), or -1 if none or reserved. */
function nameEndAt(text: string, start: number): number {
  NAME_AT.lastIndex = start;
  const name = NAME_AT.exec(text)?.[0];
  return name === undefined || RESERVED_WORDS.has(name) ? -1 : start + name.length;
}

/**
 * A whole large matrix of numbers and short name expressions (`[1, 0; -k, 2*k]`, 64 entries or
 * more) as one token, read at the character level so 200×200 matrices neither lex 100,000
 * tokens nor run the expression rules 40,000 times. Only the parse lexer has it; its payload is
 * the scan.
 */
export const PlainNumberMatrix = createToken({
  name: 'PlainNumberMatrix',
  pattern: {
    exec: (text: string, offset: number): CustomPatternMatcherReturn | null => {
      // The lexer also tries this pattern at any offset while it skips bad characters (its error
      // recovery ignores start_chars_hint): only a `[` starts a matrix.
      if (text.charCodeAt(offset) !== 91 /* [ */) return null;
      const scan = scanPlainMatrix(text, offset, foldThresholdNow(), nameEndAt);
      if (!scan) return null;
      const match = [text.slice(offset, scan.end)] as CustomPatternMatcherReturn;
      match.payload = scan;
      return match;
    },
  },
  start_chars_hint: ['['],
  line_breaks: true,
});

export const Comment = createToken({ name: 'Comment', pattern: /#[^\r\n]*/, group: 'comments' });
export const Newline = createToken({
  name: 'Newline',
  pattern: /\r\n|\r|\n/,
  line_breaks: true,
});
export const Whitespace = createToken({
  name: 'Whitespace',
  pattern: /[ \t\f\v\u00A0\uFEFF]+/,
  group: Lexer.SKIPPED,
});

/** Order matters: longer or more specific patterns first, keywords before Identifier. */
export const allTokens: TokenType[] = [
  Whitespace,
  Newline,
  Comment,
  ImaginaryNumber,
  NumberLiteral,
  ...KEYWORDS.map((word) => keywordTokens[word]),
  Identifier,
  LessEqual,
  Less,
  Plus,
  Minus,
  Star,
  Slash,
  Caret,
  Equals,
  Comma,
  Semicolon,
  Prime,
  LParen,
  RParen,
  LSquare,
  RSquare,
  LCurly,
  RCurly,
  Percent,
];

/**
 * TextMate scope of each token kind; the TextMate grammar is generated from this table.
 * Keywords share one entry (`keyword.control.plant`); tokens absent here are not coloured.
 */
export const TOKEN_SCOPES: ReadonlyMap<TokenType, string> = new Map<TokenType, string>([
  [Comment, 'comment.line.number-sign.plant'],
  [ImaginaryNumber, 'constant.numeric.imaginary.plant'],
  [NumberLiteral, 'constant.numeric.plant'],
  ...KEYWORDS.map((word): [TokenType, string] => [keywordTokens[word], 'keyword.control.plant']),
  [LessEqual, 'keyword.operator.comparison.plant'],
  [Less, 'keyword.operator.comparison.plant'],
  [Plus, 'keyword.operator.arithmetic.plant'],
  [Minus, 'keyword.operator.arithmetic.plant'],
  [Star, 'keyword.operator.arithmetic.plant'],
  [Slash, 'keyword.operator.arithmetic.plant'],
  [Caret, 'keyword.operator.arithmetic.plant'],
  [Equals, 'keyword.operator.assignment.plant'],
  [Prime, 'keyword.operator.derivative.plant'],
  [Percent, 'keyword.other.unit.plant'],
  [Comma, 'punctuation.separator.comma.plant'],
  [Semicolon, 'punctuation.separator.row.plant'],
  [LParen, 'punctuation.parenthesis.open.plant'],
  [RParen, 'punctuation.parenthesis.close.plant'],
  [LSquare, 'punctuation.section.brackets.begin.plant'],
  [RSquare, 'punctuation.section.brackets.end.plant'],
  [LCurly, 'punctuation.section.block.begin.plant'],
  [RCurly, 'punctuation.section.block.end.plant'],
  [Identifier, 'variable.other.plant'],
]);

/** Scopes for identifiers with a fixed meaning (the parser still treats them as names). */
export const NAME_SCOPES = {
  function: 'support.function.plant',
  unit: 'keyword.other.unit.plant',
  constant: 'constant.language.plant',
  declarationName: 'entity.name.type.plant',
} as const;

let lexemeLexer: Lexer | undefined;
/**
 * One token per lexeme, for editor features that need every number and comma (formatting,
 * semantic tokens). Built on first use: the command-line tool never needs it.
 */
export const plantLexer: Pick<Lexer, 'tokenize'> = {
  tokenize: (text: string) => {
    lexemeLexer ??= new Lexer(allTokens, { positionTracking: 'onlyOffset', ensureOptimizations: true });
    return lexemeLexer.tokenize(text);
  },
};

/** The parser's vocabulary: every lexeme token plus the folded matrix. */
export const parserTokens: TokenType[] = [...allTokens, PlainNumberMatrix];

/** The parser's lexer: as `plantLexer`, but a large all-number matrix is one token. */
export const parseLexer = new Lexer([PlainNumberMatrix, ...allTokens], {
  positionTracking: 'onlyOffset',
  ensureOptimizations: true,
});

export function isKeywordToken(tokenType: TokenType): boolean {
  return tokenType.name.startsWith('Kw_');
}
