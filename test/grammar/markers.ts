// Inline diagnostic markers for fixtures: a comment line `# ^^^ message text` asserts that some
// diagnostic covers the caret columns on the nearest line above that is not itself a marker,
// and that its message contains the text. Reusable by other areas' fixture tests.

export interface ExpectedMarker {
  /** 0-based line the carets point at. */
  line: number;
  /** First caret column (UTF-16, 0-based). */
  startChar: number;
  /** One past the last caret column. */
  endChar: number;
  /** Substring the diagnostic message must contain (may be empty). */
  text: string;
  /** 0-based line of the marker comment itself. */
  markerLine: number;
}

const MARKER = /^(\s*)#(\s*)(\^+)\s*(.*)$/;

export function parseMarkers(source: string): ExpectedMarker[] {
  const lines = source.split(/\r\n|\r|\n/);
  const markers: ExpectedMarker[] = [];
  let target = -1;
  lines.forEach((lineText, index) => {
    const match = MARKER.exec(lineText);
    if (!match) {
      target = index;
      return;
    }
    if (target < 0) return;
    const startChar = match[1].length + 1 + match[2].length;
    markers.push({
      line: target,
      startChar,
      endChar: startChar + match[3].length,
      text: match[4].trim(),
      markerLine: index,
    });
  });
  return markers;
}

export interface RangeLike {
  start: { line: number; character: number };
  end: { line: number; character: number };
}

/**
 * True when the diagnostic range covers the marker's carets. A zero-width range (a missing
 * token at the end of a line) counts as covering a single caret placed at its position.
 */
export function rangeCoversMarker(range: RangeLike, marker: ExpectedMarker): boolean {
  const { start, end } = range;
  const startsBefore =
    start.line < marker.line || (start.line === marker.line && start.character <= marker.startChar);
  const effectiveEnd =
    start.line === end.line && start.character === end.character
      ? { line: end.line, character: end.character + 1 }
      : end;
  const endsAfter =
    effectiveEnd.line > marker.line || (effectiveEnd.line === marker.line && effectiveEnd.character >= marker.endChar);
  return startsBefore && endsAfter;
}

/** Markers not matched by any diagnostic (empty when all are satisfied). */
export function unmatchedMarkers<D extends { range: RangeLike; message: string }>(
  markers: ExpectedMarker[],
  diagnostics: D[],
): ExpectedMarker[] {
  return markers.filter(
    (marker) =>
      !diagnostics.some(
        (diagnostic) => rangeCoversMarker(diagnostic.range, marker) && diagnostic.message.includes(marker.text),
      ),
  );
}
