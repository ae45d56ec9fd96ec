// Builds dist/ once before the suites that spawn the bundled CLI and language server.
import { execFileSync } from 'node:child_process';
import { join } from 'node:path';

export default function setup(): void {
  execFileSync(process.execPath, [join(__dirname, '..', 'tools', 'build.mjs')], { stdio: 'inherit' });
}
