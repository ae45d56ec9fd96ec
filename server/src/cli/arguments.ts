// Command-line parsing for `loopwright`: small and strict; unknown flags are usage errors.
import type { AnalysisSettings } from '../control/settings';

export class UsageError extends Error {}

export const USAGE = `Usage:
  loopwright check FILE... [--json] [--series] [--param-error PERCENT] [--observer-factor F]
      Analyse plant models (use - for standard input). Prints a design report per plant and
      controller, then each finding as file:line:col severity code message.
      --json      one JSON object (schema in docs/json-output.md)
      --series    include the step-response samples in the JSON
  loopwright export FILE --format c|json [--controller NAME] [--precision float|double] [-o OUT]
      Gains for the controller code: a C header or JSON (standard output without -o).
  loopwright report FILE -o OUT.html
      A self-contained HTML design report for reviews.
  loopwright lsp --stdio
      Run the language server over standard input/output for any editor.
  loopwright --help | --version
Exit codes: 0 no errors, 1 the model has errors, 2 usage or I/O error.
`;

export interface CheckCommand {
  command: 'check';
  files: string[];
  json: boolean;
  series: boolean;
  settings: Partial<AnalysisSettings>;
}

export interface ExportCommand {
  command: 'export';
  file: string;
  format: 'c' | 'json';
  controller?: string;
  precision: 'float' | 'double';
  output?: string;
  settings: Partial<AnalysisSettings>;
}

export interface ReportCommand {
  command: 'report';
  file: string;
  output: string;
  settings: Partial<AnalysisSettings>;
}

export type Command =
  | CheckCommand
  | ExportCommand
  | ReportCommand
  | { command: 'lsp' }
  | { command: 'help' }
  | { command: 'version' };

function positiveNumber(flag: string, text: string | undefined): number {
  const value = Number(text);
  if (text === undefined || !Number.isFinite(value) || value <= 0) throw new UsageError(`${flag} needs a positive number`);
  return value;
}

export function parseArguments(argv: string[]): Command {
  if (argv.length === 0) throw new UsageError('no command given');
  const [command, ...rest] = argv;
  if (command === '--help' || command === '-h' || command === 'help') return { command: 'help' };
  if (command === '--version' || command === '-v') return { command: 'version' };
  if (command === 'lsp') {
    if (rest.some((arg) => arg !== '--stdio')) throw new UsageError('lsp takes only --stdio');
    return { command: 'lsp' };
  }
  if (command !== 'check' && command !== 'export' && command !== 'report') throw new UsageError(`unknown command '${command}'`);

  const files: string[] = [];
  const settings: Partial<AnalysisSettings> = {};
  let json = false;
  let series = false;
  let format: string | undefined;
  let controller: string | undefined;
  let precision: string = 'double';
  let output: string | undefined;
  for (let i = 0; i < rest.length; i++) {
    const arg = rest[i];
    const value = () => {
      const next = rest[++i];
      if (next === undefined) throw new UsageError(`${arg} needs a value`);
      return next;
    };
    if (arg === '--json' && command === 'check') json = true;
    else if (arg === '--series' && command === 'check') series = true;
    else if (arg === '--param-error') settings.parameterErrorPercent = positiveNumber(arg, value());
    else if (arg === '--observer-factor') settings.observerSpeedFactor = positiveNumber(arg, value());
    else if (arg === '--format' && command === 'export') format = value();
    else if (arg === '--controller' && command === 'export') controller = value();
    else if (arg === '--precision' && command === 'export') precision = value();
    else if ((arg === '-o' || arg === '--output') && command !== 'check') output = value();
    else if (arg.startsWith('-') && arg !== '-') throw new UsageError(`unknown option '${arg}' for ${command}`);
    else files.push(arg);
  }
  if (files.length === 0) throw new UsageError(`${command} needs a file (or - for standard input)`);
  if (command === 'check') return { command, files, json, series, settings };
  if (files.length > 1) throw new UsageError(`${command} takes one file`);
  if (command === 'export') {
    if (format !== 'c' && format !== 'json') throw new UsageError('export needs --format c or --format json');
    if (precision !== 'float' && precision !== 'double') throw new UsageError('--precision is float or double');
    return { command, file: files[0], format, controller, precision, output, settings };
  }
  if (!output) throw new UsageError('report needs -o OUT.html');
  return { command, file: files[0], output, settings };
}
