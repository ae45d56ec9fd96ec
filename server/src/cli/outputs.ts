// `loopwright export` and `loopwright report`: write only where the user said (-o), else stdout.
import { writeFileSync } from 'node:fs';
import { analyze } from '../analyze';
import type { ExportCommand, ReportCommand } from './arguments';

export function runExport(command: ExportCommand, readSource: (path: string) => string): number {
  process.stderr.write('loopwright: export is not available in this build yet\n');
  void command; void readSource; void analyze; void writeFileSync;
  return 2;
}

export function runReport(command: ReportCommand, readSource: (path: string) => string): number {
  process.stderr.write('loopwright: report is not available in this build yet\n');
  void command; void readSource;
  return 2;
}
