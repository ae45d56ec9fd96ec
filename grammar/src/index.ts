// Public face of the grammar layer: parser, token list, name lists and the syntax-tree types.
export { parsePlantText, MAX_EXPRESSION_DEPTH, type ParseOptions } from './parser';
export { MAX_NESTING } from './statements';
export {
  allTokens,
  plantLexer,
  KEYWORDS,
  STATEMENT_KEYWORDS,
  UNIT_NAMES,
  FUNCTION_NAMES,
  CONSTANT_NAMES,
  TOKEN_SCOPES,
  keywordTokens,
  isKeywordToken,
  type Keyword,
} from './tokens';
export { LineIndex } from './positions';
export { buildTextMateGrammar } from './textmate';
export type * from './ast';
