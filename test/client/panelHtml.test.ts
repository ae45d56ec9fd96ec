import { describe, expect, it } from 'vitest';
import { panelHtml } from '../../client/src/panel/panelHtml';

const page = {
  cspSource: 'https://file+.vscode-resource.example',
  scriptUri: 'https://file+.vscode-resource.example/dist/webview.js',
  styleUri: 'https://file+.vscode-resource.example/dist/webview.css',
  nonce: 'bm9uY2UtdmFsdWU=',
  title: 'Response: <lift> & "hoist"',
};

function policyOf(html: string): Map<string, string[]> {
  const content = html.match(/http-equiv="Content-Security-Policy" content="([^"]*)"/)![1];
  return new Map(
    content.split(';').map((directive) => {
      const [name, ...sources] = directive.trim().split(/\s+/);
      return [name, sources] as [string, string[]];
    }),
  );
}

describe('response panel page', () => {
  const html = panelHtml(page);
  const policy = policyOf(html);

  it('allows nothing by default and scripts only with the nonce', () => {
    expect(policy.get('default-src')).toEqual(["'none'"]);
    expect(policy.get('script-src')).toEqual([`'nonce-${page.nonce}'`]);
    expect(policy.get('style-src')).not.toContain("'unsafe-inline'");
    expect(html).not.toMatch(/unsafe-eval|unsafe-inline/);
  });

  it('loads its one script from the extension with the nonce and has no inline script', () => {
    const scripts = [...html.matchAll(/<script([^>]*)>([\s\S]*?)<\/script>/g)];
    expect(scripts).toHaveLength(1);
    expect(scripts[0][1]).toContain(`nonce="${page.nonce}"`);
    expect(scripts[0][1]).toContain(`src="${page.scriptUri}"`);
    expect(scripts[0][2].trim()).toBe('');
  });

  it('escapes the controller name in the title', () => {
    expect(html).not.toContain('<lift>');
    expect(html).toContain('Response: &#60;lift&#62; &#38; &#34;hoist&#34;');
  });
});
