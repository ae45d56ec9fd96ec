// The bundled server over stdio, driven by a real JSON-RPC client: sync, diagnostics,
// hover, lenses, quick fixes, rename, formatting, completion, outline.
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { analyze, checkText, WARM_START_FROM_STATES } from '../../server/src/analyze';
import { heatedRodModel } from '../control/heatedRod';
import { toLspDiagnostic } from '../../server/src/lsp/convert';
import { codeLenses } from '../../server/src/ide/codeLens';
import { formatText } from '../../server/src/ide/format';
import { applyLspEdits, ensureBuilt, LspSession, withCursor } from './lspClient';

const HOIST = `# hoist scenario
plant hoist {
  param J  = 0.012      # inertia, kg m^2
  param b  = 0.004
  param kt = 0.08
  param r  = 0.05

  states  theta, omega
  inputs  current
  outputs height

  A = [0, 1;
       0, -b/J]
  B = [0; kt/J]
  C = [r, 0]
}

controller lift for hoist {
  poles = [-4 + 3j, -4 - 3j]
  track height
  step height to 0.2
}
`;

let session: LspSession;
let documentCount = 0;
const nextUri = () => `file:///protocol/model${++documentCount}.plant`;

/** Opens a document and waits for its slow analysis. */
async function openAnalysed(text: string): Promise<string> {
  const uri = nextUri();
  await session.open(uri, text);
  await session.waitForAnalysis(uri, 1);
  return uri;
}

function expectedDiagnostics(text: string, uri: string) {
  return analyze(text).diagnostics.map((diagnostic) => toLspDiagnostic(diagnostic, uri));
}

beforeAll(async () => {
  ensureBuilt();
  session = await LspSession.start({ settings: { debounceMs: 0 } });
});

afterAll(async () => {
  await session?.stop();
});

describe('language server over stdio', () => {
  it('declares its capabilities statically, with incremental sync', () => {
    const result = session.initializeResult as { capabilities: Record<string, unknown>; serverInfo: { name: string } };
    expect(result.serverInfo.name).toBe('loopwright');
    expect(result.capabilities.textDocumentSync).toMatchObject({ openClose: true, change: 2 });
    for (const capability of [
      'hoverProvider',
      'completionProvider',
      'definitionProvider',
      'referencesProvider',
      'documentSymbolProvider',
      'codeActionProvider',
      'codeLensProvider',
      'documentFormattingProvider',
      'renameProvider',
      'foldingRangeProvider',
      'semanticTokensProvider',
      'inlayHintProvider',
      'signatureHelpProvider',
    ]) {
      expect(result.capabilities[capability], capability).toBeTruthy();
    }
  });

  it('publishes the fast checks, then the full analysis, stamped with the version', async () => {
    const uri = nextUri();
    await session.open(uri, HOIST);
    const first = await session.waitForDiagnostics((p) => p.uri === uri);
    expect(first.version).toBe(1);
    await session.waitForAnalysis(uri, 1);
    expect(session.lastDiagnostics(uri)!.diagnostics).toEqual(expectedDiagnostics(HOIST, uri));
  });

  it('applies incremental changes and reports an unknown name at its exact range', async () => {
    const uri = await openAnalysed(HOIST);
    // Replace `b/J` on line 12 by `bb/J` (an unknown name).
    const line = HOIST.split('\n')[12];
    const character = line.indexOf('b/J');
    const version = await session.change(uri, [{ range: { start: { line: 12, character }, end: { line: 12, character: character + 1 } }, text: 'bb' }]);
    await session.waitForAnalysis(uri, version);
    const published = session.lastDiagnostics(uri)!;
    expect(published.version).toBe(version);
    const edited = HOIST.replace('-b/J', '-bb/J');
    expect(published.diagnostics).toEqual(expectedDiagnostics(edited, uri));
    const unknown = published.diagnostics.find((d) => String(d.code).includes('unknown-name'));
    expect(unknown?.range).toEqual({ start: { line: 12, character }, end: { line: 12, character: character + 2 } });
  });

  it('settles on the last version after a burst of edits sent without waiting', async () => {
    const uri = await openAnalysed(HOIST);
    let text = HOIST;
    let version = 1;
    // Type `0.0125` over `0.012` one character at a time, then an unknown name, all at once.
    for (const [line, character, insert] of [
      [2, 16, '5'],
      [2, 17, '0'],
      [12, 9, 'q'],
      [12, 10, 'q'],
    ] as const) {
      const lines = text.split('\n');
      lines[line] = lines[line].slice(0, character) + insert + lines[line].slice(character);
      text = lines.join('\n');
      version = await session.change(uri, [{ range: { start: { line, character }, end: { line, character } }, text: insert }]);
    }
    await session.waitForAnalysis(uri, version);
    const published = session.published.filter((p) => p.uri === uri);
    expect(published[published.length - 1].version).toBe(version);
    expect(published[published.length - 1].diagnostics).toEqual(expectedDiagnostics(text, uri));
    const versions = published.map((p) => p.version ?? 0);
    expect(versions.every((v, i) => i === 0 || v >= versions[i - 1])).toBe(true);
  });

  it('answers hover on a param with its value and on a matrix with its shape', async () => {
    const { text, position } = withCursor(HOIST.replace('param kt', 'param k|t'));
    const uri = await openAnalysed(text);
    const hover = await session.request<{ contents: { kind: string; value: string } }>('textDocument/hover', { textDocument: { uri }, position });
    expect(hover.contents.kind).toBe('markdown');
    expect(hover.contents.value).toContain('param kt');
    expect(hover.contents.value).toContain('0.08');
    const matrix = await session.request<{ contents: { value: string } }>('textDocument/hover', {
      textDocument: { uri },
      position: { line: 13, character: 2 },
    });
    expect(matrix.contents.value).toContain('2×1');
  });

  it('shows the code lenses the ide layer computes for each controller', async () => {
    const uri = await openAnalysed(HOIST);
    const lenses = await session.request<{ range: { start: { line: number } }; command: { title: string; command: string; arguments?: unknown[] } }[]>(
      'textDocument/codeLens',
      { textDocument: { uri } },
    );
    const expected = codeLenses(analyze(HOIST));
    expect(lenses.map((lens) => lens.command.title)).toEqual(expected.map((lens) => lens.title));
    expect(lenses.every((lens) => lens.range.start.line === 17 || (lens.range.start.line === 1 && !lens.command.command))).toBe(true);
    for (const lens of lenses) {
      if (lens.command.command) expect(lens.command.arguments).toEqual([{ uri, controller: 'lift' }]);
    }
  });

  it('offers a quick fix that, applied, clears the diagnostic', async () => {
    // `thet` is close to the declared state `theta`: the model suggests the rename.
    const text = HOIST.replace('track height', 'track heigth');
    const uri = await openAnalysed(text);
    const published = session.lastDiagnostics(uri)!;
    const target = published.diagnostics.find((d) => (d.data as { fix?: string } | undefined)?.fix);
    expect(target, JSON.stringify(published.diagnostics)).toBeDefined();
    const actions = await session.request<{ title: string; edit: { changes: Record<string, { range: never; newText: string }[]> } }[]>(
      'textDocument/codeAction',
      { textDocument: { uri }, range: target!.range, context: { diagnostics: [target] } },
    );
    expect(actions.length).toBeGreaterThan(0);
    const fixed = applyLspEdits(text, actions[0].edit.changes[uri]);
    expect(fixed).toContain('track height');
    const version = await session.change(uri, [{ text: fixed }]);
    await session.waitForAnalysis(uri, version);
    const after = session.lastDiagnostics(uri)!;
    expect(after.diagnostics.filter((d) => d.code === target!.code)).toEqual([]);
  });

  it('fixes a finding of the slow analysis through its quick fix', async () => {
    const uri = await openAnalysed(HOIST);
    const published = session.lastDiagnostics(uri)!;
    const fastCodes = new Set(checkText(HOIST).diagnostics.map((d) => d.code));
    const target = published.diagnostics.find((d) => !fastCodes.has(String(d.code)) && (d.data as { fix?: string } | undefined)?.fix);
    expect(target, JSON.stringify(published.diagnostics)).toBeDefined();
    const actions = await session.request<{ title: string; edit: { changes: Record<string, never[]> } }[]>('textDocument/codeAction', {
      textDocument: { uri },
      range: target!.range,
      context: { diagnostics: [target] },
    });
    expect(actions.length).toBeGreaterThan(0);
    const fixed = applyLspEdits(HOIST, actions[0].edit.changes[uri]);
    const version = await session.change(uri, [{ text: fixed }]);
    await session.waitForAnalysis(uri, version);
    const after = session.lastDiagnostics(uri)!.diagnostics;
    expect(after).toEqual(expectedDiagnostics(fixed, uri));
    expect(after.filter((d) => d.code === target!.code)).toEqual([]);
  });

  it('keeps the slow findings, moved with the edit, in the fast publication', async () => {
    const uri = await openAnalysed(HOIST);
    const before = session.lastDiagnostics(uri)!.diagnostics;
    const fastCodes = new Set(checkText(HOIST).diagnostics.map((d) => d.code));
    const slow = before.filter((d) => !fastCodes.has(String(d.code)));
    expect(slow.length).toBeGreaterThan(0);
    // Insert a comment line at the top: every finding moves one line down.
    const version = await session.change(uri, [{ range: { start: { line: 0, character: 0 }, end: { line: 0, character: 0 } }, text: '# note\n' }]);
    const fast = await session.waitForDiagnostics((p) => p.uri === uri && p.version === version);
    for (const finding of slow) {
      const moved = fast.diagnostics.find((d) => d.code === finding.code && d.message === finding.message);
      expect(moved?.range.start.line, finding.code as string).toBe(finding.range.start.line + 1);
    }
    await session.waitForAnalysis(uri, version);
  });

  it('renames a plant output in the plant and in the controllers that use it', async () => {
    const { text, position } = withCursor(HOIST.replace('outputs height', 'outputs hei|ght'));
    const uri = await openAnalysed(text);
    const edit = await session.request<{ changes: Record<string, { range: never; newText: string }[]> }>('textDocument/rename', {
      textDocument: { uri },
      position,
      newName: 'level',
    });
    const edits = edit.changes[uri];
    expect(edits).toHaveLength(3); // outputs line, track, step
    const renamed = applyLspEdits(text, edits);
    expect(renamed).toContain('track level');
    expect(renamed).toContain('step level to 0.2');
    expect(analyze(renamed).diagnostics.filter((d) => d.severity === 'error')).toEqual([]);
  });

  it('refuses a rename onto a reserved word', async () => {
    const { text, position } = withCursor(HOIST.replace('states  theta', 'states  th|eta'));
    const uri = await openAnalysed(text);
    await expect(session.request('textDocument/rename', { textDocument: { uri }, position, newName: 'plant' })).rejects.toThrow(/reserved/);
  });

  it('formats a document and leaves a formatted one alone', async () => {
    const messy = `plant p {\n      states x,v\n   inputs u\n outputs x\n A = [0,1;\n 0, -2.5]\n    B = [0;1]\n C=[1,0]\n}\n\n\n\ncontroller c for p {\npoles = [-1, -2]   \n}\n`;
    const uri = await openAnalysed(messy);
    const edits = await session.request<{ range: never; newText: string }[]>('textDocument/formatting', {
      textDocument: { uri },
      options: { tabSize: 2, insertSpaces: true },
    });
    const formatted = applyLspEdits(messy, edits);
    expect(formatted).toBe(
      `plant p {\n  states x,v\n  inputs u\n  outputs x\n  A = [0,    1;\n       0, -2.5]\n  B = [0; 1]\n  C=[1, 0]\n}\n\ncontroller c for p {\n  poles = [-1, -2]\n}\n`,
    );
    expect(formatted).toBe(formatText(messy));
    const version = await session.change(uri, [{ text: formatted }]);
    await session.waitForDiagnostics((p) => p.uri === uri && p.version === version);
    const again = await session.request<unknown[]>('textDocument/formatting', { textDocument: { uri }, options: { tabSize: 2, insertSpaces: true } });
    expect(again).toEqual([]);
  });

  it('completes design statements and the plant outputs after track', async () => {
    const statement = withCursor(HOIST.replace('  track height\n', '  |\n  track height\n'));
    const uri = await openAnalysed(statement.text);
    const items = await session.request<{ label: string }[]>('textDocument/completion', { textDocument: { uri }, position: statement.position });
    const labels = items.map((item) => item.label);
    expect(labels).toEqual(expect.arrayContaining(['poles', 'lqr', 'track', 'integral', 'observer', 'sample']));
    expect(labels).not.toContain('param');

    const afterTrack = withCursor(HOIST.replace('track height', 'track |'));
    const uri2 = await openAnalysed(afterTrack.text);
    const outputs = await session.request<{ label: string }[]>('textDocument/completion', { textDocument: { uri: uri2 }, position: afterTrack.position });
    expect(outputs.map((item) => item.label)).toEqual(['height']);
  });

  it('gives an outline of plants and controllers', async () => {
    const uri = await openAnalysed(HOIST);
    const symbols = await session.request<{ name: string; kind: number; children: { name: string }[] }[]>('textDocument/documentSymbol', {
      textDocument: { uri },
    });
    expect(symbols.map((s) => s.name)).toEqual(['hoist', 'lift']);
    expect(symbols[0].children.map((c) => c.name)).toEqual(['J', 'b', 'kt', 'r', 'theta', 'omega', 'current', 'height', 'A', 'B', 'C']);
    expect(symbols[1].children.map((c) => c.name)).toEqual(['poles', 'track', 'step']);
  });

  it('finds the definition and the references of a param', async () => {
    const { text, position } = withCursor(HOIST.replace('-b/J', '-b/|J'));
    const uri = await openAnalysed(text);
    const definition = await session.request<{ range: { start: { line: number; character: number } } }>('textDocument/definition', {
      textDocument: { uri },
      position,
    });
    expect(definition.range.start).toEqual({ line: 2, character: 8 });
    const references = await session.request<unknown[]>('textDocument/references', {
      textDocument: { uri },
      position,
      context: { includeDeclaration: true },
    });
    expect(references).toHaveLength(3); // declaration, A, B
  });

  it('answers the client protocol: controllers, controller data, export, report', async () => {
    const uri = await openAnalysed(HOIST);
    const list = await session.request<{ controllers: { name: string; plant: string; designed: boolean; line: number }[] }>('loopwright/controllers', { uri });
    const analysis = analyze(HOIST);
    const designed = analysis.controllers[0].designed;
    expect(list.controllers).toEqual([{ name: 'lift', plant: 'hoist', designed, line: 17 }]);
    const data = await session.request<{ report: { name: string; K: unknown } | null; plant: { name: string } | null; version: number }>(
      'loopwright/controllerData',
      { uri, controller: 'lift' },
    );
    expect(data.version).toBe(1);
    expect(data.report?.name).toBe('lift');
    expect(data.report?.K).toEqual(analysis.controllers[0].K);
    expect(data.plant?.name).toBe('hoist');
    const missing = await session.request<{ report: unknown }>('loopwright/controllerData', { uri, controller: 'nope' });
    expect(missing.report).toBeNull();
    const exported = await session.request<{ text: string | null; reason?: string }>('loopwright/export', { uri, controller: 'lift', format: 'text' });
    if (designed) expect(exported.text).toMatch(/^K = \[/m);
    else expect(exported).toMatchObject({ text: null, reason: expect.stringContaining('no valid design') });
    const report = await session.request<{ html: string }>('loopwright/report', { uri });
    expect(report.html).toMatch(/^<!doctype html>/i);
    expect(report.html).toContain('hoist');
  });

  it('a large LQR design starts each version from the last one\'s Riccati solution; the editor leaves the condition estimate out', async () => {
    const text = heatedRodModel(WARM_START_FROM_STATES, '0.5');
    const uri = await openAnalysed(text);
    const edited = text.replace('k = 0.5', 'k = 0.5001');
    const version = await session.change(uri, [{ range: { start: { line: 1, character: 12 }, end: { line: 1, character: 15 } }, text: '0.5001' }]);
    await session.waitForAnalysis(uri, version);
    const data = await session.request<{ report: { details: { lqr: { warmStarted: boolean; conditionEstimate: number | null } } } }>('loopwright/controllerData', {
      uri,
      controller: 'warm',
    });
    expect(data.report.details.lqr.warmStarted).toBe(true);
    expect(data.report.details.lqr.conditionEstimate).toBeNull(); // NaN in the record, null on the wire
    const published = session.lastDiagnostics(uri)!;
    expect(published.version).toBe(version);
    // The same verdicts as a fresh analysis: messages, ranges and codes equal; numbers carried in
    // `data` agree to the solver's accuracy (the warm route is not bit for bit the fresh one).
    const visible = (list: { code?: unknown; message: string; range: unknown; severity?: unknown }[]) =>
      list.map(({ code, message, range, severity }) => ({ code, message, range, severity }));
    const fresh = expectedDiagnostics(edited, uri) as { code?: unknown; message: string; range: unknown; severity?: unknown; data?: Record<string, unknown> }[];
    expect(visible(published.diagnostics as typeof fresh)).toEqual(visible(fresh));
    published.diagnostics.forEach((diagnostic, index) => {
      const data = (diagnostic as { data?: Record<string, unknown> }).data ?? {};
      const expected = fresh[index].data ?? {};
      expect(Object.keys(data)).toEqual(Object.keys(expected));
      for (const [key, value] of Object.entries(expected)) {
        if (typeof value === 'number') expect(Math.abs((data[key] as number) - value)).toBeLessThanOrEqual(1e-9 * Math.max(1, Math.abs(value)));
        else expect(data[key]).toEqual(value);
      }
    });
  });

  it('never answers with an error for requests on unknown documents', async () => {
    const uri = 'file:///protocol/not-open.plant';
    expect(await session.request('textDocument/hover', { textDocument: { uri }, position: { line: 0, character: 0 } })).toBeNull();
    expect(await session.request('textDocument/codeLens', { textDocument: { uri } })).toEqual([]);
    expect(await session.request('textDocument/semanticTokens/full', { textDocument: { uri } })).toEqual({ data: [] });
  });
});
