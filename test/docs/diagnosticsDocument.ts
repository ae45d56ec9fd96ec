// Generates docs/diagnostics.md from the three registries: the parser's syntax codes
// (grammar/src/diagnosticCodes.ts), the model's kinds and the control layer's kinds. The quick
// fixes are attached where a diagnostic is created, not in the kind, so they are listed here;
// test/docs/diagnostics.test.ts checks this list against the `fix:` names used in the source
// and against the editor's fix builders.
import { syntaxDiagnosticCodes } from '../../grammar/src/diagnosticCodes';
import { controlDiagnosticKinds } from '../../server/src/control/diagnostics';
import {
  aroundMissingState,
  matrixShape,
  modelDiagnosticKinds,
  needsOperatingPoint,
  noDesign,
  raggedMatrix,
  trackingOffEquilibrium,
  unknownName,
  unknownPlant,
  unpairedPole,
} from '../../server/src/model/diagnostics';
import { fragilePrescalerKind } from '../../server/src/control/diagnostics/fragile-prescaler';
import { fullStateWithoutObserverKind } from '../../server/src/control/diagnostics/full-state-without-observer';

interface KindRow {
  code: string;
  severity: string;
  fires: string;
  example: string;
}

/** What each quick fix (the `data.fix` name) does when applied in the editor. */
export const quickFixes: Record<string, string> = {
  'add-conjugate': 'inserts the missing complex-conjugate pole after the unpaired one',
  'add-design': 'adds an LQR line with identity weights (a starting point to tune)',
  'add-integral-action': 'adds an `integral` line for the tracked outputs, with a suggested integrator pole (0.8 × the slowest closed-loop pole, common practice)',
  'add-observer-poles': 'adds an `observer poles` line with poles a factor `observerSpeedFactor` (default 4) faster than the controller',
  'add-operating-point': 'adds an `around` line with every state and input at 0',
  'add-operating-point-values': 'adds the states missing from `around`, set to 0',
  'hold-with-input': 'changes the operating point’s inputs to the values that hold it as an equilibrium',
  rename: 'replaces the unknown name by the known name closest to it (`data.replacement`)',
  'resize-matrix': 'pads or trims the matrix to the expected size (`data.expectedRows` × `data.expectedCols`), padding with zeros',
};

/** Fix names some constructor writes but a later step replaces before the diagnostic is published. */
export const supersededFixNames: Record<string, string> = {
  'add-observer': 'written by full-state-without-observer.ts, replaced by add-observer-poles (with the suggested poles) in designFindings.ts',
};

/** Which codes carry which quick fix (where the diagnostic is created with `data.fix`). */
export const fixesByCode: Record<string, string[]> = {
  [unknownName.code]: ['rename'],
  [unknownPlant.code]: ['rename'],
  [matrixShape.code]: ['resize-matrix'],
  [raggedMatrix.code]: ['resize-matrix'],
  [trackingOffEquilibrium.code]: ['hold-with-input'],
  [unpairedPole.code]: ['add-conjugate'],
  [noDesign.code]: ['add-design'],
  [needsOperatingPoint.code]: ['add-operating-point'],
  [aroundMissingState.code]: ['add-operating-point-values'],
  [fragilePrescalerKind.code]: ['add-integral-action'],
  [fullStateWithoutObserverKind.code]: ['add-observer-poles'],
};

function cell(text: string): string {
  return text.replace(/\|/g, '\\|').replace(/\r?\n/g, ' ').trim();
}

function section(title: string, intro: string, kinds: readonly KindRow[]): string[] {
  const lines = [`## ${title}`, '', intro, '', '| Code | Severity | When it fires | Example message | Quick fix |', '| --- | --- | --- | --- | --- |'];
  for (const kind of [...kinds].sort((a, b) => a.code.localeCompare(b.code))) {
    const fixes = (fixesByCode[kind.code] ?? []).map((name) => `\`${name}\``).join(', ');
    lines.push(`| \`${kind.code}\` | ${kind.severity} | ${cell(kind.fires)} | ${cell(kind.example)} | ${fixes || '—'} |`);
  }
  lines.push('');
  return lines;
}

export function renderDiagnosticsDocument(): string {
  const lines = [
    '# Diagnostics reference',
    '',
    '<!-- Generated from the diagnostic registries by test/docs/diagnosticsDocument.ts; do not edit by hand.',
    '     Regenerate with: UPDATE_FIXTURES=1 npx vitest run test/docs -->',
    '',
    'Every diagnostic has a stable `code`, a `severity` (`error`, `warning` or `info`), a one-line',
    '`message`, the `range` of the text responsible (0-based lines, UTF-16 characters), optional `related`',
    'locations pointing at the cause, and optional `data`. Where the editor offers a quick fix, `data.fix` names it',
    '(the last column); the other `data` fields carry what the fix needs. A code never changes meaning; messages',
    'may be reworded.',
    '',
    `Counts: ${syntaxDiagnosticCodes.length} syntax codes, ${modelDiagnosticKinds.length} model codes, ${controlDiagnosticKinds.length} control codes.`,
    '',
    ...section(
      'Syntax',
      'Reported by the parser (grammar/src/diagnosticCodes.ts). The parser recovers after each error, so the rest of the file is still checked.',
      syntaxDiagnosticCodes,
    ),
    ...section(
      'Model',
      'Reported while names, units, parameters, matrices, linearisation and shapes are checked (server/src/model/diagnostics).',
      modelDiagnosticKinds,
    ),
    ...section(
      'Control',
      'Reported by the analyses of plants and controllers (server/src/control/diagnostics). Plant-level findings point at the B or C matrix (or the plant name); controller findings point at the design line that causes them.',
      controlDiagnosticKinds,
    ),
    '## Quick fixes',
    '',
    '| `data.fix` | What the fix does |',
    '| --- | --- |',
    ...Object.entries(quickFixes)
      .sort(([a], [b]) => a.localeCompare(b))
      .map(([name, text]) => `| \`${name}\` | ${cell(text)} |`),
    '',
    'A diagnostic may instead carry ready edits (`data.edits`, a list of `{range, newText}`, with `data.title`); the editor applies those as given.',
    '',
  ];
  return lines.join('\n');
}
