// Compact, readable form of a parse result for snapshot fixtures: leaves become one-line strings
// ("number 2 @1:13-1:14", "ident a @1:8-1:9"), other nodes an object whose `node` field names
// the kind and range; offsets are dropped (a separate invariant test checks they agree).
import type { ParseResult, Range } from '../../grammar/src/ast';

export function formatRange(range: Range): string {
  return `${range.start.line}:${range.start.character}-${range.end.line}:${range.end.character}`;
}

type AnyNode = Record<string, unknown> & { kind: string; range: Range };

function leaf(node: AnyNode): string | undefined {
  const at = `@${formatRange(node.range)}`;
  switch (node.kind) {
    case 'identifier':
      return `ident ${JSON.stringify(node.name)} ${at}`;
    case 'name':
      return `name ${String(node.name)} ${at}`;
    case 'error':
      return `error ${at}`;
    case 'number': {
      const unit = node.unit as AnyNode | undefined;
      const unitText = unit ? ` unit ${String(unit.name)}@${formatRange(unit.range)}` : '';
      return `number ${String(node.text)}=${String(node.value)}${node.imaginary ? ' imaginary' : ''}${unitText} ${at}`;
    }
    default:
      return undefined;
  }
}

function compactNode(value: unknown): unknown {
  if (Array.isArray(value)) return value.map(compactNode);
  if (value === null || typeof value !== 'object') return value;
  const record = value as AnyNode;
  if ('range' in record && typeof record.kind === 'string') {
    const asLeaf = leaf(record);
    if (asLeaf !== undefined) return asLeaf;
  }
  const out: Record<string, unknown> = {};
  if ('range' in record) {
    const label = [record.kind ?? 'span', record.op, record.role].filter((part) => part !== undefined).join(' ');
    out.node = `${label} @${formatRange(record.range)}`;
  }
  for (const [key, child] of Object.entries(record)) {
    if (['range', 'startOffset', 'endOffset', 'kind', 'op', 'role'].includes(key)) continue;
    out[key] = compactNode(child);
  }
  return out;
}

export function compactResult(result: ParseResult): unknown {
  return {
    diagnostics: result.diagnostics.map(
      (d) => `${formatRange(d.range)} ${d.severity} ${d.code}: ${d.message}`,
    ),
    document: compactNode(result.document),
  };
}
