// `loopwright export` and `loopwright report`: files are written only where the user said (-o);
// without -o the export goes to standard output.
import { createHash } from 'node:crypto';
import { existsSync, readFileSync, writeFileSync } from 'node:fs';
import { join } from 'node:path';
import { analyze, type DocumentAnalysis } from '../analyze';
import { renderCHeader, type ExportIdentity } from '../render/cHeader';
import { renderExportJson } from '../render/exportJson';
import { renderHtmlReport } from '../render/html';
import { diagnosticLine } from '../render/text';
import type { ExportCommand, ReportCommand } from './arguments';
import type { Range } from '../model/types';

const TOOL = 'loopwright';
const VERSION = '0.1.0';

function load(file: string, readSource: (path: string) => string): { text: string; path: string } | null {
  try {
    return { text: readSource(file), path: file === '-' ? '<stdin>' : file };
  } catch (error) {
    process.stderr.write(`loopwright: cannot read ${file}: ${(error as NodeJS.ErrnoException).code ?? String(error)}\n`);
    return null;
  }
}

function write(output: string | undefined, content: string): number {
  if (output === undefined) {
    process.stdout.write(content);
    return 0;
  }
  try {
    writeFileSync(output, content);
    return 0;
  } catch (error) {
    process.stderr.write(`loopwright: cannot write ${output}: ${(error as NodeJS.ErrnoException).code ?? String(error)}\n`);
    return 2;
  }
}

function printErrors(path: string, analysis: DocumentAnalysis): void {
  for (const diagnostic of analysis.diagnostics) {
    if (diagnostic.severity === 'error') process.stderr.write(`${diagnosticLine(path, diagnostic)}\n`);
  }
}

export function runExport(command: ExportCommand, readSource: (path: string) => string): number {
  const source = load(command.file, readSource);
  if (!source) return 2;
  const analysis = analyze(source.text, command.settings);
  const names = analysis.model.controllers.map((controller) => controller.name);
  if (names.length === 0) {
    process.stderr.write(`loopwright: ${source.path} has no controller to export\n`);
    printErrors(source.path, analysis);
    return 1;
  }
  let index = 0;
  if (command.controller !== undefined) {
    index = names.indexOf(command.controller);
    if (index < 0) {
      process.stderr.write(`loopwright: no controller '${command.controller}' in ${source.path} (controllers: ${names.join(', ')})\n`);
      return 2;
    }
  } else if (names.length > 1) {
    process.stderr.write(`loopwright: ${source.path} has several controllers; choose one with --controller (${names.join(', ')})\n`);
    return 2;
  }
  const report = analysis.controllers[index];
  const controller = analysis.model.controllers[index];
  const plant = controller.plantIndex === null ? undefined : analysis.model.plants[controller.plantIndex];
  const inside = (range: Range, outer: Range) =>
    (range.start.line > outer.start.line || (range.start.line === outer.start.line && range.start.character >= outer.start.character)) &&
    (range.end.line < outer.end.line || (range.end.line === outer.end.line && range.end.character <= outer.end.character));
  // A design with an error on its controller or plant is never exported (the gains would not do what they claim).
  const blocking = analysis.diagnostics.filter(
    (d) => d.severity === 'error' && (inside(d.range, controller.range) || (plant !== undefined && inside(d.range, plant.range))),
  );
  if (!report?.designed || !report.implementation || blocking.length) {
    process.stderr.write(`loopwright: controller '${names[index]}' has no valid design to export\n`);
    printErrors(source.path, analysis);
    return 1;
  }
  const identity: ExportIdentity = {
    tool: TOOL,
    version: VERSION,
    plant: report.plant,
    controller: report.name,
    sourceHash: createHash('sha256').update(source.text).digest('hex'),
  };
  const content =
    command.format === 'c'
      ? renderCHeader(report.implementation, identity, command.precision)
      : renderExportJson(report.implementation, identity);
  return write(command.output, content);
}

export function runReport(command: ReportCommand, readSource: (path: string) => string): number {
  const source = load(command.file, readSource);
  if (!source) return 2;
  // The plot script is bundled beside this file (dist/report.js); see tools/build.mjs.
  const scriptPath = join(__dirname, 'report.js');
  const stylePath = join(__dirname, 'report.css');
  if (!existsSync(scriptPath)) {
    process.stderr.write('loopwright: the report plots are not built; run `npm run build`\n');
    return 2;
  }
  const analysis = analyze(source.text, command.settings);
  const html = renderHtmlReport(
    source.path,
    source.text,
    analysis,
    { tool: TOOL, version: VERSION, sourceHash: createHash('sha256').update(source.text).digest('hex') },
    { script: readFileSync(scriptPath, 'utf8'), style: existsSync(stylePath) ? readFileSync(stylePath, 'utf8') : '' },
  );
  const status = write(command.output, html);
  if (status !== 0) return status;
  return analysis.diagnostics.some((diagnostic) => diagnostic.severity === 'error') ? 1 : 0;
}
