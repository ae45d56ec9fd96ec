// Evaluates expressions to numbers: complex scalars or matrices of complex entries. Used for
// parameters, matrix entries, poles, weights and every controller value. Errors are reported
// once, at the innermost sub-expression responsible; an expression containing an error
// evaluates to null and its parents stay silent.
import type { CallExpr, Expr, NameExpr, NumberExpr } from '../../../grammar/src/ast';
import * as C from './complex';
import type { Complex, Diagnostic, Range } from './types';
import {
  divisionByZero,
  invalidArgument,
  nonFinite,
  shapeMismatch,
  signalInValue,
  unexpectedUnit,
  unknownFunction,
  unknownName,
  unknownUnit,
  wrongArity,
  raggedMatrix,
} from './diagnostics/index';
import { suggestName } from './names';
import { printExpr } from './printExpr';
import { unitInfo, unitNames } from './units';

export type Value =
  | { kind: 'scalar'; value: Complex }
  | { kind: 'matrix'; rows: number; cols: number; entries: Complex[][] };

export interface ValueScope {
  /** How the value is called in messages: "a matrix entry", "a parameter", "a pole". */
  place: string;
  /** Units are expected here (parameters): converted silently; elsewhere with a warning. */
  unitsMeaningful: boolean;
  /** A name's value; null when known but unavailable (already reported); undefined when unknown. */
  lookup(name: string): Value | null | undefined;
  /** 'a state', 'an input', … when the name is a signal of the plant. */
  signalRole(name: string): string | undefined;
  candidates(): Iterable<string>;
  declaration(name: string): Range | undefined;
}

export const scalarFunctions = ['sin', 'cos', 'tan', 'exp', 'log', 'sqrt', 'tanh', 'abs'] as const;
export const matrixFunctions = ['diag', 'identity', 'zeros'] as const;
export const builtinFunctions: readonly string[] = [...scalarFunctions, ...matrixFunctions];
export const builtinConstants: readonly string[] = ['pi'];

const scalarFunctionTable: Record<string, (z: Complex) => Complex> = {
  sin: C.sin,
  cos: C.cos,
  tan: C.tan,
  exp: C.exp,
  log: C.log,
  sqrt: C.sqrt,
  tanh: C.tanh,
  abs: (z) => ({ re: C.modulus(z), im: 0 }),
};

export function scalar(value: Complex): Value {
  return { kind: 'scalar', value };
}

export function shapeText(value: Value): string {
  return value.kind === 'scalar' ? 'a number' : `a ${value.rows}×${value.cols} matrix`;
}

/** The scalar inside a number or a 1×1 matrix. */
export function asScalar(value: Value): Complex | null {
  if (value.kind === 'scalar') return value.value;
  if (value.rows === 1 && value.cols === 1) return value.entries[0]![0]!;
  return null;
}

function isFiniteValue(value: Value): boolean {
  if (value.kind === 'scalar') return C.isFiniteComplex(value.value);
  return value.entries.every((row) => row.every(C.isFiniteComplex));
}

function mapValue(value: Value, f: (z: Complex) => Complex): Value {
  if (value.kind === 'scalar') return scalar(f(value.value));
  return { ...value, entries: value.entries.map((row) => row.map(f)) };
}

function matrixOf(entries: Complex[][]): Value {
  return { kind: 'matrix', rows: entries.length, cols: entries[0]?.length ?? 0, entries };
}

function multiplyMatrices(a: Complex[][], b: Complex[][]): Complex[][] {
  const inner = b.length;
  const cols = b[0]?.length ?? 0;
  return a.map((row) => {
    const result: Complex[] = [];
    for (let j = 0; j < cols; j++) {
      let sum: Complex = { re: 0, im: 0 };
      for (let k = 0; k < inner; k++) sum = C.add(sum, C.mul(row[k]!, b[k]![j]!));
      result.push(sum);
    }
    return result;
  });
}

export class ValueEvaluator {
  constructor(
    private readonly scope: ValueScope,
    private readonly out: Diagnostic[],
  ) {}

  evaluate(expr: Expr): Value | null {
    const value = this.evaluateNode(expr);
    return value;
  }

  private report(diagnostic: Diagnostic): null {
    this.out.push(diagnostic);
    return null;
  }

  /** Reports a non-finite result at this node (its operands were finite). */
  private checked(expr: Expr, value: Value | null): Value | null {
    if (value === null || isFiniteValue(value)) return value;
    const entries = value.kind === 'scalar' ? [value.value] : value.entries.flat();
    const nan = entries.some((z) => Number.isNaN(z.re) || Number.isNaN(z.im));
    return this.report(
      nonFinite.create(expr.range, [printExpr(expr), nan ? 'is not a number (NaN)' : 'is infinite (overflow or a pole of the function)']),
    );
  }

  private evaluateNode(expr: Expr): Value | null {
    switch (expr.kind) {
      case 'number':
        return this.checked(expr, this.number(expr));
      case 'name':
        return this.name(expr);
      case 'unary': {
        const operand = this.evaluateNode(expr.operand);
        if (operand === null) return null;
        return expr.op === '-' ? mapValue(operand, C.neg) : operand;
      }
      case 'binary':
        return this.checked(expr, this.binary(expr.op, expr.left, expr.right, expr));
      case 'call':
        return this.checked(expr, this.call(expr));
      case 'matrix':
        return this.matrix(expr);
      case 'error':
        return null; // the parser reported it
    }
  }

  private number(expr: NumberExpr): Value | null {
    const base = expr.imaginary ? { re: 0, im: expr.value } : { re: expr.value, im: 0 };
    if (!expr.unit) return scalar(base);
    const info = unitInfo(expr.unit.name);
    if (!info) {
      return this.report(unknownUnit.create(expr.unit.range, [expr.unit.name, suggestName(expr.unit.name, unitNames)]));
    }
    const converted = { re: base.re * info.scale, im: base.im * info.scale };
    if (!this.scope.unitsMeaningful) {
      this.out.push(unexpectedUnit.create(expr.unit.range, [printExpr(expr), this.scope.place, converted.im === 0 ? converted.re : Number.NaN]));
    }
    return scalar(converted);
  }

  private name(expr: NameExpr): Value | null {
    if (expr.name === 'pi') return scalar({ re: Math.PI, im: 0 });
    const value = this.scope.lookup(expr.name);
    if (value !== undefined) return value;
    const role = this.scope.signalRole(expr.name);
    if (role) return this.report(signalInValue.create(expr.range, [expr.name, role, this.scope.place]));
    const suggestion = suggestName(expr.name, [...this.scope.candidates(), ...builtinConstants]);
    const declared = suggestion ? this.scope.declaration(suggestion) : undefined;
    return this.report(
      unknownName.create(expr.range, [expr.name, 'name', suggestion], {
        related: declared ? [{ message: `${suggestion} is declared here`, range: declared }] : undefined,
        data: suggestion ? { fix: 'rename', replacement: suggestion } : undefined,
      }),
    );
  }

  private binary(op: string, leftExpr: Expr, rightExpr: Expr, whole: Expr): Value | null {
    const left = this.evaluateNode(leftExpr);
    const right = this.evaluateNode(rightExpr);
    if (left === null || right === null) return null;
    const a = asScalar(left);
    const b = asScalar(right);
    switch (op) {
      case '+':
      case '-': {
        const f = op === '+' ? C.add : C.sub;
        if (a && b && (left.kind === 'scalar' || right.kind === 'scalar')) return scalar(f(a, b));
        if (left.kind === 'matrix' && right.kind === 'matrix' && left.rows === right.rows && left.cols === right.cols) {
          return matrixOf(left.entries.map((row, i) => row.map((z, j) => f(z, right.entries[i]![j]!))));
        }
        return this.report(
          shapeMismatch.create(whole.range, [`cannot ${op === '+' ? 'add' : 'subtract'} ${shapeText(left)} and ${shapeText(right)}`]),
        );
      }
      case '*': {
        if (left.kind === 'scalar' && right.kind === 'scalar') return scalar(C.mul(left.value, right.value));
        if (left.kind === 'scalar') return mapValue(right, (z) => C.mul(left.value, z));
        if (right.kind === 'scalar') return mapValue(left, (z) => C.mul(z, right.value));
        if (left.cols === right.rows) return matrixOf(multiplyMatrices(left.entries, right.entries));
        if (a && b) return scalar(C.mul(a, b));
        return this.report(
          shapeMismatch.create(whole.range, [
            `cannot multiply ${shapeText(left)} by ${shapeText(right)}: ${left.cols} ${left.cols === 1 ? 'column' : 'columns'} against ${right.rows} ${right.rows === 1 ? 'row' : 'rows'}`,
          ]),
        );
      }
      case '/': {
        if (b === null) {
          return this.report(shapeMismatch.create(rightExpr.range, [`cannot divide by ${shapeText(right)}; divide by a number`]));
        }
        if (b.re === 0 && b.im === 0) return this.report(divisionByZero.create(rightExpr.range, [printExpr(rightExpr)]));
        return mapValue(left, (z) => C.div(z, b));
      }
      case '^': {
        if (b === null) {
          return this.report(shapeMismatch.create(rightExpr.range, [`an exponent must be a number, not ${shapeText(right)}`]));
        }
        if (a !== null) {
          if (a.re === 0 && a.im === 0 && (b.re < 0 || (b.re === 0 && b.im !== 0))) {
            return this.report(divisionByZero.create(whole.range, [printExpr(whole)]));
          }
          return scalar(C.pow(a, b));
        }
        if (left.kind === 'matrix' && left.rows === left.cols && b.im === 0 && Number.isInteger(b.re) && b.re >= 0) {
          let result: Complex[][] = left.entries.map((row, i) => row.map((_, j) => ({ re: i === j ? 1 : 0, im: 0 })));
          for (let k = 0; k < b.re; k++) result = multiplyMatrices(result, left.entries);
          return matrixOf(result);
        }
        return this.report(
          shapeMismatch.create(whole.range, [`only a square matrix can be raised to a whole power ≥ 0, not ${shapeText(left)}`]),
        );
      }
    }
    return null;
  }

  private scalarArgument(name: string, arg: Expr, value: Value): Complex | null {
    const z = asScalar(value);
    if (z === null) this.report(shapeMismatch.create(arg.range, [`${'`'}${name}${'`'} takes a number, not ${shapeText(value)}`]));
    return z;
  }

  private wholeNumber(name: string, arg: Expr, value: Value, what: string): number | null {
    const z = this.scalarArgument(name, arg, value);
    if (z === null) return null;
    if (z.im !== 0 || !Number.isInteger(z.re) || z.re < 1 || z.re > 100_000) {
      return this.report(
        invalidArgument.create(arg.range, [`${'`'}${name}${'`'} needs ${what} as a whole number ≥ 1, got ${C.formatComplex(z)}`]),
      );
    }
    return z.re;
  }

  private call(expr: CallExpr): Value | null {
    const name = expr.callee.name;
    const arity = (expected: string, ok: boolean): boolean => {
      if (!ok) this.report(wrongArity.create(expr.range, [name, expected, expr.args.length]));
      return ok;
    };
    if (!builtinFunctions.includes(name)) {
      for (const arg of expr.args) this.evaluateNode(arg);
      return this.report(unknownFunction.create(expr.callee.range, [name, suggestName(name, builtinFunctions)]));
    }
    const args = expr.args.map((arg) => this.evaluateNode(arg));
    if (scalarFunctionTable[name]) {
      if (!arity('1 argument', args.length === 1)) return null;
      if (args[0] === null) return null;
      const z = this.scalarArgument(name, expr.args[0]!, args[0]!);
      return z === null ? null : scalar(scalarFunctionTable[name]!(z));
    }
    if (args.some((a) => a === null)) {
      if (name === 'identity') arity('1 argument (the size)', args.length === 1);
      if (name === 'zeros') arity('2 arguments (rows, columns)', args.length === 2);
      return null;
    }
    const values = args as Value[];
    const zero: Complex = { re: 0, im: 0 };
    if (name === 'identity') {
      if (!arity('1 argument (the size)', values.length === 1)) return null;
      const n = this.wholeNumber(name, expr.args[0]!, values[0]!, 'the size');
      if (n === null) return null;
      const one: Complex = { re: 1, im: 0 };
      const entries: Complex[][] = [];
      for (let i = 0; i < n; i++) {
        const row = new Array<Complex>(n).fill(zero);
        row[i] = one;
        entries.push(row);
      }
      return matrixOf(entries);
    }
    if (name === 'zeros') {
      if (!arity('2 arguments (rows, columns)', values.length === 2)) return null;
      const rows = this.wholeNumber(name, expr.args[0]!, values[0]!, 'the rows');
      const cols = this.wholeNumber(name, expr.args[1]!, values[1]!, 'the columns');
      if (rows === null || cols === null) return null;
      return matrixOf(Array.from({ length: rows }, () => Array.from({ length: cols }, () => zero)));
    }
    // diag: of several numbers, or of one vector
    if (!arity('at least 1 argument', values.length >= 1)) return null;
    let diagonal: Complex[] | null = null;
    if (values.length === 1 && values[0]!.kind === 'matrix') {
      const v = values[0]!;
      if (v.rows === 1 || v.cols === 1) diagonal = v.entries.flat();
      else return this.report(invalidArgument.create(expr.args[0]!.range, [`${'`'}diag${'`'} of ${shapeText(v)}: give the diagonal as numbers or as a row or column`]));
    } else {
      diagonal = [];
      for (let k = 0; k < values.length; k++) {
        const z = this.scalarArgument(name, expr.args[k]!, values[k]!);
        if (z === null) return null;
        diagonal.push(z);
      }
    }
    const d = diagonal;
    return matrixOf(d.map((_, i) => d.map((__, j) => (i === j ? d[i]! : zero))));
  }

  private matrix(expr: Extract<Expr, { kind: 'matrix' }>): Value | null {
    const rows = expr.rows.filter((row) => row.entries.length > 0);
    let failed = false;
    const entries: Complex[][] = rows.map((row) =>
      row.entries.map((entry) => {
        const value = this.evaluateNode(entry);
        if (value === null) {
          failed = true;
          return { re: Number.NaN, im: 0 };
        }
        const z = asScalar(value);
        if (z === null) {
          failed = true;
          this.report(
            shapeMismatch.create(entry.range, [`${shapeText(value)} inside a matrix literal: entries must be numbers (block matrices are not supported)`]),
          );
          return { re: Number.NaN, im: 0 };
        }
        return z;
      }),
    );
    if (rows.length === 0) {
      return this.report(shapeMismatch.create(expr.range, ['an empty matrix has no value']));
    }
    const width = majorityLength(rows.map((row) => row.entries.length));
    rows.forEach((row, i) => {
      if (row.entries.length !== width) {
        failed = true;
        this.report(raggedMatrix.create(row.range, [`row ${i + 1} has ${row.entries.length} ${row.entries.length === 1 ? 'entry' : 'entries'} but the other rows have ${width}`]));
      }
    });
    return failed ? null : matrixOf(entries);
  }
}

/** The most common row length (the first one on a tie): the odd rows out are reported. */
export function majorityLength(lengths: number[]): number {
  const counts = new Map<number, number>();
  for (const n of lengths) counts.set(n, (counts.get(n) ?? 0) + 1);
  let best = lengths[0] ?? 0;
  for (const n of lengths) if ((counts.get(n) ?? 0) > (counts.get(best) ?? 0)) best = n;
  return best;
}

export function evaluateValue(expr: Expr, scope: ValueScope, out: Diagnostic[]): Value | null {
  return new ValueEvaluator(scope, out).evaluate(expr);
}

/** Names an expression refers to (for parameter dependencies). */
export function referencedNames(expr: Expr, into: NameExpr[] = []): NameExpr[] {
  switch (expr.kind) {
    case 'name':
      into.push(expr);
      break;
    case 'unary':
      referencedNames(expr.operand, into);
      break;
    case 'binary':
      referencedNames(expr.left, into);
      referencedNames(expr.right, into);
      break;
    case 'call':
      for (const arg of expr.args) referencedNames(arg, into);
      break;
    case 'matrix':
      for (const row of expr.rows) for (const entry of row.entries) referencedNames(entry, into);
      break;
    default:
      break;
  }
  return into;
}
