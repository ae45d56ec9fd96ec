// The examples in docs/language.md are real: every complete example (a block starting with
// `plant` or `controller`) checks without errors or warnings when put together.
import { readFileSync } from 'node:fs';
import { join } from 'node:path';
import { describe, expect, it } from 'vitest';
import { parsePlantText } from '../../grammar/src/index';
import { checkDocument } from '../../server/src/model/check';
import { check, problems } from './helpers';

const reference = readFileSync(join(__dirname, '..', '..', 'docs', 'language.md'), 'utf8');
const blocks = [...reference.matchAll(/```\n([\s\S]*?)```/g)].map((m) => m[1]!);
const complete = blocks.filter((block) => /^(plant|controller) /m.test(block.replace(/^#.*$/gm, '').trimStart()));

describe('docs/language.md', () => {
  it('has complete examples', () => {
    expect(complete.length).toBeGreaterThanOrEqual(4);
  });

  it('its complete examples check cleanly together', () => {
    const doc = check(complete.join('\n'));
    expect(problems(doc)).toEqual([]);
    expect(doc.plants.every((p) => p.usable)).toBe(true);
    expect(doc.controllers.every((c) => c.usable)).toBe(true);
  });

  it('documents every unit and function the checker knows', async () => {
    const { unitNames } = await import('../../server/src/model/units');
    const { builtinFunctions } = await import('../../server/src/model/evaluate');
    for (const name of [...unitNames, ...builtinFunctions]) expect(reference).toContain(name);
  });

  it('is right that `2 s^2` reads as (2 s)^2 in a transfer function (the parser warns)', () => {
    const parse = parsePlantText('plant a {\n  transfer = 1 / (2 s^2 + 1)\n}\nplant b {\n  transfer = 1 / (4*s^2 + 1)\n}\n');
    expect(parse.diagnostics.map((d) => [d.severity, d.code, d.range.start.line])).toEqual([['warning', 'syntax/unit-power', 1]]);
    const doc = checkDocument(parse);
    expect(doc.plants[0]!.A).toEqual(doc.plants[1]!.A);
  });
});
