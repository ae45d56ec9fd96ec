// `loopwright report` writes one self-contained HTML file that renders in headless chromium with
// its plots: no request leaves the page, the plot script runs under the page's nonce policy, and
// the step-response canvases and the pole map are drawn.
import { spawnSync } from 'node:child_process';
import { mkdirSync, mkdtempSync, readFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { pathToFileURL } from 'node:url';
import { chromium } from 'playwright-core';
import { describe, expect, it } from 'vitest';
import { repoRoot, resultsDir } from './harness';

const chromiumFlags = [
  '--headless', '--no-sandbox', '--disable-gpu', '--disable-quic', '--no-first-run',
  '--disable-background-networking', '--disable-component-update', '--disable-sync',
];

describe('design report', () => {
  it('renders the maglev report with its plots in headless chromium', async () => {
    const dir = mkdtempSync(join(tmpdir(), 'loopwright-report-'));
    const out = join(dir, 'report.html');
    const run = spawnSync(process.execPath, [join(repoRoot, 'bin', 'loopwright.cjs'), 'report', 'samples/maglev-rig.plant', '-o', out], { cwd: repoRoot, encoding: 'utf8' });
    expect(run.status, run.stderr).toBe(0);
    const html = readFileSync(out, 'utf8');
    // Self-contained: no external scripts, styles or images.
    expect(html).not.toMatch(/<(script|link|img)[^>]+(src|href)=/i);
    expect(html).toContain('Results hold for the linear model only');

    const browser = await chromium.launch({ executablePath: '/usr/bin/chromium', args: chromiumFlags });
    try {
      const page = await browser.newPage({ viewport: { width: 1200, height: 900 } });
      const requests: string[] = [];
      const violations: string[] = [];
      page.on('request', (request) => { if (!request.url().startsWith('file:')) requests.push(request.url()); });
      page.on('console', (message) => { if (/Content Security Policy|Refused/.test(message.text())) violations.push(message.text()); });
      page.on('pageerror', (error) => violations.push(error.message));
      await page.goto(pathToFileURL(out).href);
      await page.waitForSelector('body[data-plots-rendered="1"]');
      await page.locator('.lw-plot-outputs canvas').first().waitFor();
      await page.locator('svg.lw-pole-map').first().waitFor();
      expect(await page.locator('.lw-plot canvas').count()).toBeGreaterThan(0);
      expect(requests).toEqual([]);
      expect(violations).toEqual([]);
      mkdirSync(resultsDir, { recursive: true });
      await page.screenshot({ path: join(resultsDir, 'design-report.png'), fullPage: true });
    } finally {
      await browser.close();
    }
  });
});
