// Transfer-function form (SISO): `transfer = N(s)/D(s)`. The expression is evaluated in
// rational arithmetic, the denominator made monic, an exactly proper function split into
// D = the ratio of leading coefficients plus a strictly proper rest, and the rest realised
// in controllable canonical (phase-variable) form:
//   states x1 … xn with x1 the lowest derivative (x(k+1) = xk'),
//   A = companion matrix with last row −a0 … −a(n−1), B = e_n, C = [b0 … b(n−1)].
import type { Expr, PlantDecl, TransferDecl } from '../../../grammar/src/ast';
import * as Cx from './complex';
import {
  divisionByZero,
  improperTransfer,
  inferredSignals,
  nonFinite,
  notRational,
  notReal,
  shadowedName,
  staticTransfer,
  transferSignals,
  unexpectedUnit,
  unknownName,
  unknownUnit,
  wrongArity,
  unknownFunction,
} from './diagnostics/index';
import { asScalar, builtinConstants, builtinFunctions, evaluateValue, scalarFunctions, shapeText } from './evaluate';
import { zeros } from './matrixSource';
import { suggestName } from './names';
import { parameterScope, type ParameterTable } from './parameters';
import { printExpr } from './printExpr';
import * as R from './rational';
import { addImpliedSignal, roleArticle, type SignalTable } from './signals';
import { unitInfo, unitNames } from './units';
import type { Diagnostic, MatrixSource, Rows } from './types';

export interface TransferFormResult {
  A: Rows;
  B: Rows;
  C: Rows;
  D: Rows;
  E: Rows;
  F: Rows;
  source?: MatrixSource;
  /** Monic denominator and matching numerator (lowest power first), as realised. */
  numerator: number[];
  denominator: number[];
}

export function buildTransferForm(
  plant: PlantDecl,
  transfer: TransferDecl,
  signals: SignalTable,
  parameters: ParameterTable,
  out: Diagnostic[],
): TransferFormResult | null {
  const errorsBefore = out.filter((d) => d.severity === 'error').length;
  if (parameters.has('s')) {
    out.push(
      shadowedName.create(parameters.get('s')!.decl.name.range, ['s', 'the Laplace variable', 'in `transfer` `s` means the Laplace variable'], {
        related: [{ message: 'the transfer function', range: transfer.range }],
      }),
    );
  }
  const evaluator = new RationalEvaluator(signals, parameters, out);
  const value = evaluator.evaluate(transfer.value);

  // Signals: one input and one output, named u and y when not declared.
  for (const [role, list, fallback] of [
    ['input', signals.inputs, 'u'],
    ['output', signals.outputs, 'y'],
  ] as const) {
    if (list.length > 1) {
      const line = signals.lines.find((l) => l.role === `${role}s`);
      out.push(transferSignals.create(line?.range ?? plant.name.range, [`a transfer function has one ${role}, but ${list.length} are declared`]));
    } else if (list.length === 0) {
      addImpliedSignal(signals, role, fallback, plant.name.range);
      out.push(inferredSignals.create(plant.name.range, [`no ${'`'}${role}s${'`'} declared: the ${role} is called ${'`'}${fallback}${'`'}`]));
    }
  }
  if (signals.disturbances.length > 0) {
    const line = signals.lines.find((l) => l.role === 'disturbances');
    out.push(transferSignals.create(line?.range ?? plant.name.range, ['a transfer function has no disturbance inputs; use matrix or equation form']));
  }
  if (value === null || out.filter((d) => d.severity === 'error').length > errorsBefore) return null;

  const num = R.trim(value.num);
  const den = R.trim(value.den);
  if (R.isZeroPolynomial(den)) {
    out.push(divisionByZero.create(transfer.value.range, [printExpr(transfer.value)]));
    return null;
  }
  const n = den.length - 1;
  const numeratorDegree = R.isZeroPolynomial(num) ? 0 : num.length - 1;
  if (numeratorDegree > n) {
    out.push(improperTransfer.create(transfer.value.range, [numeratorDegree, n]));
    return null;
  }
  if (n === 0) {
    out.push(staticTransfer.create(transfer.value.range, []));
    return null;
  }
  const lead = den[n]!;
  const monicDen = den.map((c) => c / lead);
  const monicNum = num.map((c) => c / lead);
  while (monicNum.length < n + 1) monicNum.push(0);
  const feedthrough = monicNum[n]!;
  const rest = monicNum.slice(0, n).map((c, k) => c - feedthrough * monicDen[k]!);

  // States: x1…xn unless the plant declares exactly n states.
  if (signals.declared.state) {
    if (signals.states.length !== n) {
      const line = signals.lines.find((l) => l.role === 'states');
      out.push(
        transferSignals.create(line?.range ?? plant.name.range, [
          `the transfer function has ${n} poles, so it needs ${n} states, but ${signals.states.length} are declared (or leave out ${'`'}states${'`'})`,
        ]),
      );
      return null;
    }
  } else {
    for (let i = 1; i <= n; i++) addImpliedSignal(signals, 'state', `x${i}`, transfer.range);
  }

  const A = zeros(n, n);
  for (let i = 0; i < n - 1; i++) A[i]![i + 1] = 1;
  for (let j = 0; j < n; j++) A[n - 1]![j] = -monicDen[j]!;
  const B = zeros(n, 1);
  B[n - 1]![0] = 1;
  const C = [rest];
  const D = [[feedthrough]];
  return {
    A,
    B,
    C,
    D,
    E: zeros(n, 0),
    F: zeros(1, 0),
    source: { range: transfer.value.range, rowRanges: [transfer.value.range], entryRanges: [[transfer.value.range]] },
    numerator: monicNum,
    denominator: monicDen,
  };
}

class RationalEvaluator {
  constructor(
    private readonly signals: SignalTable,
    private readonly parameters: ParameterTable,
    private readonly out: Diagnostic[],
  ) {}

  private report(d: Diagnostic): null {
    this.out.push(d);
    return null;
  }

  private finite(expr: Expr, r: R.Rational): R.Rational | null {
    if ([...r.num, ...r.den].every(Number.isFinite)) return r;
    return this.report(nonFinite.create(expr.range, [printExpr(expr), 'has a coefficient that is not finite']));
  }

  evaluate(expr: Expr): R.Rational | null {
    switch (expr.kind) {
      case 'number': {
        if (expr.imaginary) return this.report(notReal.create(expr.range, [printExpr(expr), `${expr.value}i`, 'a transfer-function coefficient']));
        if (!expr.unit) return R.constant(expr.value);
        if (expr.unit.name === 's') return R.mul(R.constant(expr.value), R.laplaceVariable()); // `2 s` means 2·s here
        const info = unitInfo(expr.unit.name);
        if (!info) return this.report(unknownUnit.create(expr.unit.range, [expr.unit.name, suggestName(expr.unit.name, unitNames)]));
        this.out.push(unexpectedUnit.create(expr.unit.range, [printExpr(expr), 'a transfer function', expr.value * info.scale]));
        return R.constant(expr.value * info.scale);
      }
      case 'name': {
        if (expr.name === 's') return R.laplaceVariable();
        if (expr.name === 'pi') return R.constant(Math.PI);
        const parameter = this.parameters.get(expr.name);
        if (parameter) {
          if (parameter.value === null) return null;
          const z = asScalar(parameter.value);
          if (z === null) return this.report(notRational.create(expr.range, [`parameter ${'`'}${expr.name}${'`'} is ${shapeText(parameter.value)}; a transfer function is a ratio of polynomials in s`]));
          if (!Cx.isNearlyReal(z)) return this.report(notReal.create(expr.range, [expr.name, Cx.formatComplex(z), 'a transfer-function coefficient']));
          return R.constant(z.re);
        }
        const signal = this.signals.byName.get(expr.name);
        if (signal) {
          return this.report(notRational.create(expr.range, [`${'`'}${expr.name}${'`'} is ${roleArticle[signal.role]}; a transfer function is written in s and parameters only`]));
        }
        const suggestion = suggestName(expr.name, [...this.parameters.keys(), 's', ...builtinConstants]);
        return this.report(unknownName.create(expr.range, [expr.name, 'name', suggestion]));
      }
      case 'unary': {
        const operand = this.evaluate(expr.operand);
        return operand === null ? null : expr.op === '-' ? R.neg(operand) : operand;
      }
      case 'binary': {
        const left = this.evaluate(expr.left);
        const right = this.evaluate(expr.right);
        if (left === null || right === null) return null;
        switch (expr.op) {
          case '+':
            return this.finite(expr, R.add(left, right));
          case '-':
            return this.finite(expr, R.add(left, right, -1));
          case '*':
            return this.finite(expr, R.mul(left, right));
          case '/':
            if (R.isZeroPolynomial(right.num)) return this.report(divisionByZero.create(expr.right.range, [printExpr(expr.right)]));
            return this.finite(expr, R.div(left, right));
          case '^': {
            if (!R.isConstant(right)) return this.report(notRational.create(expr.right.range, ['an exponent cannot contain s; a transfer function is a ratio of polynomials']));
            const k = R.constantValue(right);
            if (R.isConstant(left)) return this.finite(expr, R.constant(Math.pow(R.constantValue(left), k)));
            if (!Number.isInteger(k) || Math.abs(k) > 64) {
              return this.report(notRational.create(expr.right.range, [`${'`'}${printExpr(expr)}${'`'}: powers of s must be whole numbers (got ${k})`]));
            }
            if (k < 0 && R.isZeroPolynomial(left.num)) return this.report(divisionByZero.create(expr.range, [printExpr(expr)]));
            return this.finite(expr, R.power(left, k));
          }
        }
        return null;
      }
      case 'call': {
        const name = expr.callee.name;
        if (!builtinFunctions.includes(name)) return this.report(unknownFunction.create(expr.callee.range, [name, suggestName(name, builtinFunctions)]));
        if (!(scalarFunctions as readonly string[]).includes(name)) {
          return this.report(notRational.create(expr.range, [`${'`'}${name}${'`'} makes a matrix; a transfer function is a single-input single-output ratio of polynomials`]));
        }
        if (expr.args.length !== 1) return this.report(wrongArity.create(expr.range, [name, '1 argument', expr.args.length]));
        const argument = this.evaluate(expr.args[0]!);
        if (argument === null) return null;
        if (!R.isConstant(argument)) {
          return this.report(notRational.create(expr.range, [`${'`'}${printExpr(expr)}${'`'} is not a polynomial in s; a transfer function is a ratio of polynomials`]));
        }
        // A function of constants: evaluate it as a number (in the parameter scope, for the same errors).
        const value = evaluateValue(expr, parameterScope(this.parameters, this.signals, 'a transfer-function coefficient'), this.out);
        const z = value ? asScalar(value) : null;
        if (z === null) return null;
        if (!Cx.isNearlyReal(z)) return this.report(notReal.create(expr.range, [printExpr(expr), Cx.formatComplex(z), 'a transfer-function coefficient']));
        return R.constant(z.re);
      }
      case 'matrix':
        return this.report(notRational.create(expr.range, ['a matrix in a transfer function: only single-input single-output transfer functions are supported']));
      case 'error':
        return null;
    }
  }
}
