// Runs the bundled command-line tool in a child process (the build runs in test/globalSetup.ts).
import { spawnSync } from 'node:child_process';
import { join } from 'node:path';

export const root = join(__dirname, '..', '..');
const launcher = join(root, 'bin', 'loopwright.cjs');

export interface CliResult {
  status: number | null;
  stdout: string;
  stderr: string;
}

export function runCli(args: string[], input?: string): CliResult {
  const result = spawnSync(process.execPath, [launcher, ...args], { cwd: root, input, encoding: 'utf8', maxBuffer: 1 << 26 });
  return { status: result.status, stdout: result.stdout, stderr: result.stderr };
}

export function checkJson(file: string, extra: string[] = []): any {
  const result = runCli(['check', '--json', ...extra, file]);
  return { ...JSON.parse(result.stdout), status: result.status };
}
