// docs/diagnostics.md is generated from the registries; this test regenerates it in memory and
// fails when the checked-in file differs (UPDATE_FIXTURES=1 rewrites it), and checks that the
// registries and the quick-fix list are complete against the source.
import { readdirSync, readFileSync, writeFileSync } from 'node:fs';
import { join, resolve } from 'node:path';
import { describe, expect, it } from 'vitest';
import { syntaxDiagnosticCodes } from '../../grammar/src/diagnosticCodes';
import { controlDiagnosticKinds } from '../../server/src/control/diagnostics';
import { modelDiagnosticKinds } from '../../server/src/model/diagnostics';
import { fixesByCode, quickFixes, renderDiagnosticsDocument, supersededFixNames } from './diagnosticsDocument';

const root = resolve(__dirname, '../..');
const documentPath = join(root, 'docs/diagnostics.md');

function sourceFiles(directory: string): string[] {
  const out: string[] = [];
  for (const entry of readdirSync(directory, { withFileTypes: true })) {
    const path = join(directory, entry.name);
    if (entry.isDirectory()) out.push(...sourceFiles(path));
    else if (entry.name.endsWith('.ts')) out.push(path);
  }
  return out;
}

describe('docs/diagnostics.md', () => {
  it('matches the document generated from the registries', () => {
    const generated = renderDiagnosticsDocument();
    if (process.env.UPDATE_FIXTURES) writeFileSync(documentPath, generated);
    const checkedIn = readFileSync(documentPath, 'utf8');
    expect(checkedIn, 'docs/diagnostics.md is stale: regenerate with UPDATE_FIXTURES=1 npx vitest run test/docs').toBe(generated);
  });

  it('lists every control code written in server/src/control (kind files and ad-hoc codes)', () => {
    const defined: string[] = [];
    for (const file of sourceFiles(join(root, 'server/src/control'))) {
      const text = readFileSync(file, 'utf8');
      for (const match of text.matchAll(/code:\s*'(control\/[a-z0-9-]+)'/g)) defined.push(match[1]);
    }
    const registered = new Set(controlDiagnosticKinds.map((kind) => kind.code));
    expect(defined.filter((code) => !registered.has(code))).toEqual([]);
    expect(defined.length).toBeGreaterThan(0);
  });

  it('lists every model kind defined in server/src/model/diagnostics', () => {
    const folder = join(root, 'server/src/model/diagnostics');
    const defined: string[] = [];
    for (const file of readdirSync(folder)) {
      if (!file.endsWith('.ts') || file === 'index.ts') continue;
      const text = readFileSync(join(folder, file), 'utf8');
      for (const match of text.matchAll(/code:\s*'(model\/[a-z0-9-]+)'/g)) defined.push(match[1]);
    }
    const registered = new Set(modelDiagnosticKinds.map((kind) => kind.code));
    expect(defined.filter((code) => !registered.has(code))).toEqual([]);
  });

  it('lists every syntax code the parser reports', () => {
    const used = new Set<string>();
    for (const file of sourceFiles(join(root, 'grammar/src'))) {
      if (file.endsWith('diagnosticCodes.ts')) continue;
      for (const match of readFileSync(file, 'utf8').matchAll(/'(syntax\/[a-z0-9-]+)'/g)) used.add(match[1]);
    }
    const listed = new Set(syntaxDiagnosticCodes.map((entry) => entry.code));
    expect([...used].filter((code) => !listed.has(code))).toEqual([]);
    // And no listed code that the parser never reports.
    expect([...listed].filter((code) => !used.has(code))).toEqual([]);
  });

  it('has unique codes across the three registries', () => {
    const codes = [...syntaxDiagnosticCodes, ...modelDiagnosticKinds, ...controlDiagnosticKinds].map((kind) => kind.code);
    expect(codes.length).toBe(new Set(codes).size);
  });

  it('documents every quick fix the source attaches, and each has an editor builder', () => {
    const written = new Set<string>();
    for (const file of sourceFiles(join(root, 'server/src'))) {
      if (file.includes(`${join('server', 'src', 'ide')}`)) continue;
      for (const match of readFileSync(file, 'utf8').matchAll(/fix:\s*'([a-z0-9-]+)'/g)) written.add(match[1]);
    }
    const documented = new Set(Object.keys(quickFixes));
    const undocumented = [...written].filter((name) => !documented.has(name) && !(name in supersededFixNames));
    expect(undocumented, 'fix names written in server/src but missing from test/docs/diagnosticsDocument.ts').toEqual([]);
    expect([...documented].filter((name) => !written.has(name)), 'documented fixes no diagnostic attaches').toEqual([]);

    const builders = readFileSync(join(root, 'server/src/ide/codeActions.ts'), 'utf8');
    for (const name of documented) expect(builders.includes(`'${name}':`) || builders.includes(`\n  ${name}:`), `builder for ${name}`).toBe(true);

    const allCodes = new Set([...modelDiagnosticKinds, ...controlDiagnosticKinds].map((kind) => kind.code));
    for (const [code, fixes] of Object.entries(fixesByCode)) {
      expect(allCodes.has(code), code).toBe(true);
      for (const fix of fixes) expect(documented.has(fix), fix).toBe(true);
    }
  });
});

describe('codes quoted in the other documents', () => {
  it('exist in the registries (docs/engine.md, docs/json-output.md)', () => {
    const known = new Set([...syntaxDiagnosticCodes, ...modelDiagnosticKinds, ...controlDiagnosticKinds].map((kind) => kind.code));
    for (const name of ['docs/engine.md', 'docs/json-output.md']) {
      const text = readFileSync(join(root, name), 'utf8');
      const quoted = [...text.matchAll(/`((?:syntax|model|control)\/[a-z0-9-]+)`/g)].map((match) => match[1]);
      expect(quoted.length, name).toBeGreaterThan(0);
      expect(quoted.filter((code) => !known.has(code)), name).toEqual([]);
    }
  });
});
