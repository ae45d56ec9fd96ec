// The checker sees half-typed text on every keystroke: every prefix of the fixtures, and
// every fixture with one line removed, must check without an internal error.
import { readdirSync, readFileSync } from 'node:fs';
import { join } from 'node:path';
import { describe, expect, it } from 'vitest';
import { parsePlantText } from '../../grammar/src/index';
import { checkDocument } from '../../server/src/model/check';

const directory = join(__dirname, '..', 'fixtures', 'model');
const texts = readdirSync(directory)
  .filter((name) => name.endsWith('.plant'))
  .sort()
  .map((name) => ({ name, text: readFileSync(join(directory, name), 'utf8') }));

function internalErrors(text: string): string[] {
  return checkDocument(parsePlantText(text))
    .diagnostics.filter((d) => d.code === 'model/internal-error')
    .map((d) => d.message);
}

describe('half-typed documents', () => {
  for (const { name, text } of texts) {
    it(`every prefix of ${name}`, () => {
      const step = name === 'clean.plant' ? 3 : 7;
      for (let end = 0; end <= text.length; end += step) {
        const failures = internalErrors(text.slice(0, end));
        expect(failures, `prefix of ${end} characters`).toEqual([]);
      }
    });

    it(`${name} with any one line removed`, () => {
      const lines = text.split('\n');
      for (let skip = 0; skip < lines.length; skip++) {
        const failures = internalErrors(lines.filter((_, i) => i !== skip).join('\n'));
        expect(failures, `without line ${skip + 1}`).toEqual([]);
      }
    });
  }
});
