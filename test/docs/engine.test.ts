// docs/engine.md is written by hand; this test keeps the numbers and file names it quotes in step
// with the code: every setting's default, the size limits, and every source or test file named.
import { existsSync, readFileSync } from 'node:fs';
import { join, resolve } from 'node:path';
import { describe, expect, it } from 'vitest';
import { FRAGILITY_FLOP_BUDGET } from '../../server/src/control/controllerDesign';
import { MARGIN_STATE_LIMIT, TRANSFER_PAIR_LIMIT, TRANSFER_STATE_LIMIT } from '../../server/src/control/plantReport';
import { defaultSettings } from '../../server/src/control/settings';

const root = resolve(__dirname, '../..');
const text = readFileSync(join(root, 'docs/engine.md'), 'utf8');

/** The first number in a table cell: "10 %" → 10, "1e6" → 1e6. */
function leadingNumber(cell: string): number {
  const match = /-?\d+(?:\.\d+)?(?:e-?\d+)?/i.exec(cell);
  return match ? Number(match[0]) : Number.NaN;
}

describe('docs/engine.md', () => {
  it('states every setting with its current default', () => {
    for (const [key, value] of Object.entries(defaultSettings)) {
      const row = text.split('\n').find((line) => line.startsWith(`| \`${key}\` |`));
      expect(row, `settings table row for ${key}`).toBeDefined();
      const cell = (row as string).split('|')[2];
      expect(leadingNumber(cell), `default of ${key}`).toBe(value);
    }
  });

  it('states the size limits of the plant analyses', () => {
    expect(text).toContain(`\`MARGIN_STATE_LIMIT\` = ${MARGIN_STATE_LIMIT}`);
    expect(text).toContain(`\`TRANSFER_STATE_LIMIT\` = ${TRANSFER_STATE_LIMIT}`);
    expect(text).toContain(`\`TRANSFER_PAIR_LIMIT\` = ${TRANSFER_PAIR_LIMIT}`);
    const budget = /`FRAGILITY_FLOP_BUDGET` = ([0-9.e]+)/.exec(text);
    expect(Number(budget?.[1])).toBe(FRAGILITY_FLOP_BUDGET);
  });

  it('names only files that exist', () => {
    const named = new Set<string>();
    for (const match of text.matchAll(/\b((?:control|numeric)\/[A-Za-z0-9/]+\.ts)\b/g)) named.add(join('server/src', match[1]));
    for (const match of text.matchAll(/\b(test\/[A-Za-z0-9_/.]+\.(?:ts|py|json))\b/g)) named.add(match[1]);
    expect(named.size).toBeGreaterThan(20);
    expect([...named].filter((path) => !existsSync(join(root, path)))).toEqual([]);
  });
});
