// Security checks: no code built from text at run time, no network modules in the analysis code,
// strict Content-Security-Policies (nonce, no 'unsafe-inline' scripts) on both HTML faces, and
// exports written only where -o says.
import { describe, expect, it } from 'vitest';
import { mkdtempSync, readFileSync, readdirSync, statSync, existsSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join, relative } from 'node:path';
import { spawnSync } from 'node:child_process';
import { panelHtml } from '../../client/src/panel/panelHtml';

const root = join(__dirname, '..', '..');

function sources(folder: string): string[] {
  const out: string[] = [];
  for (const entry of readdirSync(folder)) {
    const path = join(folder, entry);
    if (statSync(path).isDirectory()) out.push(...sources(path));
    else if (/\.(ts|mts|cts|js|mjs|cjs)$/.test(entry)) out.push(path);
  }
  return out;
}

/** Source text with comments and string contents blanked (string delimiters kept), so prose cannot match. */
function code(text: string): string {
  return text
    .replace(/\/\*[\s\S]*?\*\//g, ' ')
    .replace(/(^|[^:\\])\/\/[^\n]*/g, '$1')
    .replace(/`(?:[^`\\]|\\.)*`/g, '``');
}

function findings(folders: string[], pattern: RegExp, allow: (match: RegExpMatchArray) => boolean = () => false): string[] {
  const found: string[] = [];
  for (const folder of folders) {
    for (const file of sources(join(root, folder))) {
      const text = code(readFileSync(file, 'utf8'));
      for (const match of text.matchAll(new RegExp(pattern.source, pattern.flags.includes('g') ? pattern.flags : `${pattern.flags}g`))) {
        if (!allow(match)) found.push(`${relative(root, file)}: ${match[0]}`);
      }
    }
  }
  return found;
}

function cspOf(html: string): Map<string, string[]> {
  const content = /<meta http-equiv="Content-Security-Policy" content="([^"]*)"/.exec(html)?.[1];
  expect(content, 'a Content-Security-Policy meta tag').toBeDefined();
  return new Map(
    content!
      .split(';')
      .map((directive) => directive.trim().split(/\s+/))
      .filter((parts) => parts[0])
      .map((parts) => [parts[0], parts.slice(1)]),
  );
}

function expectStrictScripts(html: string): void {
  const policy = cspOf(html);
  expect(policy.get('default-src')).toEqual(["'none'"]);
  const scripts = policy.get('script-src') ?? [];
  const nonce = scripts.find((source) => source.startsWith("'nonce-"));
  expect(nonce).toBeDefined();
  expect(nonce!.length).toBeGreaterThan("'nonce-'".length + 15);
  expect(scripts).not.toContain("'unsafe-inline'");
  expect(scripts).not.toContain("'unsafe-eval'");
  // Every script element carries the nonce; no inline event handlers or javascript: URLs.
  const value = nonce!.slice("'nonce-".length, -1);
  // Data blocks (type="application/json") are not executed and need no nonce.
  const tags = [...html.matchAll(/<script\b[^>]*>/g)].map((m) => m[0]).filter((tag) => !/type="application\/json"/.test(tag));
  expect(tags.length).toBeGreaterThan(0);
  for (const tag of tags) expect(tag).toContain(`nonce="${value}"`);
  const markup = html.replace(/"[^"]*"/g, '""'); // attribute values are text (quotes are escaped in them)
  expect(markup).not.toMatch(/<[a-z][^>]*\son[a-z]+\s*=/i);
  expect(markup).not.toMatch(/javascript:/i);
}

describe('security', () => {
  const allCode = ['server/src', 'grammar/src', 'client/src'];

  it('no eval, no Function constructor, in server, grammar and client sources', () => {
    expect(findings(allCode, /\beval\s*\(/)).toEqual([]);
    expect(findings(allCode, /\bnew\s+Function\b/)).toEqual([]);
    expect(findings(allCode, /(?<![\w.$])Function\s*\(/)).toEqual([]);
  });

  it('dynamic import() only of fixed string literals', () => {
    const dynamic = findings(allCode, /\bimport\s*\(\s*([^)]*)\)/, (match) => /^'[^']*'$|^"[^"]*"$/.test(match[1].trim()));
    expect(dynamic).toEqual([]);
    // The scan does see the CLI's fixed import of the language server.
    expect(findings(['server/src/cli'], /\bimport\s*\(\s*([^)]*)\)/)).toEqual([expect.stringContaining("import('../lsp/main')")]);
  });

  it('no network modules or network calls in the server and grammar code', () => {
    const analysisCode = ['server/src', 'grammar/src'];
    const modules = /(?:from\s*|require\s*\(\s*|import\s*\(\s*)['"](?:node:)?(?:net|http|https|http2|dgram|tls|dns)['"]/;
    expect(findings(analysisCode, modules)).toEqual([]);
    expect(findings(analysisCode, /\bfetch\s*\(/)).toEqual([]);
    expect(findings(analysisCode, /\bWebSocket\b/)).toEqual([]);
    expect(findings(analysisCode, /\bXMLHttpRequest\b/)).toEqual([]);
  });

  it('the response panel: nonce-only scripts, nothing by default, the title escaped', () => {
    const html = panelHtml({ cspSource: 'vscode-webview://abc', scriptUri: 'webview.js', styleUri: 'webview.css', nonce: 'q1w2e3r4t5y6u7i8o9p0', title: '<img src=x onerror=alert(1)>' });
    expectStrictScripts(html);
    expect(html).not.toContain('<img src=x');
  });

  it('the HTML report written by the CLI: nonce-only scripts, one self-contained file', () => {
    const folder = mkdtempSync(join(tmpdir(), 'loopwright-security-'));
    const out = join(folder, 'report.html');
    const result = spawnSync(process.execPath, [join(root, 'bin', 'loopwright.cjs'), 'report', join(root, 'samples', 'hoist.plant'), '-o', out], { cwd: folder, encoding: 'utf8' });
    expect(result.status).toBe(0);
    const html = readFileSync(out, 'utf8');
    expectStrictScripts(html);
    expect(html).not.toMatch(/<script[^>]*\ssrc=/);
    expect(html).not.toMatch(/<link[^>]*href="https?:/);
  });

  it('export and report write nothing without -o, and only the named file with it', () => {
    const folder = mkdtempSync(join(tmpdir(), 'loopwright-cwd-'));
    const run = (...args: string[]) => spawnSync(process.execPath, [join(root, 'bin', 'loopwright.cjs'), ...args], { cwd: folder, encoding: 'utf8' });
    const hoist = join(root, 'samples', 'hoist.plant');
    const toStdout = run('export', '--format', 'c', hoist);
    expect(toStdout.status).toBe(0);
    expect(toStdout.stdout).toContain('#');
    expect(run('export', '--format', 'json', hoist).status).toBe(0);
    expect(run('report', hoist).status).not.toBe(0);
    expect(run('check', '--json', hoist).status).not.toBeNull();
    expect(readdirSync(folder)).toEqual([]);
    expect(run('export', '--format', 'json', hoist, '-o', 'gains.json').status).toBe(0);
    expect(readdirSync(folder)).toEqual(['gains.json']);
    expect(existsSync(join(root, 'gains.json'))).toBe(false);
  });
});
