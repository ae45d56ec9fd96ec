// Real-editor harness: a VS Code workbench (code-server, installed by tools/e2e-setup.sh into
// .tools/) with loopwright.vsix installed, served on 127.0.0.1 and driven by Debian's chromium
// through playwright-core. Every run gets its own folder under .run/ (user data, extensions,
// temporary files, a copy of the samples); the editor runs in its own process group and is
// stopped as a whole. Waits are on log lines, elements and events, never on fixed sleeps.
import { spawn, spawnSync, type ChildProcess } from 'node:child_process';
import { cpSync, existsSync, mkdirSync, readdirSync, rmSync, writeFileSync } from 'node:fs';
import { createServer } from 'node:net';
import { dirname, join, resolve } from 'node:path';
import { fileURLToPath } from 'node:url';
import { chromium, type BrowserContext, type FrameLocator, type Locator, type Page } from 'playwright-core';

export const repoRoot = resolve(dirname(fileURLToPath(import.meta.url)), '..', '..');
const node24 = join(repoRoot, '.tools', 'node24', 'bin', 'node');
const codeServerEntry = join(repoRoot, '.tools', 'code-server', 'node_modules', 'code-server', 'out', 'node', 'entry.js');
const vsix = join(repoRoot, 'loopwright.vsix');
export const resultsDir = join(repoRoot, '.test-results');
const browserPath = '/usr/bin/chromium';

export interface Editor {
  page: Page;
  workspace: string;
  /** Opens a workspace file by name through Quick Open and waits for its editor tab. */
  openFile(name: string): Promise<Locator>;
  /** Runs a command-palette entry by its title. */
  runCommand(title: string): Promise<void>;
  /** Moves the cursor to a 1-based line and column with "Go to Line". */
  goTo(line: number, column?: number): Promise<void>;
  /** The visible source line containing `text` in the active editor. */
  line(text: string): Locator;
  /** The inner frame of the newest webview panel. */
  webview(): FrameLocator;
  screenshot(name: string): Promise<string>;
  stop(): Promise<void>;
}

function freePort(): Promise<number> {
  return new Promise((resolvePort, reject) => {
    const server = createServer();
    server.once('error', reject);
    server.listen(0, '127.0.0.1', () => {
      const address = server.address();
      const port = typeof address === 'object' && address ? address.port : 0;
      server.close(() => resolvePort(port));
    });
  });
}

export function harnessMissing(): string | null {
  for (const [path, what] of [
    [node24, 'Node 24 (.tools/node24)'],
    [codeServerEntry, 'code-server (.tools/code-server)'],
    [vsix, 'loopwright.vsix'],
    [browserPath, 'chromium'],
  ] as const) {
    if (!existsSync(path)) return `${what} is missing: run tools/e2e-setup.sh`;
  }
  return null;
}

/** Resolves when `pattern` appears in the child's output; rejects when the child exits first. */
function waitForOutput(child: ChildProcess, pattern: RegExp, log: string[]): Promise<void> {
  return new Promise((resolveWait, reject) => {
    const onData = (chunk: Buffer) => {
      log.push(chunk.toString());
      if (pattern.test(log.join(''))) {
        cleanup();
        resolveWait();
      }
    };
    const onExit = (code: number | null) => {
      cleanup();
      reject(new Error(`code-server exited (${code}) before it was ready:\n${log.join('')}`));
    };
    const cleanup = () => {
      child.stdout?.off('data', onData);
      child.stderr?.off('data', onData);
      child.off('exit', onExit);
    };
    child.stdout?.on('data', onData);
    child.stderr?.on('data', onData);
    child.once('exit', onExit);
  });
}

function stopGroup(child: ChildProcess): Promise<void> {
  if (child.exitCode !== null || child.signalCode !== null || child.pid === undefined) return Promise.resolve();
  const pid = child.pid;
  return new Promise((resolveStop) => {
    const timer = setTimeout(() => {
      try {
        process.kill(-pid, 'SIGKILL');
      } catch {
        /* already gone */
      }
    }, 5000);
    child.once('exit', () => {
      clearTimeout(timer);
      resolveStop();
    });
    try {
      process.kill(-pid, 'SIGTERM');
    } catch {
      clearTimeout(timer);
      resolveStop();
    }
  });
}

export interface StartOptions {
  /** Extra files written into the workspace: name → text. */
  files?: Record<string, string>;
  /** Extra user settings. */
  settings?: Record<string, unknown>;
}

export async function startEditor(options: StartOptions = {}): Promise<Editor> {
  const missing = harnessMissing();
  if (missing) throw new Error(missing);
  const run = join(repoRoot, '.run', `e2e-${process.pid}`);
  rmSync(run, { recursive: true, force: true });
  const dirs = {
    data: join(run, 'user-data'),
    extensions: join(run, 'extensions'),
    tmp: join(run, 'tmp'),
    workspace: join(run, 'workspace'),
    browser: join(run, 'browser-profile'),
    xdgConfig: join(run, 'xdg', 'config'),
    xdgData: join(run, 'xdg', 'data'),
    xdgCache: join(run, 'xdg', 'cache'),
    xdgState: join(run, 'xdg', 'state'),
  };
  for (const dir of Object.values(dirs)) mkdirSync(dir, { recursive: true });
  for (const name of readdirSync(join(repoRoot, 'samples'))) {
    if (name.endsWith('.plant')) cpSync(join(repoRoot, 'samples', name), join(dirs.workspace, name));
  }
  for (const [name, text] of Object.entries(options.files ?? {})) writeFileSync(join(dirs.workspace, name), text);
  mkdirSync(join(dirs.data, 'User'), { recursive: true });
  writeFileSync(
    join(dirs.data, 'User', 'settings.json'),
    JSON.stringify(
      {
        'workbench.startupEditor': 'none',
        'workbench.tips.enabled': false,
        'workbench.enableExperiments': false,
        'telemetry.telemetryLevel': 'off',
        'security.workspace.trust.enabled': false,
        'extensions.autoCheckUpdates': false,
        'extensions.autoUpdate': false,
        'extensions.ignoreRecommendations': true,
        'update.mode': 'none',
        'git.enabled': false,
        'editor.hover.delay': 200,
        'editor.minimap.enabled': false,
        'window.restoreWindows': 'none',
        'files.autoSave': 'off',
        'chat.disableAIFeatures': true,
        'workbench.secondarySideBar.defaultVisibility': 'hidden',
        ...options.settings,
      },
      null,
      2,
    ),
  );

  const env: NodeJS.ProcessEnv = {
    ...process.env,
    TMPDIR: dirs.tmp,
    XDG_CONFIG_HOME: dirs.xdgConfig,
    XDG_DATA_HOME: dirs.xdgData,
    XDG_CACHE_HOME: dirs.xdgCache,
    XDG_STATE_HOME: dirs.xdgState,
    HOME: run,
  };
  delete env.VSCODE_IPC_HOOK_CLI;
  const common = ['--user-data-dir', dirs.data, '--extensions-dir', dirs.extensions];
  const install = spawnSync(node24, [codeServerEntry, ...common, '--install-extension', vsix], { env, encoding: 'utf8' });
  if (install.status !== 0 || !/successfully installed/.test(install.stdout + install.stderr)) {
    throw new Error(`installing loopwright.vsix failed:\n${install.stdout}\n${install.stderr}`);
  }

  const port = await freePort();
  // detached: the editor becomes the leader of its own process group (setsid), stopped as a whole.
  const server = spawn(
    node24,
    [
      codeServerEntry,
      ...common,
      '--bind-addr',
      `127.0.0.1:${port}`,
      '--auth',
      'none',
      '--disable-telemetry',
      '--disable-update-check',
      '--disable-workspace-trust',
      '--disable-getting-started-override',
      dirs.workspace,
    ],
    { env, detached: true, stdio: ['ignore', 'pipe', 'pipe'] },
  );
  const serverLog: string[] = [];
  const started = Date.now();
  const phase = (what: string) => {
    if (process.env.LOOPWRIGHT_E2E_LOG) console.log(`[e2e] ${((Date.now() - started) / 1000).toFixed(1)} s: ${what}`);
  };
  let context: BrowserContext | undefined;
  try {
    await waitForOutput(server, /HTTP server listening on/, serverLog);
    phase('editor server listening');
    context = await chromium.launchPersistentContext(dirs.browser, {
      executablePath: browserPath,
      headless: true,
      viewport: { width: 1400, height: 900 },
      args: [
        '--headless',
        '--no-sandbox',
        '--disable-gpu',
        '--disable-quic',
        '--no-first-run',
        '--disable-background-networking',
        '--disable-component-update',
        '--disable-sync',
      ],
    });
    await context.grantPermissions(['clipboard-read', 'clipboard-write'], { origin: `http://127.0.0.1:${port}` });
    const page = context.pages()[0] ?? (await context.newPage());
    const consoleLog: string[] = [];
    page.on('console', (message) => consoleLog.push(`${message.type()}: ${message.text()}`));
    phase('browser started');
    await page.goto(`http://127.0.0.1:${port}/?folder=${encodeURIComponent(dirs.workspace)}`);
    await page.locator('.monaco-workbench').waitFor({ state: 'visible', timeout: 90_000 });
    await page.locator('.statusbar').waitFor({ state: 'visible', timeout: 90_000 });
    phase('workbench shown');
    // The explorer shows the workspace once the remote file system answered.
    await page.locator('.explorer-folders-view .monaco-list-row', { hasText: 'hoist.plant' }).first().waitFor({ timeout: 90_000 });
    phase('explorer lists the workspace');

    const editor: Editor = {
      page,
      workspace: dirs.workspace,
      async openFile(name) {
        // The explorer, not Quick Open: Quick Open's file search is slow to index on a fresh profile.
        const row = page.locator(`.explorer-folders-view .monaco-list-row[aria-label="${name}"]`);
        const tab = page.locator('.tabs-container .tab.active', { hasText: name });
        // A click can be lost while the workbench is busy (seen once in CI: the tab never came);
        // click again, at most three times, each time waiting for the tab as the event.
        for (let attempt = 1; ; attempt++) {
          await row.waitFor();
          await row.click();
          if (attempt === 3) {
            await tab.waitFor();
            break;
          }
          const shown = await tab.waitFor({ timeout: 10_000 }).then(
            () => true,
            () => false,
          );
          if (shown) break;
          await page.keyboard.press('Escape'); // close whatever took the click
        }
        await page.locator('.editor-instance .monaco-editor .view-lines').first().waitFor();
        await page.keyboard.press('Control+1'); // focus the editor, as a person would by clicking into it
        await page.locator('.editor-instance .monaco-editor.focused').first().waitFor();
        return tab;
      },
      async runCommand(title) {
        const input = page.locator('.quick-input-widget input');
        const row = page.locator('.quick-input-list .monaco-list-row', { hasText: title }).first();
        // The palette occasionally shows a stale list for a filled-in query; reopen it (at most three times).
        for (let attempt = 1; ; attempt++) {
          await page.keyboard.press('F1');
          await input.waitFor({ state: 'visible' });
          await input.fill(`>${title}`);
          const found = await row.waitFor({ timeout: attempt < 3 ? 10_000 : 30_000 }).then(
            () => true,
            () => false,
          );
          if (found) break;
          if (attempt === 3) throw new Error(`the command palette does not list “${title}”`);
          await page.keyboard.press('Escape');
          await page.locator('.quick-input-widget').waitFor({ state: 'hidden' });
        }
        await page.keyboard.press('Enter');
        // Done when the palette closed or a command's own picker replaced it.
        await page.waitForFunction(() => {
          const widget = document.querySelector<HTMLElement>('.quick-input-widget');
          const field = widget?.querySelector('input');
          return !widget || widget.style.display === 'none' || !field?.value.startsWith('>');
        });
      },
      async goTo(line, column = 1) {
        await page.keyboard.press('Control+G');
        const input = page.locator('.quick-input-widget input');
        await input.waitFor({ state: 'visible' });
        await input.fill(`:${line}:${column}`); // the ':' prefix selects "go to line" in the quick input
        await page.keyboard.press('Enter');
        await page.locator('.quick-input-widget').waitFor({ state: 'hidden' });
      },
      line(text) {
        return page.locator('.editor-instance .monaco-editor .view-lines .view-line', { hasText: text }).first();
      },
      webview() {
        return page.frameLocator('iframe.webview.ready').last().frameLocator('#active-frame');
      },
      async screenshot(name) {
        mkdirSync(resultsDir, { recursive: true });
        const path = join(resultsDir, `e2e-${name}.png`);
        await page.screenshot({ path });
        return path;
      },
      async stop() {
        // Logs kept beside the screenshots as CI artefacts.
        mkdirSync(resultsDir, { recursive: true });
        writeFileSync(join(resultsDir, 'e2e-browser-console.log'), consoleLog.join('\n'));
        writeFileSync(join(resultsDir, 'e2e-code-server.log'), serverLog.join(''));
        await context?.close().catch(() => undefined);
        await stopGroup(server);
        if (!process.env.LOOPWRIGHT_E2E_KEEP) rmSync(run, { recursive: true, force: true });
      },
    };
    return editor;
  } catch (error) {
    await context?.close().catch(() => undefined);
    await stopGroup(server);
    throw error;
  }
}
