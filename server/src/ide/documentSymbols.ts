// Outline: plants with their params, signals and matrices; controllers with their design lines.
import type { Range } from '../../../grammar/src/ast';
import type { FastCheck } from '../analyze';

export type OutlineKind = 'plant' | 'controller' | 'param' | 'state' | 'input' | 'output' | 'disturbance' | 'matrix' | 'equation' | 'design';

export interface OutlineSymbol {
  name: string;
  detail: string;
  kind: OutlineKind;
  range: Range;
  selectionRange: Range;
  children: OutlineSymbol[];
}

export function documentSymbols(fast: FastCheck): OutlineSymbol[] {
  const text = fast.text;
  const snippet = (start: number, end: number) => {
    const raw = text.slice(start, end).replace(/\s+/g, ' ').trim();
    return raw.length > 60 ? raw.slice(0, 59) + '…' : raw;
  };
  const symbols: OutlineSymbol[] = [];
  for (const declaration of fast.parse.document.declarations) {
    if (!declaration.name.name) continue;
    if (declaration.kind === 'plant') {
      const children: OutlineSymbol[] = [];
      for (const item of declaration.items) {
        switch (item.kind) {
          case 'param':
            if (item.name.name)
              children.push({
                name: item.name.name,
                detail: snippet(item.value.startOffset, item.value.endOffset),
                kind: 'param',
                range: item.range,
                selectionRange: item.name.range,
                children: [],
              });
            break;
          case 'signals': {
            const kind = ({ states: 'state', inputs: 'input', outputs: 'output', disturbances: 'disturbance' } as const)[item.role];
            for (const name of item.names) {
              if (name.name) children.push({ name: name.name, detail: kind, kind, range: name.range, selectionRange: name.range, children: [] });
            }
            break;
          }
          case 'matrixAssign':
            children.push({
              name: item.name.name,
              detail: item.value.kind === 'matrix' ? `${item.value.rows.length} rows` : '',
              kind: 'matrix',
              range: item.range,
              selectionRange: item.name.range,
              children: [],
            });
            break;
          case 'stateEquation':
            children.push({ name: `${item.state.name}'`, detail: snippet(item.value.startOffset, item.value.endOffset), kind: 'equation', range: item.range, selectionRange: item.state.range, children: [] });
            break;
          case 'outputEquation':
            children.push({ name: `output ${item.output.name}`, detail: snippet(item.value.startOffset, item.value.endOffset), kind: 'equation', range: item.range, selectionRange: item.output.range, children: [] });
            break;
          case 'transfer':
            children.push({ name: 'transfer', detail: snippet(item.value.startOffset, item.value.endOffset), kind: 'equation', range: item.range, selectionRange: item.range, children: [] });
            break;
          case 'around':
            children.push({ name: 'around', detail: snippet(item.startOffset, item.endOffset).replace(/^around\s*/, ''), kind: 'equation', range: item.range, selectionRange: item.range, children: [] });
            break;
        }
      }
      symbols.push({ name: declaration.name.name, detail: 'plant', kind: 'plant', range: declaration.range, selectionRange: declaration.name.range, children });
    } else {
      const children = declaration.items.map(
        (item): OutlineSymbol => ({
          name: item.kind,
          detail: snippet(item.startOffset, item.endOffset).replace(new RegExp(`^${item.kind}\\s*`), ''),
          kind: 'design',
          range: item.range,
          selectionRange: item.range,
          children: [],
        }),
      );
      symbols.push({
        name: declaration.name.name,
        detail: declaration.plant ? `for ${declaration.plant.name}` : 'controller',
        kind: 'controller',
        range: declaration.range,
        selectionRange: declaration.name.range,
        children,
      });
    }
  }
  return symbols;
}
