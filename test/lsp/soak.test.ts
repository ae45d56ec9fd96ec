// Random edits through the protocol: the server never crashes, every request is answered, and
// the last diagnostics equal a fresh analysis of the final text.
import { existsSync, readdirSync, readFileSync } from 'node:fs';
import { join } from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { analyze } from '../../server/src/analyze';
import { toLspDiagnostic } from '../../server/src/lsp/convert';
import { ensureBuilt, LspSession, root } from './lspClient';
import { soak } from './soak';

const INLINE = `plant rig {
  param m = 0.2
  states z, w
  inputs i
  outputs z
  z' = w
  w' = 9.81 - 0.5*i^2/(m*z^2)
  output z = z
  around z = 0.01, w = 0, i = 0.35
}

controller hold for rig {
  poles = [-20, -30]
  track z
}
`;

const sampleDirectory = join(root, 'samples');
const samples = existsSync(sampleDirectory)
  ? readdirSync(sampleDirectory)
      .filter((name) => name.endsWith('.plant'))
      .sort()
      .map((name) => ({ name, text: readFileSync(join(sampleDirectory, name), 'utf8') }))
  : [];
const models = samples.length > 0 ? samples : [{ name: 'inline', text: INLINE }];
const TOTAL_EDITS = 1000;

let session: LspSession;
let earlySession: LspSession;

beforeAll(async () => {
  ensureBuilt();
  session = await LspSession.start({ settings: { debounceMs: 10 } });
  // No debounce, and every document's slow job started before its fast check (the path large
  // models take; LOOPWRIGHT_EARLY_SLOW_MS=0 makes every sample take it).
  earlySession = await LspSession.start({ settings: { debounceMs: 0 }, env: { LOOPWRIGHT_EARLY_SLOW_MS: '0' } });
});

afterAll(async () => {
  await session?.stop();
  await earlySession?.stop();
});

const runs = [
  ...models.map((model, index) => [`${model.name}, debounce 10 ms`, index, false] as const),
  ...models.map((model, index) => [`${model.name}, no debounce, slow job first`, index, true] as const),
];

describe('random-edit soak', () => {
  it.each(runs)(
    'survives random edits of %s and ends with the diagnostics of a fresh analysis',
    async (_label, index, early) => {
      const model = models[index];
      const current = early ? earlySession : session;
      const uri = `file:///soak/${early ? 'early-' : ''}${model.name}`;
      await current.open(uri, model.text);
      const edits = Math.ceil((early ? TOTAL_EDITS / 4 : TOTAL_EDITS) / models.length);
      const outcome = await soak(current, uri, model.text, edits, (early ? 2000 : 1000) + index);
      expect(outcome.requestFailures).toEqual([]);
      await current.waitForAnalysis(uri, outcome.finalVersion);
      expect(current.exitCode).toBeNull();
      const published = current.lastDiagnostics(uri)!;
      expect(published.version).toBe(outcome.finalVersion);
      const expected = analyze(outcome.finalText).diagnostics.map((d) => toLspDiagnostic(d, uri));
      expect(published.diagnostics).toEqual(JSON.parse(JSON.stringify(expected)));
      expect(current.stderr.filter((line) => /failed/.test(line))).toEqual([]);
      if (early) expect(current.analysed.some((entry) => entry.uri === uri)).toBe(true);
      // Never a stale publication: versions only grow.
      const versions = current.published.filter((p) => p.uri === uri).map((p) => p.version ?? 0);
      expect(versions.every((version, i) => i === 0 || version >= versions[i - 1])).toBe(true);
    },
  );
});
