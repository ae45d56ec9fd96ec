// Signature help for the built-in functions: which argument the cursor is on.
import type { Position } from '../../../grammar/src/ast';
import type { FastCheck } from '../analyze';
import { offsetAt } from './text';
import { lex, tokenEnd, tokenName } from './tokens';

export interface SignatureRecord {
  label: string;
  documentation: string;
  parameters: { label: string; documentation: string }[];
  activeParameter: number;
}

const SIGNATURES: Record<string, { parameters: [string, string][]; documentation: string; variadic?: boolean }> = {
  sin: { parameters: [['x', 'angle in radians']], documentation: 'Sine.' },
  cos: { parameters: [['x', 'angle in radians']], documentation: 'Cosine.' },
  tan: { parameters: [['x', 'angle in radians']], documentation: 'Tangent.' },
  exp: { parameters: [['x', 'exponent']], documentation: 'Natural exponential.' },
  log: { parameters: [['x', 'positive value']], documentation: 'Natural logarithm.' },
  sqrt: { parameters: [['x', 'non-negative value']], documentation: 'Square root.' },
  tanh: { parameters: [['x', 'value']], documentation: 'Hyperbolic tangent.' },
  abs: { parameters: [['x', 'value']], documentation: 'Absolute value.' },
  diag: { parameters: [['d1', 'first diagonal entry'], ['d2', 'second diagonal entry'], ['…', 'more entries']], documentation: 'Square matrix with the arguments on its diagonal.', variadic: true },
  identity: { parameters: [['n', 'size']], documentation: 'n×n identity matrix.' },
  zeros: { parameters: [['rows', 'number of rows'], ['cols', 'number of columns']], documentation: 'Matrix of zeros.' },
};

export function signatureHelp(fast: FastCheck, position: Position): SignatureRecord | null {
  const offset = offsetAt(fast.text, position);
  const tokens = lex(fast.text).tokens;
  // Innermost open parenthesis before the cursor, with the comma count at its depth.
  const stack: { callee: string | null; commas: number }[] = [];
  for (let i = 0; i < tokens.length; i++) {
    const token = tokens[i];
    if (token.startOffset >= offset) break;
    const name = tokenName(token);
    if (name === 'Newline' && stack.length === 0) continue;
    if (name === 'LParen' || name === 'LSquare') {
      const previous = tokens[i - 1];
      const callee = name === 'LParen' && previous && tokenName(previous) === 'Identifier' && tokenEnd(previous) === token.startOffset ? previous.image : null;
      stack.push({ callee: name === 'LParen' ? callee : '[', commas: 0 });
    } else if (name === 'RParen' || name === 'RSquare') {
      if (tokenEnd(token) <= offset) stack.pop();
    } else if (name === 'Comma' && stack.length > 0) {
      stack[stack.length - 1].commas++;
    } else if (name === 'LCurly' || name === 'RCurly') {
      stack.length = 0;
    }
  }
  const open = [...stack].reverse().find((frame) => frame.callee !== '[');
  if (!open || !open.callee || stack[stack.length - 1] !== open) return null;
  const signature = SIGNATURES[open.callee];
  if (!signature) return null;
  const parameters = signature.parameters.map(([label, documentation]) => ({ label, documentation }));
  const label = `${open.callee}(${parameters.map((p) => p.label).join(', ')})`;
  const last = parameters.length - 1;
  return {
    label,
    documentation: signature.documentation,
    parameters,
    activeParameter: signature.variadic ? Math.min(open.commas, last) : Math.min(open.commas, last),
  };
}
