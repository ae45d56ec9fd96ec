// The extension in a real editor: language mode and highlighting, diagnostics (problems view and
// squiggles), hover, code lens, the integral-action quick fix, and the response panel.
// Expected numbers are worked out by hand in the comments beside each check.
import { readFileSync } from 'node:fs';
import { join } from 'node:path';
import { afterAll, afterEach, beforeAll, describe, expect, it } from 'vitest';
import { repoRoot, resultsDir, startEditor, type Editor } from './harness';

// The hoist sample with the torque constant misspelt in B: an unknown name the server must flag.
const hoistText = readFileSync(join(repoRoot, 'samples', 'hoist.plant'), 'utf8');
const faultyHoist = hoistText.replace('B = [0; kt/J]', 'B = [0; kq/J]');
// The hoist with a second, faster controller after the first: the panel follows the cursor.
const twoControllers = `${hoistText}\ncontroller lift_fast for hoist {\n  poles = [-8 + 6j, -8 - 6j]\n  track height\n}\n`;
const fastControllerLine = twoControllers.split('\n').findIndex((line) => line.startsWith('controller lift_fast')) + 1;

// Digits of a number as the editor shows it: the minus may be ASCII or U+2212.
const minus = '[-−]';

describe('Loopwright in a real editor', () => {
  let editor: Editor;

  beforeAll(async () => {
    expect(faultyHoist).not.toBe(hoistText); // the sample still has the line this scenario edits
    editor = await startEditor({ files: { 'faulty-hoist.plant': faultyHoist, 'two-controllers.plant': twoControllers } });
  });

  afterEach(async (context) => {
    // Keep a picture of the editor at the moment a check failed (CI artefact).
    if (editor && context.task.result?.state === 'fail') {
      await editor.screenshot(`failed-${context.task.name.replace(/[^a-z0-9]+/gi, '-').slice(0, 60)}`).catch(() => undefined);
    }
  });

  afterAll(async () => {
    await editor?.stop();
  });

  it('opens a .plant file in the plant language, with keywords highlighted', async () => {
    await editor.openFile('hoist.plant');
    await expect
      .poll(() => editor.page.locator('[id="status.editor.mode"]').innerText(), { timeout: 60_000 })
      .toContain('Plant model');
    // The grammar colours `plant` (keyword) differently from `hoist` (a name): different token classes.
    const line = editor.line('plant hoist {');
    await line.waitFor();
    const classOf = (text: string) =>
      line.locator('span > span', { hasText: new RegExp(`^\\s*${text}\\s*$`) }).first().getAttribute('class');
    const keywordClass = await classOf('plant');
    const nameClass = await classOf('hoist');
    expect(keywordClass).toMatch(/mtk\d+/);
    expect(keywordClass).not.toBe(nameClass);
    await editor.screenshot('highlighting');
  });

  it('lists a misspelt name in the problems view and underlines it', async () => {
    await editor.openFile('faulty-hoist.plant');
    const page = editor.page;
    await page.locator('.editor-instance .squiggly-error').first().waitFor({ timeout: 60_000 });
    await page.keyboard.press('Control+Shift+M');
    const row = page.locator('.markers-panel .monaco-list-row', { hasText: 'kq' }).first();
    await row.waitFor({ timeout: 60_000 });
    expect(await row.innerText()).toMatch(/kq/);
    await editor.screenshot('problems');
  });

  it('shows the eigenvalues of a plant when hovering its name', async () => {
    await editor.openFile('hoist.plant');
    const page = editor.page;
    const name = editor.line('plant hoist {').locator('span > span', { hasText: /^hoist$/ }).first();
    const hover = page.locator('.monaco-hover:not(.hidden)', { hasText: /eigenvalue/i }).first();
    // Hovering twice (move away in between) guards against the first hover arriving before the server was ready.
    await expect
      .poll(
        async () => {
          await page.mouse.move(0, 0);
          await name.hover();
          return hover.waitFor({ timeout: 5000 }).then(
            () => true,
            () => false,
          );
        },
        { timeout: 60_000, interval: 500 },
      )
      .toBe(true);
    const text = await hover.innerText();
    // A = [0, 1; 0, −b/J] is upper triangular: eigenvalues 0 and −b/J = −0.004/0.012 = −1/3 (by hand).
    expect(text).toMatch(new RegExp(`${minus}0\\.333`));
    expect(text).toMatch(/(^|[^\d.])0([^\d.]|$)/m);
    await editor.screenshot('hover');
  });

  it('shows the feedback gains in a code lens above the controller', async () => {
    await editor.openFile('hoist.plant');
    const lens = editor.page.locator('.editor-instance .codelens-decoration', { hasText: /K\s*=/ }).first();
    await lens.waitFor({ timeout: 60_000 });
    const text = await lens.innerText();
    // Closed loop of the hoist with u = −[k1 k2]x: s² + (b/J + (kt/J)·k2)s + (kt/J)·k1 (by hand).
    // Poles −4 ± 3j ask for s² + 8s + 25, so with kt/J = 20/3: k1 = 25·3/20 = 3.75, k2 = (8 − 1/3)·3/20 = 1.15.
    expect(text).toMatch(/3\.75/);
    expect(text).toMatch(/1\.15/);
  });

  it('copies the gains to the clipboard from the code lens', async () => {
    await editor.openFile('hoist.plant');
    const page = editor.page;
    const lens = page.locator('.editor-instance .codelens-decoration a', { hasText: /K\s*=/ }).first();
    await lens.waitFor({ timeout: 60_000 });
    await lens.click();
    await expect.poll(() => page.evaluate(() => navigator.clipboard.readText()), { timeout: 30_000 }).toMatch(/K\s*=/);
    const copied = await page.evaluate(() => navigator.clipboard.readText());
    // Same gains as worked out by hand above: k1 = 3.75, k2 = 1.15.
    const gains = copied.match(/K\s*=\s*\[([^\]]*)\]/)![1].split(/[,;\s]+/).filter(Boolean).map(Number);
    expect(gains).toHaveLength(2);
    expect(gains[0]).toBeCloseTo(3.75, 9);
    expect(gains[1]).toBeCloseTo(1.15, 9);
  });

  it('exports the gains as JSON to the file chosen in the save dialog', async () => {
    await editor.openFile('hoist.plant');
    const page = editor.page;
    await editor.runCommand('Loopwright: Export Gains…');
    const input = page.locator('.quick-input-widget input');
    await page.locator('.quick-input-list .monaco-list-row', { hasText: 'JSON' }).first().click();
    // The editor's own save dialog (a path field) proposes lift-gains.json beside the model.
    await expect.poll(() => input.inputValue(), { timeout: 30_000 }).toMatch(/lift-gains\.json$/);
    await page.keyboard.press('Enter');
    const target = join(editor.workspace, 'lift-gains.json');
    // The editor may create the file before its content lands: wait for a complete JSON document, not just the file.
    const readExport = (): { K: number[][] } | undefined => {
      try {
        return JSON.parse(readFileSync(target, 'utf8')) as { K: number[][] };
      } catch {
        return undefined;
      }
    };
    await expect.poll(readExport, { timeout: 30_000 }).toBeDefined();
    const { K } = readExport()!;
    // k1 = 3.75, k2 = 1.15 (worked out by hand above).
    expect(K[0][0]).toBeCloseTo(3.75, 9);
    expect(K[0][1]).toBeCloseTo(1.15, 9);
  });

  it('adds integral action through the quick fix and the fragility warning goes away', async () => {
    await editor.openFile('dosing-tank.plant');
    const page = editor.page;
    await page.locator('.editor-instance .squiggly-warning').first().waitFor({ timeout: 60_000 });
    await page.keyboard.press('Control+Shift+M');
    const panel = page.locator('.markers-panel');
    const warnings = panel.locator('.monaco-list-row', { has: page.locator('.codicon-warning') });
    await warnings.first().waitFor();
    // Read each warning's code and position from the problems view, then try the quick fixes at that position.
    const targets: { code: string; line: number; column: number }[] = [];
    for (const row of await warnings.all()) {
      // A row reads: message, source, code (e.g. control/fragile-prescaler), [Ln, Col].
      const code = (await row.innerText()).split('\n').find((part) => /^[a-z]+\/[a-z0-9-]+$/.test(part.trim()))?.trim();
      const where = (await row.getAttribute('aria-label'))?.match(/at line (\d+) and character (\d+)/);
      if (code && where) targets.push({ code, line: Number(where[1]), column: Number(where[2]) });
    }
    // The prescaler warning is the one expected to offer integral action: try it first.
    targets.sort((a, b) => Number(b.code.includes('prescaler')) - Number(a.code.includes('prescaler')));
    let appliedFor: string | null = null;
    const seen: string[] = [];
    for (const target of targets) {
      seen.push(target.code);
      await editor.goTo(target.line, target.column);
      await page.locator('.editor-instance .monaco-editor.focused').first().waitFor();
      await page.keyboard.press('Control+.');
      // Either the quick-fix menu opens or the editor says there is none here.
      const menu = page.locator('.action-widget:not(.action-list-submenu-panel)').filter({ visible: true });
      // The server answers code actions after bringing its check up to date: allow for a busy machine.
      const opened = await menu.first().waitFor({ timeout: target.code.includes('prescaler') ? 30_000 : 8000 }).then(
        () => true,
        () => false, // "No code actions available" at this position
      );
      if (!opened) continue;
      const fix = menu.locator('.monaco-list-row', { hasText: /integral/i }).first();
      // The menu's rows can appear a moment after the menu itself: wait for the row, briefly.
      const offered = await fix.waitFor({ timeout: target.code.includes('prescaler') ? 15_000 : 2000 }).then(
        () => true,
        () => false,
      );
      if (offered) {
        await fix.click();
        appliedFor = target.code;
        break;
      }
      await page.keyboard.press('Escape');
      await page.locator('.action-widget:not(.action-list-submenu-panel)').filter({ visible: true }).waitFor({ state: 'detached' });
    }
    expect(appliedFor, `a warning in dosing-tank.plant offers the integral-action fix (warnings seen: ${seen.join(' | ')})`).not.toBeNull();
    await editor.line('integral level_sensor').waitFor();
    // The warning the fix was applied for is gone once the server re-analysed the edited text.
    const codesListed = async () => (await panel.innerText()).split('\n').map((part) => part.trim());
    await expect.poll(async () => (await codesListed()).includes(appliedFor!), { timeout: 60_000 }).toBe(false);
    expect(await panel.innerText()).toMatch(/dosing-tank\.plant/); // the panel still lists this file's other problems
    // The code lens is refreshed with the new design: it now shows an integral gain.
    await page.locator('.editor-instance .codelens-decoration', { hasText: /Ki\s*=/ }).first().waitFor({ timeout: 60_000 });
    await editor.screenshot('quick-fix');
  });

  it('draws the step response and pole map in the response panel', async () => {
    await editor.openFile('hoist.plant');
    // Hide the bottom panel (problems) so the screenshot shows the response panel at full height.
    const bottomPanel = editor.page.locator('.part.panel.bottom');
    if (await bottomPanel.isVisible()) {
      await editor.page.keyboard.press('Control+J');
      await bottomPanel.waitFor({ state: 'hidden' });
    }
    await editor.runCommand('Loopwright: Show Response Panel');
    const frame = editor.webview();
    await frame.locator('#plots[data-rendered="true"]').waitFor({ timeout: 60_000 });
    expect(await frame.locator('.lw-plot-outputs canvas').count()).toBeGreaterThan(0);
    expect(await frame.locator('.lw-plot-inputs canvas').count()).toBeGreaterThan(0);
    // Two closed-loop poles (−4 ± 3j) as crosses on the pole map.
    expect(await frame.locator('svg.lw-pole-map .lw-cross').count()).toBe(2);
    expect(await frame.locator('.lw-plot-outputs .u-legend').innerText()).toMatch(/height/);
    await editor.screenshot('response-panel');
    await editor.page.locator('iframe.webview.ready').last().screenshot({ path: join(resultsDir, 'e2e-response-panel-only.png') });
  });

  it('follows the controller under the cursor in the response panel', async () => {
    await editor.openFile('two-controllers.plant');
    await editor.goTo(fastControllerLine - 3, 3); // inside the first controller (lift)
    await editor.runCommand('Loopwright: Show Response Panel');
    // Two controllers: the command asks which one, with the one under the cursor preselected.
    const picker = editor.page.locator('.quick-input-widget');
    await picker.locator('.quick-input-list-entry', { hasText: 'lift_fast' }).waitFor();
    await editor.page.keyboard.press('Enter');
    await picker.waitFor({ state: 'hidden' });
    await editor.page.locator('.tab', { hasText: /Response: lift$/ }).first().waitFor();
    expect(await editor.page.locator('.tab', { hasText: 'Response: lift_fast' }).count()).toBe(0);
    await editor.openFile('two-controllers.plant');
    await editor.goTo(fastControllerLine + 1, 3); // inside lift_fast
    await editor.page.locator('.tab', { hasText: 'Response: lift_fast' }).waitFor({ timeout: 30_000 });
    const frame = editor.webview();
    await frame.locator('#plots[data-rendered="true"]').waitFor({ timeout: 60_000 });
    // lift_fast places −8 ± 6j: still two crosses, now for the faster pair.
    expect(await frame.locator('svg.lw-pole-map .lw-cross').count()).toBe(2);
  });
});
