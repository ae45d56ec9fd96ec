// Evaluates an equation's right-hand side on dual numbers: the value at the operating point,
// its exact gradient over all states, inputs and disturbances, and its term magnitude.
// Remembers the first nonlinear operation that touched a variable (for "needs an operating
// point") and reports points where a function has no derivative.
import type { Expr, NameExpr } from '../../../grammar/src/ast';
import {
  divisionByZero,
  nonFinite,
  notDifferentiable,
  notReal,
  outputReference,
  shapeMismatch,
  unexpectedUnit,
  unknownFunction,
  unknownName,
  unknownUnit,
  wrongArity,
} from './diagnostics/index';
import * as D from './dual';
import { Dual } from './dual';
import { asScalar, builtinConstants, builtinFunctions, scalarFunctions, shapeText } from './evaluate';
import * as Cx from './complex';
import { suggestName } from './names';
import type { ParameterTable } from './parameters';
import { printExpr } from './printExpr';
import type { SignalTable } from './signals';
import { unitInfo, unitNames } from './units';
import type { Diagnostic, Range } from './types';

export interface DualScope {
  signals: SignalTable;
  parameters: ParameterTable;
  /** Index of each state/input/disturbance among all variables. */
  variableIndex: Map<string, number>;
  /** Current values of all variables (x0, u0, w0). */
  point: ArrayLike<number>;
}

export class DualEvaluator {
  /** The first nonlinear operation on a variable, if any. */
  nonlinearAt: Range | null = null;
  /** Whether diagnostics are reported (off when re-evaluating at a trial point). */
  constructor(
    private readonly scope: DualScope,
    private readonly out: Diagnostic[],
    private readonly reporting = true,
  ) {}

  private report(diagnostic: Diagnostic): null {
    if (this.reporting) this.out.push(diagnostic);
    return null;
  }

  private markNonlinear(expr: Expr, ...operands: Dual[]): void {
    if (this.nonlinearAt === null && operands.some((d) => !d.isConstant)) this.nonlinearAt = expr.range;
  }

  private finite(expr: Expr, result: Dual): Dual | null {
    if (Number.isFinite(result.value)) {
      if (result.gradient && result.gradient.some((g) => !Number.isFinite(g))) {
        return this.report(
          notDifferentiable.create(expr.range, [`${'`'}${printExpr(expr)}${'`'} has an infinite slope at the operating point; it cannot be linearised there`], {
            severity: 'error',
          }),
        );
      }
      return result;
    }
    return this.report(
      nonFinite.create(expr.range, [printExpr(expr), Number.isNaN(result.value) ? 'is not a number (NaN) at the operating point' : 'is infinite at the operating point']),
    );
  }

  evaluate(expr: Expr): Dual | null {
    switch (expr.kind) {
      case 'number': {
        if (expr.imaginary) return this.report(notReal.create(expr.range, [printExpr(expr), `${expr.value}i`, 'an equation']));
        if (!expr.unit) return Dual.constant(expr.value);
        const info = unitInfo(expr.unit.name);
        if (!info) return this.report(unknownUnit.create(expr.unit.range, [expr.unit.name, suggestName(expr.unit.name, unitNames)]));
        const value = expr.value * info.scale;
        this.report(unexpectedUnit.create(expr.unit.range, [printExpr(expr), 'an equation', value]));
        return Dual.constant(value);
      }
      case 'name':
        return this.name(expr);
      case 'unary': {
        const operand = this.evaluate(expr.operand);
        if (operand === null) return null;
        return expr.op === '-' ? D.neg(operand) : operand;
      }
      case 'binary': {
        const left = this.evaluate(expr.left);
        const right = this.evaluate(expr.right);
        if (left === null || right === null) return null;
        switch (expr.op) {
          case '+':
            return this.finite(expr, D.add(left, right));
          case '-':
            return this.finite(expr, D.sub(left, right));
          case '*':
            if (!left.isConstant && !right.isConstant) this.markNonlinear(expr, left, right);
            return this.finite(expr, D.mul(left, right));
          case '/':
            if (right.value === 0) return this.report(divisionByZero.create(expr.right.range, [printExpr(expr.right)]));
            this.markNonlinear(expr, right);
            return this.finite(expr, D.div(left, right));
          case '^': {
            if (!right.isConstant) {
              this.markNonlinear(expr, right);
              if (!(left.value > 0)) {
                return this.report(
                  notDifferentiable.create(expr.range, [
                    `${'`'}${printExpr(expr)}${'`'}: a power with a varying exponent needs a positive base at the operating point, got ${left.value}`,
                  ], { severity: 'error' }),
                );
              }
            } else if (right.value !== 1 && right.value !== 0) {
              this.markNonlinear(expr, left);
            }
            if (left.value === 0 && right.value < 0) return this.report(divisionByZero.create(expr.range, [printExpr(expr)]));
            return this.finite(expr, D.pow(left, right));
          }
        }
        return null;
      }
      case 'call':
        return this.call(expr);
      case 'matrix':
        return this.report(shapeMismatch.create(expr.range, ['a matrix in an equation: each equation defines one number']));
      case 'error':
        return null;
    }
  }

  private name(expr: NameExpr): Dual | null {
    const { signals, parameters, variableIndex, point } = this.scope;
    const index = variableIndex.get(expr.name);
    if (index !== undefined) return Dual.variable(point[index]!, index, point.length);
    const signal = signals.byName.get(expr.name);
    if (signal && signal.role === 'output') return this.report(outputReference.create(expr.range, [expr.name]));
    if (expr.name === 'pi') return Dual.constant(Math.PI);
    const parameter = parameters.get(expr.name);
    if (parameter) {
      if (parameter.value === null) return null;
      const z = asScalar(parameter.value);
      if (z === null) {
        return this.report(shapeMismatch.create(expr.range, [`parameter ${'`'}${expr.name}${'`'} is ${shapeText(parameter.value)}; an equation needs numbers`]));
      }
      if (!Cx.isNearlyReal(z)) return this.report(notReal.create(expr.range, [expr.name, Cx.formatComplex(z), 'a parameter used in an equation']));
      return Dual.constant(z.re);
    }
    const candidates = [...variableIndex.keys(), ...parameters.keys(), ...builtinConstants];
    const suggestion = suggestName(expr.name, candidates);
    const declared = suggestion ? (signals.byName.get(suggestion)?.range ?? parameters.get(suggestion)?.decl.name.range) : undefined;
    return this.report(
      unknownName.create(expr.range, [expr.name, 'name', suggestion], {
        related: declared ? [{ message: `${suggestion} is declared here`, range: declared }] : undefined,
        data: suggestion ? { fix: 'rename', replacement: suggestion } : undefined,
      }),
    );
  }

  private call(expr: Extract<Expr, { kind: 'call' }>): Dual | null {
    const name = expr.callee.name;
    if (!builtinFunctions.includes(name)) {
      for (const arg of expr.args) this.evaluate(arg);
      return this.report(unknownFunction.create(expr.callee.range, [name, suggestName(name, scalarFunctions)]));
    }
    if (!(scalarFunctions as readonly string[]).includes(name)) {
      return this.report(shapeMismatch.create(expr.range, [`${'`'}${name}${'`'} makes a matrix; an equation needs numbers`]));
    }
    if (expr.args.length !== 1) {
      for (const arg of expr.args) this.evaluate(arg);
      return this.report(wrongArity.create(expr.range, [name, '1 argument', expr.args.length]));
    }
    const argument = this.evaluate(expr.args[0]!);
    if (argument === null) return null;
    const x = argument.value;
    const domainError = (why: string): null => this.report(nonFinite.create(expr.range, [printExpr(expr), why]));
    if (name === 'log' && x <= 0) return domainError(`is undefined: log of ${x} at the operating point`);
    if (name === 'sqrt' && x < 0) return domainError(`is not real: sqrt of ${x} at the operating point`);
    if (!argument.isConstant) {
      this.markNonlinear(expr, argument);
      if (name === 'abs' && x === 0) {
        this.report(
          notDifferentiable.create(expr.range, [`${'`'}abs${'`'} is not differentiable at 0 here; its slope is taken as 0`]),
        );
      }
      if (name === 'sqrt' && x === 0) {
        return this.report(
          notDifferentiable.create(expr.range, [`${'`'}sqrt${'`'} has an infinite slope at 0; it cannot be linearised here`], { severity: 'error' }),
        );
      }
    }
    const { value, slope } = D.elementary[name]!(x);
    return this.finite(expr, D.apply(argument, value, argument.isConstant ? 0 : slope));
  }
}

/** Number of operation nodes in an expression (scales the rounding tolerance of its value). */
export function countOperations(expr: Expr): number {
  switch (expr.kind) {
    case 'unary':
      return 1 + countOperations(expr.operand);
    case 'binary':
      return 1 + countOperations(expr.left) + countOperations(expr.right);
    case 'call':
      return 1 + expr.args.reduce((sum, arg) => sum + countOperations(arg), 0);
    default:
      return 1;
  }
}

/**
 * Compiles an equation to a plain-number function of all variables (for simulation of the
 * nonlinear model). Only called on equations that evaluated without error.
 */
export function compileReal(expr: Expr, scope: Omit<DualScope, 'point'>): (v: ArrayLike<number>) => number {
  switch (expr.kind) {
    case 'number':
      return ((c) => () => c)(expr.value * (expr.unit ? (unitInfo(expr.unit.name)?.scale ?? 1) : 1));
    case 'name': {
      const index = scope.variableIndex.get(expr.name);
      if (index !== undefined) return (v) => v[index]!;
      if (expr.name === 'pi') return () => Math.PI;
      const parameter = scope.parameters.get(expr.name)?.value;
      const z = parameter ? asScalar(parameter) : null;
      const c = z ? z.re : Number.NaN;
      return () => c;
    }
    case 'unary': {
      const f = compileReal(expr.operand, scope);
      return expr.op === '-' ? (v) => -f(v) : f;
    }
    case 'binary': {
      const l = compileReal(expr.left, scope);
      const r = compileReal(expr.right, scope);
      switch (expr.op) {
        case '+':
          return (v) => l(v) + r(v);
        case '-':
          return (v) => l(v) - r(v);
        case '*':
          return (v) => l(v) * r(v);
        case '/':
          return (v) => l(v) / r(v);
        case '^':
          return (v) => Math.pow(l(v), r(v));
      }
      return () => Number.NaN;
    }
    case 'call': {
      const f = D.elementary[expr.callee.name];
      const arg = expr.args[0] ? compileReal(expr.args[0], scope) : () => Number.NaN;
      return f ? (v) => f(arg(v)).value : () => Number.NaN;
    }
    default:
      return () => Number.NaN;
  }
}
