// Acceptance through the protocol: every bundled sample yields the same findings as a fresh
// analysis, and the integral-action quick fix on the fragile-prescaler sample removes the
// fragility warning, after which the code lens shows the integral gain Ki.
import { readdirSync, readFileSync } from 'node:fs';
import { join } from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { analyze } from '../../server/src/analyze';
import { toLspDiagnostic } from '../../server/src/lsp/convert';
import { applyLspEdits, ensureBuilt, LspSession, root } from './lspClient';

const samples = readdirSync(join(root, 'samples')).filter((name) => name.endsWith('.plant'));
let session: LspSession;

beforeAll(async () => {
  ensureBuilt();
  session = await LspSession.start({ settings: { debounceMs: 0 } });
});

afterAll(async () => {
  await session?.stop();
});

describe('samples through the language server', () => {
  it.each(samples)('%s: published findings equal a fresh analysis', async (sample) => {
    const text = readFileSync(join(root, 'samples', sample), 'utf8');
    const uri = `file:///samples/${sample}`;
    await session.open(uri, text);
    await session.waitForAnalysis(uri, 1);
    const expected = analyze(text).diagnostics.map((diagnostic) => toLspDiagnostic(diagnostic, uri));
    expect(session.lastDiagnostics(uri)!.diagnostics).toEqual(expected);
  });

  it('integral-action quick fix on dosing-tank.plant clears the fragility warning and the lens shows Ki', async () => {
    const text = readFileSync(join(root, 'samples', 'dosing-tank.plant'), 'utf8');
    const uri = 'file:///fix/dosing-tank.plant';
    await session.open(uri, text);
    await session.waitForAnalysis(uri, 1);
    const fragile = session.lastDiagnostics(uri)!.diagnostics.find((d) => d.code === 'control/fragile-prescaler');
    expect(fragile).toBeDefined();
    const actions = await session.request<{ title: string; edit: { changes: Record<string, { range: any; newText: string }[]> } }[]>(
      'textDocument/codeAction',
      { textDocument: { uri }, range: fragile!.range, context: { diagnostics: [fragile] } },
    );
    const integral = actions.find((action) => /integral/i.test(action.title));
    expect(integral, actions.map((a) => a.title).join(' | ')).toBeDefined();
    const fixed = applyLspEdits(text, integral!.edit.changes[uri]);
    expect(fixed).toMatch(/\n\s*integral level_sensor pole -?\d/);
    const version = await session.change(uri, [{ text: fixed }]);
    await session.waitForAnalysis(uri, version);
    const after = session.lastDiagnostics(uri)!.diagnostics;
    expect(after.map((d) => d.code)).not.toContain('control/fragile-prescaler');
    expect(after.filter((d) => d.severity === 1)).toEqual([]);
    const lenses = await session.request<{ command?: { title: string } }[]>('textDocument/codeLens', { textDocument: { uri } });
    expect(lenses.map((lens) => lens.command?.title ?? '').join('\n')).toMatch(/Ki\s*=/);
  });
});
