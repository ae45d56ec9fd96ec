// Semantic tokens: every token classified, names by what they resolve to (a param, a state, an
// input…), so editors without the TextMate grammar colour the language too.
import type { FastCheck } from '../analyze';
import { occurrenceAtOffset, symbolIndex, type Occurrence } from './symbolIndex';
import { positionAt } from './text';
import { lex, tokenName } from './tokens';

/** Legend, in the order the protocol encodes indices. */
export const SEMANTIC_TOKEN_TYPES = [
  'keyword',
  'comment',
  'number',
  'operator',
  'function',
  'type',
  'class',
  'parameter',
  'variable',
  'property',
  'enumMember',
  'macro',
] as const;

export const SEMANTIC_TOKEN_MODIFIERS = ['declaration', 'readonly', 'defaultLibrary'] as const;

export type SemanticTokenType = (typeof SEMANTIC_TOKEN_TYPES)[number];
export type SemanticTokenModifier = (typeof SEMANTIC_TOKEN_MODIFIERS)[number];

export interface SemanticTokenRecord {
  line: number;
  character: number;
  length: number;
  type: SemanticTokenType;
  modifiers: SemanticTokenModifier[];
}

const OPERATORS = new Set(['LessEqual', 'Less', 'Plus', 'Minus', 'Star', 'Slash', 'Caret', 'Equals', 'Prime', 'Percent']);

function classify(occurrence: Occurrence | null): { type: SemanticTokenType; modifiers: SemanticTokenModifier[] } | null {
  if (!occurrence) return null;
  const declaration: SemanticTokenModifier[] = occurrence.role === 'declaration' ? ['declaration'] : [];
  const kind = occurrence.definition?.kind;
  switch (kind) {
    case 'plant':
      return { type: 'type', modifiers: declaration };
    case 'controller':
      return { type: 'class', modifiers: declaration };
    case 'param':
      return { type: 'parameter', modifiers: [...declaration, 'readonly'] };
    case 'state':
      return { type: 'variable', modifiers: declaration };
    case 'input':
    case 'output':
    case 'disturbance':
      return { type: 'property', modifiers: declaration };
  }
  switch (occurrence.role) {
    case 'matrix':
      return { type: 'variable', modifiers: ['readonly', 'defaultLibrary'] };
    case 'function':
      return { type: 'function', modifiers: ['defaultLibrary'] };
    case 'unit':
      return { type: 'macro', modifiers: ['defaultLibrary'] };
    case 'constant':
    case 'laplace':
      return { type: 'variable', modifiers: ['readonly', 'defaultLibrary'] };
    case 'weight':
    case 'spec':
    case 'form':
      return { type: 'enumMember', modifiers: ['defaultLibrary'] };
  }
  return null;
}

export function semanticTokens(fast: FastCheck): SemanticTokenRecord[] {
  const { tokens, comments } = lex(fast.text);
  const index = symbolIndex(fast.parse.document);
  const records: SemanticTokenRecord[] = [];
  const all = [...tokens, ...comments].sort((a, b) => a.startOffset - b.startOffset);
  for (const token of all) {
    const name = tokenName(token);
    let type: SemanticTokenType | null = null;
    let modifiers: SemanticTokenModifier[] = [];
    if (name === 'Comment') type = 'comment';
    else if (name.startsWith('Kw_')) type = 'keyword';
    else if (name === 'NumberLiteral' || name === 'ImaginaryNumber') type = 'number';
    else if (OPERATORS.has(name)) type = name === 'Percent' ? 'macro' : 'operator';
    else if (name === 'Identifier') {
      const occurrence = occurrenceAtOffset(index, token.startOffset);
      const classified = classify(occurrence && occurrence.startOffset === token.startOffset ? occurrence : null);
      if (classified) ({ type, modifiers } = classified);
    }
    if (!type) continue;
    const position = positionAt(fast.text, token.startOffset);
    records.push({ line: position.line, character: position.character, length: token.image.length, type, modifiers });
  }
  return records;
}
