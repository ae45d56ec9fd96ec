// Values with a physical meaning in controller lines: sample periods, times, percentages.
// A single number with a unit is read according to its place (`sample 200 Hz` is a 5 ms
// period); a bare number is read in the natural unit with a warning; a unit of the wrong
// kind is an error. Compound expressions are evaluated with units converted to SI.
import type { Expr } from '../../../grammar/src/ast';
import { missingUnit, outOfRange, sampleTooShort, unknownUnit, wrongUnit, divisionByZero } from './diagnostics/index';
import { suggestName } from './names';
import { realEntry } from './matrixSource';
import type { ValueScope } from './evaluate';
import { shortestSamplePeriod, unitInfo, unitNames } from './units';
import type { Diagnostic } from './types';

export type QuantityKind = 'period' | 'time' | 'percent';

const examples: Record<QuantityKind, string> = { period: '10 ms', time: '1.5 s', percent: '5 %' };

/** Reads a quantity; returns seconds for period/time, percent for percent; null when reported. */
export function readQuantity(expr: Expr, kind: QuantityKind, place: string, scope: ValueScope, out: Diagnostic[]): number | null {
  let value: number | null;
  if (expr.kind === 'number' && !expr.imaginary) {
    if (!expr.unit) {
      out.push(missingUnit.create(expr.range, [expr.text, kind === 'percent' ? `${expr.value} %` : `${expr.value} s`, examples[kind]]));
      value = expr.value;
    } else {
      const info = unitInfo(expr.unit.name);
      if (!info) {
        out.push(unknownUnit.create(expr.unit.range, [expr.unit.name, suggestName(expr.unit.name, unitNames)]));
        return null;
      }
      if (kind === 'percent' && info.kind !== 'percent') {
        out.push(wrongUnit.create(expr.unit.range, [`${'`'}${place}${'`'}`, 'a percentage', examples[kind]]));
        return null;
      }
      if (kind !== 'percent' && info.kind === 'percent') {
        out.push(wrongUnit.create(expr.unit.range, [`${'`'}${place}${'`'}`, kind === 'period' ? 'a period or a frequency' : 'a time', examples[kind]]));
        return null;
      }
      if (kind === 'time' && info.kind === 'frequency') {
        out.push(wrongUnit.create(expr.unit.range, [`${'`'}${place}${'`'}`, 'a time, not a frequency', examples[kind]]));
        return null;
      }
      if (info.kind === 'frequency') {
        if (expr.value === 0) {
          out.push(divisionByZero.create(expr.range, [`1 / (${expr.text} ${expr.unit.name})`]));
          return null;
        }
        value = 1 / (expr.value * info.scale);
      } else {
        value = kind === 'percent' ? expr.value : expr.value * info.scale;
      }
    }
  } else {
    value = realEntry(expr, { ...scope, unitsMeaningful: true }, out);
  }
  if (value === null) return null;
  if (kind === 'percent') {
    if (!(value >= 0 && value < 100)) {
      out.push(outOfRange.create(expr.range, [`${'`'}${place}${'`'} must be between 0 % and 100 %, got ${value} %`]));
      return null;
    }
    return value;
  }
  if (!(value > 0)) {
    out.push(outOfRange.create(expr.range, [`${kind === 'period' ? 'the sample period' : `${'`'}${place}${'`'}`} must be positive, got ${value} s`]));
    return null;
  }
  if (kind === 'period' && value < shortestSamplePeriod) {
    out.push(sampleTooShort.create(expr.range, [value]));
    return null;
  }
  return value;
}
