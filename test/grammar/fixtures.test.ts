// Data-driven parser fixtures: each test/fixtures/parser/*.plant has a compact snapshot
// *.expected.json (regenerate with UPDATE_FIXTURES=1) and may carry inline `# ^^^ text` markers.
import { existsSync, readdirSync, readFileSync, writeFileSync } from 'node:fs';
import { join } from 'node:path';
import { describe, expect, it } from 'vitest';
import { parsePlantText } from '../../grammar/src/index';
import { compactResult } from './compact';
import { parseMarkers, unmatchedMarkers } from './markers';
import { checkTreeInvariants } from './invariants';

const fixtureDirectory = join(__dirname, '..', 'fixtures', 'parser');
const update = process.env.UPDATE_FIXTURES === '1';
const fixtures = readdirSync(fixtureDirectory)
  .filter((file) => file.endsWith('.plant'))
  .sort();

describe('parser fixtures', () => {
  it('has at least 25 fixtures, valid and invalid', () => {
    expect(fixtures.length).toBeGreaterThanOrEqual(25);
    expect(fixtures.some((f) => f.startsWith('valid-'))).toBe(true);
    expect(fixtures.some((f) => f.startsWith('invalid-'))).toBe(true);
  });

  for (const file of fixtures) {
    describe(file, () => {
      const text = readFileSync(join(fixtureDirectory, file), 'utf8');
      const result = parsePlantText(text);

      it('matches its snapshot', () => {
        const expectedPath = join(fixtureDirectory, file.replace(/\.plant$/, '.expected.json'));
        const actual = `${JSON.stringify(compactResult(result), null, 1)}\n`;
        if (update || !existsSync(expectedPath)) {
          if (!update) throw new Error(`missing snapshot ${expectedPath}; run with UPDATE_FIXTURES=1`);
          writeFileSync(expectedPath, actual);
        }
        expect(actual).toBe(readFileSync(expectedPath, 'utf8'));
      });

      it('satisfies its inline markers', () => {
        const markers = parseMarkers(text);
        expect(unmatchedMarkers(markers, result.diagnostics)).toEqual([]);
      });

      it('has consistent ranges and offsets on every node', () => {
        expect(checkTreeInvariants(text, result)).toEqual([]);
      });

      if (file.startsWith('valid-')) {
        it('parses without diagnostics', () => {
          expect(result.diagnostics).toEqual([]);
        });
      } else {
        it('reports at least one diagnostic per marker', () => {
          expect(result.diagnostics.length).toBeGreaterThanOrEqual(Math.max(1, parseMarkers(text).length));
        });
      }
    });
  }
});
