// `loopwright` command-line tool. Exit codes: 0 no errors, 1 error diagnostics, 2 usage or I/O.
// A user error never prints a stack trace.
import { readFileSync } from 'node:fs';
import { analyze, type DocumentAnalysis } from '../analyze';
import type { AnalysisSettings } from '../control/settings';
import { documentJson } from '../render/json';
import { renderText, SAFETY_CAUTION } from '../render/text';
import { parseArguments, UsageError, USAGE } from './arguments';
import { runExport, runReport } from './outputs';

export const VERSION = '0.1.0';

function readSource(path: string): string {
  return path === '-' ? readFileSync(0, 'utf8') : readFileSync(path, 'utf8');
}

function hasErrors(analysis: DocumentAnalysis): boolean {
  return analysis.diagnostics.some((diagnostic) => diagnostic.severity === 'error');
}

function check(files: string[], json: boolean, series: boolean, settings: Partial<AnalysisSettings>): number {
  const results: { path: string; analysis: DocumentAnalysis }[] = [];
  let ioFailed = false;
  for (const path of files) {
    let text: string;
    try {
      text = readSource(path);
    } catch (error) {
      process.stderr.write(`loopwright: cannot read ${path}: ${(error as NodeJS.ErrnoException).code ?? String(error)}\n`);
      ioFailed = true;
      continue;
    }
    results.push({ path: path === '-' ? '<stdin>' : path, analysis: analyze(text, settings) });
  }
  if (json) {
    process.stdout.write(`${JSON.stringify(documentJson(results, VERSION, { series }), null, 2)}\n`);
  } else {
    for (const { path, analysis } of results) process.stdout.write(`${renderText(path, analysis)}\n\n`);
    if (results.length) process.stdout.write(`Caution: ${SAFETY_CAUTION}\n`);
  }
  if (ioFailed) return 2;
  return results.some((result) => hasErrors(result.analysis)) ? 1 : 0;
}

export async function main(argv: string[]): Promise<number> {
  let parsed;
  try {
    parsed = parseArguments(argv);
  } catch (error) {
    if (error instanceof UsageError) {
      process.stderr.write(`loopwright: ${error.message}\n\n${USAGE}`);
      return 2;
    }
    throw error;
  }
  switch (parsed.command) {
    case 'help':
      process.stdout.write(USAGE);
      return 0;
    case 'version':
      process.stdout.write(`${VERSION}\n`);
      return 0;
    case 'check':
      return check(parsed.files, parsed.json, parsed.series, parsed.settings);
    case 'export':
      return runExport(parsed, readSource);
    case 'report':
      return runReport(parsed, readSource);
    case 'lsp': {
      const { startStdioServer } = await import('../lsp/main');
      startStdioServer();
      return -1; // keeps running until the client disconnects
    }
  }
}

main(process.argv.slice(2)).then(
  (code) => {
    if (code >= 0) process.exitCode = code;
  },
  (error) => {
    process.stderr.write(`loopwright: internal error (please report): ${error instanceof Error ? error.message : String(error)}\n`);
    process.exitCode = 2;
  },
);
