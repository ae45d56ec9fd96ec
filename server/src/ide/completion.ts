// Completion: keywords, declared names, functions, units and skeleton snippets, chosen by the
// block (plant or controller) and the statement the cursor is in. Works on broken text: the
// context comes from the tokens before the cursor, the names from the syntax tree.
import type { IToken } from 'chevrotain';
import type { Position } from '../../../grammar/src/ast';
import { CONSTANT_NAMES, FUNCTION_NAMES } from '../../../grammar/src/tokens';
import type { FastCheck } from '../analyze';
import { FUNCTION_DOCS } from './hover';
import { symbolIndex, type Definition, type DefinitionKind } from './symbolIndex';
import { offsetAt } from './text';
import { isKeyword, lex, tokenEnd, tokenName } from './tokens';

export type CompletionKind =
  | 'keyword'
  | 'snippet'
  | 'class'
  | 'variable'
  | 'constant'
  | 'function'
  | 'unit'
  | 'property'
  | 'field'
  | 'event'
  | 'value';

export interface CompletionRecord {
  label: string;
  kind: CompletionKind;
  detail?: string;
  documentation?: string;
  /** Text to insert (snippet syntax when `snippet` is true). Defaults to the label. */
  insertText?: string;
  snippet?: boolean;
  sortText?: string;
}

const PLANT_STATEMENTS = ['param', 'states', 'inputs', 'outputs', 'disturbances', 'output', 'transfer', 'around'];
const CONTROLLER_STATEMENTS = ['poles', 'lqr', 'spec', 'track', 'integral', 'observer', 'sample', 'delay', 'limit', 'step'];
const TIME_UNITS = ['s', 'ms', 'us', 'ns', 'min'];
const FREQUENCY_UNITS = ['Hz', 'kHz'];

const CONTROLLER_SNIPPETS: CompletionRecord[] = [
  { label: 'poles = [...]', kind: 'snippet', insertText: 'poles = [${1:-2 + 1j, -2 - 1j}]', snippet: true, detail: 'pole placement' },
  { label: 'lqr Q = ..., R = ...', kind: 'snippet', insertText: 'lqr Q = ${1:identity(2)}, R = ${2:1}', snippet: true, detail: 'LQR design' },
  { label: 'spec settling ..., overshoot ...', kind: 'snippet', insertText: 'spec settling <= ${1:1.5} s, overshoot <= ${2:5} %', snippet: true, detail: 'poles from specifications' },
  { label: 'observer poles = [...]', kind: 'snippet', insertText: 'observer poles = [${1:-10, -12}]', snippet: true, detail: 'state estimator' },
  { label: 'limit ... in [lo, hi]', kind: 'snippet', insertText: 'limit ${1:u} in [${2:-1}, ${3:1}]', snippet: true, detail: 'actuator limits' },
  { label: 'step ... to ...', kind: 'snippet', insertText: 'step ${1:y} to ${2:1}', snippet: true, detail: 'set-point step' },
];

function plantSnippet(): CompletionRecord {
  return {
    label: 'plant … { }',
    kind: 'snippet',
    detail: 'plant skeleton (matrix form)',
    snippet: true,
    insertText: [
      'plant ${1:name} {',
      '  param ${2:k} = ${3:1}',
      '',
      '  states  ${4:position, velocity}',
      '  inputs  ${5:force}',
      '  outputs ${6:position}',
      '',
      '  A = [0, 1;',
      '       0, -${2:k}]',
      '  B = [0; 1]',
      '  C = [1, 0]',
      '}',
    ].join('\n'),
  };
}

function equationPlantSnippet(): CompletionRecord {
  return {
    label: 'plant … { equations }',
    kind: 'snippet',
    detail: 'plant skeleton (equation form)',
    snippet: true,
    insertText: [
      'plant ${1:name} {',
      '  states  ${2:x}, ${3:v}',
      '  inputs  ${4:u}',
      '  outputs ${5:y}',
      '',
      "  ${2:x}' = ${3:v}",
      "  ${3:v}' = ${4:u}",
      '  output ${5:y} = ${2:x}',
      '}',
    ].join('\n'),
  };
}

function controllerSnippet(plants: string[]): CompletionRecord {
  const plantChoice = plants.length > 0 ? `\${2|${plants.map((p) => p.replace(/[,|]/g, '')).join(',')}|}` : '${2:plant}';
  return {
    label: 'controller … for … { }',
    kind: 'snippet',
    detail: 'controller skeleton',
    snippet: true,
    insertText: ['controller ${1:name} for ' + plantChoice + ' {', '  poles = [${3:-2 + 1j, -2 - 1j}]', '  track ${4:y}', '}'].join('\n'),
  };
}

interface CursorContext {
  block: { kind: 'plant' | 'controller'; declarationIndex: number | null; plantIndex: number | null } | null;
  /** Tokens of the current statement before the cursor (the word being typed excluded). */
  statement: IToken[];
  /** Bracket depth inside the statement at the cursor. */
  depth: number;
  /** The token just before the cursor (the word being typed excluded). */
  previous: IToken | undefined;
  /** Inside a `for` clause of a controller header. */
  inHeaderFor: boolean;
}

function cursorContext(fast: FastCheck, offset: number): CursorContext | null {
  const { tokens, comments } = lex(fast.text);
  if (comments.some((comment) => comment.startOffset < offset && offset <= tokenEnd(comment))) return null;
  const index = symbolIndex(fast.parse.document);
  let blockKind: 'plant' | 'controller' | null = null;
  let blockName: string | null = null;
  let blockPlant: string | null = null;
  let header: IToken[] = [];
  let statement: IToken[] = [];
  let depth = 0;
  let inHeader = false;
  for (const token of tokens) {
    if (token.startOffset >= offset) break;
    const end = tokenEnd(token);
    // The word being typed (touching the cursor) is not context.
    if (end > offset || (end === offset && /^Identifier$|^Kw_|Number/.test(tokenName(token)))) break;
    const name = tokenName(token);
    if (isKeyword(token, 'plant') || isKeyword(token, 'controller')) {
      if (blockKind === null || statement.length === 0) {
        inHeader = true;
        header = [token];
        statement = [];
        continue;
      }
    }
    if (inHeader) {
      if (name === 'LCurly') {
        inHeader = false;
        blockKind = isKeyword(header[0], 'plant') ? 'plant' : 'controller';
        blockName = header[1]?.tokenType.name === 'Identifier' ? header[1].image : null;
        const forIndex = header.findIndex((t) => isKeyword(t, 'for'));
        blockPlant = forIndex >= 0 ? header[forIndex + 1]?.image ?? null : null;
        statement = [];
        depth = 0;
      } else header.push(token);
      continue;
    }
    if (name === 'RCurly' && depth <= 0) {
      blockKind = null;
      statement = [];
      depth = 0;
      continue;
    }
    if (name === 'Newline') {
      if (depth <= 0) {
        statement = [];
        depth = 0;
      }
      continue;
    }
    if (name === 'LSquare' || name === 'LParen') depth++;
    if (name === 'RSquare' || name === 'RParen') depth = Math.max(0, depth - 1);
    statement.push(token);
  }
  if (inHeader) {
    const forToken = header.findIndex((t) => isKeyword(t, 'for'));
    return {
      block: null,
      statement: header,
      depth: 0,
      previous: header[header.length - 1],
      inHeaderFor: forToken >= 0 && header.length - 1 === forToken,
    };
  }
  let plantIndex: number | null = null;
  let declarationIndex: number | null = null;
  if (blockKind === 'plant' && blockName) {
    plantIndex = index.plantByName.get(blockName) ?? null;
    declarationIndex = plantIndex;
  } else if (blockKind === 'controller') {
    plantIndex = blockPlant ? index.plantByName.get(blockPlant) ?? null : null;
    declarationIndex = fast.parse.document.declarations.findIndex((d) => d.kind === 'controller' && d.name.name === blockName);
    if (declarationIndex < 0) declarationIndex = null;
  }
  return {
    block: blockKind ? { kind: blockKind, declarationIndex, plantIndex } : null,
    statement,
    depth,
    previous: statement[statement.length - 1],
    inHeaderFor: false,
  };
}

function namesOf(fast: FastCheck, plantIndex: number | null, kinds: readonly DefinitionKind[]): Definition[] {
  if (plantIndex === null) return [];
  const scope = symbolIndex(fast.parse.document).scopeOf(plantIndex);
  return [...scope.values()].filter((definition) => kinds.includes(definition.kind));
}

const KIND_OF_DEFINITION: Record<DefinitionKind, CompletionKind> = {
  plant: 'class',
  controller: 'class',
  param: 'constant',
  state: 'variable',
  input: 'field',
  output: 'property',
  disturbance: 'event',
};

function nameItems(definitions: Definition[]): CompletionRecord[] {
  return definitions.map((definition) => ({
    label: definition.name,
    kind: KIND_OF_DEFINITION[definition.kind],
    detail: definition.kind,
    sortText: `0${definition.name}`,
  }));
}

function keywordItems(words: string[]): CompletionRecord[] {
  return words.map((word) => ({ label: word, kind: 'keyword' as const, sortText: `1${word}` }));
}

function expressionItems(fast: FastCheck, plantIndex: number | null, laplace: boolean): CompletionRecord[] {
  const items = nameItems(namesOf(fast, plantIndex, ['param', 'state', 'input', 'disturbance']));
  for (const name of FUNCTION_NAMES) {
    items.push({
      label: name,
      kind: 'function',
      detail: 'function',
      documentation: FUNCTION_DOCS[name],
      insertText: `${name}($1)`,
      snippet: true,
      sortText: `2${name}`,
    });
  }
  for (const name of CONSTANT_NAMES) items.push({ label: name, kind: 'constant', detail: 'constant', sortText: `2${name}` });
  if (laplace) items.push({ label: 's', kind: 'variable', detail: 'Laplace variable', sortText: '0s' });
  return items;
}

function unitItems(units: string[]): CompletionRecord[] {
  return units.map((unit) => ({ label: unit, kind: 'unit' as const, detail: 'unit', sortText: `0${unit}` }));
}

const isNumberToken = (token: IToken | undefined) => !!token && /Number/.test(tokenName(token));

export function completions(fast: FastCheck, position: Position): CompletionRecord[] {
  const offset = offsetAt(fast.text, position);
  const context = cursorContext(fast, offset);
  if (!context) return [];
  const plants = [...symbolIndex(fast.parse.document).plantByName.keys()];
  if (context.inHeaderFor) return plants.map((name) => ({ label: name, kind: 'class' as const, detail: 'plant' }));
  const { block, statement, previous } = context;
  const first = statement[0];

  if (!block) {
    if (statement.length === 0) {
      return [...keywordItems(['plant', 'controller']), plantSnippet(), equationPlantSnippet(), controllerSnippet(plants)];
    }
    return [];
  }

  if (block.kind === 'plant') {
    if (statement.length === 0) {
      const states = namesOf(fast, block.plantIndex, ['state']);
      return [
        ...keywordItems(PLANT_STATEMENTS),
        ...['A', 'B', 'C', 'D', 'E'].map((name) => ({
          label: `${name} = [...]`,
          kind: 'snippet' as const,
          insertText: `${name} = [$1]`,
          snippet: true,
          detail: { A: 'state matrix', B: 'input matrix', C: 'output matrix', D: 'feedthrough', E: 'disturbance input matrix' }[name],
          sortText: `3${name}`,
        })),
        ...states.map((state) => ({
          label: `${state.name}' = …`,
          kind: 'snippet' as const,
          insertText: `${state.name}' = $1`,
          snippet: true,
          detail: 'state equation',
          sortText: `2${state.name}`,
        })),
      ];
    }
    if (first && /^Kw_(states|inputs|outputs|disturbances)$/.test(tokenName(first))) return [];
    if (first && isKeyword(first, 'param') && !statement.some((t) => tokenName(t) === 'Equals')) return [];
    if (isNumberToken(previous) && context.depth === 0) return unitItems(['s', 'ms', 'Hz', '%']);
    if (first && isKeyword(first, 'output') && !statement.some((t) => tokenName(t) === 'Equals')) {
      return nameItems(namesOf(fast, block.plantIndex, ['output']));
    }
    if (first && isKeyword(first, 'around')) {
      if (previous && (isKeyword(previous, 'around') || tokenName(previous) === 'Comma') && context.depth === 0) {
        return nameItems(namesOf(fast, block.plantIndex, ['state', 'input', 'disturbance']));
      }
    }
    const laplace = !!first && isKeyword(first, 'transfer');
    if (statement.some((t) => tokenName(t) === 'Equals')) return expressionItems(fast, block.plantIndex, laplace);
    return [];
  }

  // Controller block.
  if (statement.length === 0) return [...keywordItems(CONTROLLER_STATEMENTS), ...CONTROLLER_SNIPPETS];
  if (!first) return [];
  const afterListStart = !!previous && (previous === first || tokenName(previous) === 'Comma') && context.depth === 0;
  if (isKeyword(first, 'track') || isKeyword(first, 'integral')) {
    if (statement.some((t) => isKeyword(t, 'pole'))) return isNumberToken(previous) ? [] : expressionItems(fast, block.plantIndex, false);
    if (afterListStart) return nameItems(namesOf(fast, block.plantIndex, ['output']));
    if (isKeyword(first, 'integral')) return keywordItems(['pole']);
    return [];
  }
  if (isKeyword(first, 'step')) {
    if (previous === first) return nameItems(namesOf(fast, block.plantIndex, ['output']));
    if (statement.length === 2) return keywordItems(['to']);
    return [];
  }
  if (isKeyword(first, 'limit')) {
    if (previous === first) return nameItems(namesOf(fast, block.plantIndex, ['input']));
    if (statement.length === 2) return keywordItems(['in']);
    return [];
  }
  if (isKeyword(first, 'spec')) {
    if (afterListStart) {
      return ['settling', 'overshoot', 'rise'].map((word) => ({ label: word, kind: 'property' as const, detail: 'specification' }));
    }
    if (isNumberToken(previous)) {
      const specName = [...statement].reverse().find((t) => tokenName(t) === 'Identifier')?.image;
      return unitItems(specName === 'overshoot' ? ['%'] : TIME_UNITS);
    }
    return [];
  }
  if (isKeyword(first, 'lqr')) {
    if (afterListStart) return ['Q', 'R', 'N'].map((word) => ({ label: word, kind: 'property' as const, detail: 'LQR weight' }));
    return expressionItems(fast, block.plantIndex, false);
  }
  if (isKeyword(first, 'observer')) {
    if (previous === first) return keywordItems(['poles', 'noise']);
    if (previous && (isKeyword(previous, 'noise') || (tokenName(previous) === 'Comma' && context.depth === 0))) {
      return ['W', 'V'].map((word) => ({ label: word, kind: 'property' as const, detail: 'noise covariance' }));
    }
    if (previous && context.depth === 0 && /RSquare|Number|Identifier|RParen/.test(tokenName(previous))) {
      return ['current', 'predictor'].map((word) => ({ label: word, kind: 'keyword' as const, detail: 'estimator form' }));
    }
    return expressionItems(fast, block.plantIndex, false);
  }
  if (isKeyword(first, 'sample')) return isNumberToken(previous) ? unitItems([...TIME_UNITS, ...FREQUENCY_UNITS]) : [];
  if (isKeyword(first, 'delay')) return isNumberToken(previous) ? [{ label: 'sample', kind: 'keyword', detail: 'whole sample periods' }] : [];
  if (isKeyword(first, 'poles')) return isNumberToken(previous) ? [] : expressionItems(fast, block.plantIndex, false);
  return [];
}
