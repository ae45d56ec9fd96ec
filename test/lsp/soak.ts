// Random-edit soak: seeded character insertions and deletions replayed through the protocol,
// with requests in between. Shared by the CI test (1,000 edits) and test/bench (10,000).
import type { Position } from '../../grammar/src/ast';
import type { LspSession } from './lspClient';

/** Mulberry32: a small seeded generator (public-domain algorithm), enough for test inputs. */
export function seededRandom(seed: number): () => number {
  let state = seed >>> 0;
  return () => {
    state = (state + 0x6d2b79f5) >>> 0;
    let t = state;
    t = Math.imul(t ^ (t >>> 15), t | 1);
    t ^= t + Math.imul(t ^ (t >>> 7), t | 61);
    return ((t ^ (t >>> 14)) >>> 0) / 4294967296;
  };
}

const ALPHABET = "abxyzJKQR0123456789.,;=+-*/^'()[]{}#jis \n";

export function positionOf(text: string, offset: number): Position {
  const before = text.slice(0, offset).split('\n');
  return { line: before.length - 1, character: before[before.length - 1].length };
}

export interface SoakOutcome {
  finalText: string;
  finalVersion: number;
  requestFailures: string[];
}

/** Replays `edits` random edits on `text` in document `uri` (already open at its current version). */
export async function soak(session: LspSession, uri: string, text: string, edits: number, seed: number): Promise<SoakOutcome> {
  const random = seededRandom(seed);
  let current = text;
  let version = session.version(uri);
  const requestFailures: string[] = [];
  for (let i = 0; i < edits; i++) {
    const offset = Math.floor(random() * (current.length + 1));
    let change: { range: { start: Position; end: Position }; text: string };
    if (random() < 0.55 || current.length === 0) {
      const character = ALPHABET[Math.floor(random() * ALPHABET.length)];
      const at = positionOf(current, offset);
      change = { range: { start: at, end: at }, text: character };
      current = current.slice(0, offset) + character + current.slice(offset);
    } else {
      const end = Math.min(current.length, offset + 1 + Math.floor(random() * 3));
      change = { range: { start: positionOf(current, offset), end: positionOf(current, end) }, text: '' };
      current = current.slice(0, offset) + current.slice(end);
    }
    version = await session.change(uri, [change]);
    if (i % 25 === 24) {
      const position = positionOf(current, Math.floor(random() * (current.length + 1)));
      const requests: [string, unknown][] = [
        ['textDocument/hover', { textDocument: { uri }, position }],
        ['textDocument/completion', { textDocument: { uri }, position }],
        ['textDocument/codeLens', { textDocument: { uri } }],
        ['textDocument/semanticTokens/full', { textDocument: { uri } }],
        ['textDocument/documentSymbol', { textDocument: { uri } }],
        ['textDocument/formatting', { textDocument: { uri }, options: { tabSize: 2, insertSpaces: true } }],
        ['textDocument/foldingRange', { textDocument: { uri } }],
        ['textDocument/inlayHint', { textDocument: { uri }, range: { start: { line: 0, character: 0 }, end: positionOf(current, current.length) } }],
        ['textDocument/signatureHelp', { textDocument: { uri }, position }],
        ['textDocument/codeAction', { textDocument: { uri }, range: { start: position, end: position }, context: { diagnostics: [] } }],
      ];
      await Promise.all(
        requests.map(([method, params]) =>
          session.request(method, params).catch((error: Error) => requestFailures.push(`${method}: ${error.message}`)),
        ),
      );
    }
    // Wait until the server has taken the edit (its fast diagnostics), as an editor's typing would.
    const expected = version;
    await session.waitForDiagnostics((p) => p.uri === uri && p.version === expected);
  }
  return { finalText: current, finalVersion: version, requestFailures };
}
