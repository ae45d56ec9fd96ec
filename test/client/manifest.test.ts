// The extension manifest (package.json `contributes`) agrees with the client's command list,
// the server's settings reader, and the files the package ships.
import { existsSync, readFileSync } from 'node:fs';
import { join } from 'node:path';
import { describe, expect, it } from 'vitest';
import { Commands } from '../../client/src/protocol';
import { defaultSettings } from '../../server/src/control/settings';
import { defaultLensSettings } from '../../server/src/ide/lensSettings';
import { DEFAULT_DEBOUNCE_MS } from '../../server/src/lsp/settings';

const root = join(__dirname, '..', '..');
const manifest = JSON.parse(readFileSync(join(root, 'package.json'), 'utf8'));
const contributes = manifest.contributes;

describe('extension manifest', () => {
  it('contributes exactly the commands the client registers, each with a title', () => {
    const contributed = contributes.commands.map((c: { command: string }) => c.command).sort();
    expect(contributed).toEqual(Object.values(Commands).sort());
    for (const command of contributes.commands) {
      expect(command.category).toBe('Loopwright');
      expect(command.title.length).toBeGreaterThan(3);
    }
  });

  it('activates on the plant language only and declares untrusted and virtual workspace support', () => {
    expect(manifest.activationEvents).toEqual(['onLanguage:plant']);
    expect(manifest.capabilities.untrustedWorkspaces.supported).toBe(true);
    expect(manifest.capabilities.virtualWorkspaces).toBe(true);
    expect(manifest.main).toBe('./dist/client.cjs');
  });

  it('offers every analysis setting with the default the engine uses', () => {
    const properties: Record<string, { default: unknown; markdownDescription?: string; description?: string }> =
      contributes.configuration.properties;
    for (const [key, property] of Object.entries(properties)) {
      expect(property.markdownDescription ?? property.description, key).toBeTruthy();
      const name = key.replace(/^loopwright\./, '');
      if (name === 'debounceMs') expect(property.default).toBe(DEFAULT_DEBOUNCE_MS);
      else if (name.startsWith('lenses.')) {
        const lens = name.slice('lenses.'.length);
        expect(Object.keys(defaultLensSettings), `server lens setting for ${key}`).toContain(lens);
        expect(property.default).toBe(defaultLensSettings[lens as keyof typeof defaultLensSettings]);
      } else {
        expect(Object.keys(defaultSettings), `engine setting for ${key}`).toContain(name);
        expect(property.default).toBe(defaultSettings[name as keyof typeof defaultSettings]);
      }
    }
  });

  it('lets every code lens the server draws be switched off from the editor settings', () => {
    for (const lens of Object.keys(defaultLensSettings)) {
      expect(Object.keys(contributes.configuration.properties), `setting for the ${lens} lens`).toContain(`loopwright.lenses.${lens}`);
    }
  });

  it('points at files that exist and are packaged', () => {
    const packaged = readFileSync(join(root, '.vscodeignore'), 'utf8')
      .split('\n')
      .filter((line) => line.startsWith('!'))
      .map((line) => line.slice(1));
    const referenced = [
      manifest.icon,
      ...contributes.languages.map((l: { configuration: string }) => l.configuration),
      ...contributes.grammars.map((g: { path: string }) => g.path),
      ...contributes.snippets.map((s: { path: string }) => s.path),
    ].map((path: string) => path.replace(/^\.\//, ''));
    for (const path of referenced) {
      expect(existsSync(join(root, path)), path).toBe(true);
      expect(packaged, path).toContain(path);
    }
    expect(packaged).toContain(manifest.main.replace(/^\.\//, ''));
  });

  it('ships snippets for plant and controller blocks', () => {
    const snippets = JSON.parse(readFileSync(join(root, 'client', 'snippets', 'plant.json'), 'utf8'));
    const bodies = Object.values(snippets).map((s) => (s as { body: string[] }).body.join('\n'));
    expect(bodies.some((body) => body.startsWith('plant '))).toBe(true);
    expect(bodies.some((body) => body.startsWith('controller '))).toBe(true);
  });
});
