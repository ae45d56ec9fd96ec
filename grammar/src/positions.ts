// Offset ↔ position conversion (0-based line, UTF-16 character), line terminators \n, \r\n, \r
// as in the editor protocol.
import type { Node, Position, Range } from './ast';

export class LineIndex {
  /** Offset of the first character of each line. */
  readonly lineStarts: number[];
  private lastLine = 0;

  constructor(readonly text: string) {
    const starts = [0];
    for (let i = 0; i < text.length; i++) {
      const code = text.charCodeAt(i);
      if (code === 13 /* \r */) {
        if (text.charCodeAt(i + 1) === 10) i++;
        starts.push(i + 1);
      } else if (code === 10 /* \n */) {
        starts.push(i + 1);
      }
    }
    this.lineStarts = starts;
  }

  positionAt(offset: number): Position {
    const clamped = Math.max(0, Math.min(offset, this.text.length));
    const starts = this.lineStarts;
    // Nodes are mostly created in text order: try the line of the previous lookup first.
    const hint = this.lastLine;
    if (starts[hint] <= clamped && (hint + 1 >= starts.length || starts[hint + 1] > clamped)) {
      return { line: hint, character: clamped - starts[hint] };
    }
    let low = 0;
    let high = starts.length - 1;
    while (low < high) {
      const mid = (low + high + 1) >> 1;
      if (starts[mid] <= clamped) low = mid;
      else high = mid - 1;
    }
    this.lastLine = low;
    return { line: low, character: clamped - starts[low] };
  }

  range(startOffset: number, endOffset: number): Range {
    return { start: this.positionAt(startOffset), end: this.positionAt(endOffset) };
  }

  /** A node's location fields for the half-open offset interval [startOffset, endOffset). */
  span(startOffset: number, endOffset: number): Node {
    return { range: this.range(startOffset, endOffset), startOffset, endOffset };
  }
}
