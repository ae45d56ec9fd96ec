// Prints an expression back as text for messages (`J - J0`, `exp(800)`), minimal parentheses.
import type { Expr } from '../../../grammar/src/ast';

const precedence: Record<string, number> = { '+': 1, '-': 1, '*': 2, '/': 2, '^': 4 };

export function printExpr(expr: Expr): string {
  switch (expr.kind) {
    case 'number':
      return expr.text + (expr.unit ? ` ${expr.unit.name}` : '');
    case 'name':
      return expr.name;
    case 'unary': {
      const inner = printExpr(expr.operand);
      const needsParens = expr.operand.kind === 'binary' && expr.operand.op !== '^';
      return expr.op + (needsParens ? `(${inner})` : inner);
    }
    case 'binary': {
      const own = precedence[expr.op]!;
      const wrap = (side: Expr, right: boolean): string => {
        const text = printExpr(side);
        if (side.kind === 'binary') {
          const inner = precedence[side.op]!;
          const rightAssoc = expr.op === '^';
          if (inner < own || (inner === own && right !== rightAssoc)) return `(${text})`;
        }
        if (side.kind === 'unary' && expr.op === '^' && !right) return `(${text})`;
        return text;
      };
      const spaced = expr.op === '^' ? '^' : ` ${expr.op} `;
      return wrap(expr.left, false) + spaced + wrap(expr.right, true);
    }
    case 'call':
      return `${expr.callee.name}(${expr.args.map(printExpr).join(', ')})`;
    case 'matrix':
      return `[${expr.rows.map((row) => row.entries.map(printExpr).join(', ')).join('; ')}]`;
    case 'error':
      return '…';
  }
}
