// Data-driven model fixtures: every `.plant` file under test/fixtures/model carries inline
// markers `#  ^^^ <severity> <code>: <message>` under the text each diagnostic must cover
// exactly. Every model diagnostic must be marked, and every marker matched: the set of
// diagnostics is asserted, not just a subset.
import { readdirSync, readFileSync } from 'node:fs';
import { join } from 'node:path';
import { describe, expect, it } from 'vitest';
import { parsePlantText } from '../../grammar/src/index';
import { checkDocument } from '../../server/src/model/check';
import { modelDiagnosticKinds } from '../../server/src/model/diagnostics/index';
import { parseMarkers } from '../grammar/markers';

const directory = join(__dirname, '..', 'fixtures', 'model');
const files = readdirSync(directory).filter((name) => name.endsWith('.plant')).sort();

interface Expected {
  line: number;
  start: number;
  end: number;
  severity: string;
  code: string;
  message: string;
}

function expectedDiagnostics(text: string): Expected[] {
  return parseMarkers(text).map((marker) => {
    const match = /^(error|warning|info) (\S+): (.*)$/.exec(marker.text);
    if (!match) throw new Error(`marker on line ${marker.markerLine + 1} is not "<severity> <code>: <message>"`);
    return { line: marker.line, start: marker.startChar, end: marker.endChar, severity: match[1]!, code: match[2]!, message: match[3]! };
  });
}

const seenCodes = new Set<string>();

describe('model fixtures', () => {
  it('finds the fixture files', () => {
    expect(files.length).toBeGreaterThanOrEqual(8);
  });

  for (const file of files) {
    it(file, () => {
      const text = readFileSync(join(directory, file), 'utf8');
      const parse = parsePlantText(text);
      expect(parse.diagnostics, 'fixtures are free of syntax errors').toEqual([]);
      const model = checkDocument(parse);
      const actual: Expected[] = model.diagnostics.map((d) => {
        expect(d.range.start.line, `${d.code} spans one line`).toBe(d.range.end.line);
        return {
          line: d.range.start.line,
          start: d.range.start.character,
          end: d.range.end.character,
          severity: d.severity,
          code: d.code,
          message: d.message,
        };
      });
      const order = (a: Expected, b: Expected) =>
        a.line - b.line || a.start - b.start || a.end - b.end || a.code.localeCompare(b.code) || a.message.localeCompare(b.message);
      expect(actual.sort(order)).toEqual(expectedDiagnostics(text).sort(order));
      for (const d of actual) seenCodes.add(d.code);
    });
  }

  it('exercises every registered diagnostic code (internal-error and unknown-unit are tested directly)', () => {
    const untested = modelDiagnosticKinds
      .map((kind) => kind.code)
      .filter((code) => !seenCodes.has(code) && code !== 'model/internal-error' && code !== 'model/unknown-unit');
    expect(untested).toEqual([]);
  });
});
