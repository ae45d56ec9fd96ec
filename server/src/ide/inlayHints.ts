// Inlay hints: the value of a param written as an expression, the shape of each model matrix,
// and the period of a sample rate given in Hz.
import type { Position, Range } from '../../../grammar/src/ast';
import type { FastCheck } from '../analyze';
import { formatNumber, shapeOf } from './numbers';
import { comparePositions } from './text';

export interface InlayHintRecord {
  position: Position;
  label: string;
  kind: 'type' | 'parameter';
  paddingLeft?: boolean;
  paddingRight?: boolean;
  tooltip?: string;
}

function inside(range: Range, position: Position): boolean {
  return comparePositions(range.start, position) <= 0 && comparePositions(position, range.end) <= 0;
}

export function inlayHints(fast: FastCheck, range?: Range): InlayHintRecord[] {
  const hints: InlayHintRecord[] = [];
  const plants = fast.model.plants;
  const document = fast.parse.document;
  document.declarations.forEach((declaration) => {
    if (range && (comparePositions(declaration.range.end, range.start) < 0 || comparePositions(range.end, declaration.range.start) < 0)) return;
    if (declaration.kind === 'plant') {
      const plant = plants.find((p) => p.name === declaration.name.name && p.nameRange.start.line === declaration.name.range.start.line);
      if (!plant) return;
      for (const item of declaration.items) {
        if (item.kind === 'param') {
          if (item.value.kind === 'number' && !item.value.unit) continue;
          const value = plant.parameters.find((p) => p.name === item.name.name && p.range.start.line === item.name.range.start.line);
          if (value) hints.push({ position: item.value.range.end, label: `= ${formatNumber(value.value)}`, kind: 'parameter', paddingLeft: true });
        } else if (item.kind === 'matrixAssign' && plant.usable) {
          const rows = ({ A: plant.A, B: plant.B, C: plant.C, D: plant.D, E: plant.E } as Record<string, number[][]>)[item.name.name];
          if (rows) hints.push({ position: item.name.range.end, label: shapeOf(rows), kind: 'type', paddingLeft: true });
        }
      }
    } else {
      const controller = fast.model.controllers.find((c) => c.name === declaration.name.name && c.nameRange.start.line === declaration.name.range.start.line);
      if (!controller) return;
      for (const item of declaration.items) {
        if (item.kind === 'sample' && controller.sample && item.value.kind === 'number' && item.value.unit && /Hz$/.test(item.value.unit.name)) {
          hints.push({ position: item.value.range.end, label: `= ${formatNumber(controller.sample.period * 1000)} ms`, kind: 'parameter', paddingLeft: true });
        }
      }
    }
  });
  return range ? hints.filter((hint) => inside(range, hint.position)) : hints;
}
