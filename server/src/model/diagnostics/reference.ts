// Renders a diagnostic registry as a Markdown reference (used to generate docs/diagnostics.md;
// works for any registry built with defineDiagnostic, the model's and the engine's alike).
import type { DiagnosticKind } from './define';

export interface ReferenceSection {
  title: string;
  kinds: readonly Pick<DiagnosticKind<never>, 'code' | 'severity' | 'fires' | 'example'>[];
}

export function renderDiagnosticReference(sections: ReferenceSection[]): string {
  const lines: string[] = [];
  for (const section of sections) {
    lines.push(`## ${section.title}`, '');
    lines.push('| Code | Severity | When | Example message |', '| --- | --- | --- | --- |');
    for (const kind of [...section.kinds].sort((a, b) => a.code.localeCompare(b.code))) {
      const cell = (text: string) => text.replace(/\|/g, '\\|').replace(/\n/g, ' ');
      lines.push(`| \`${kind.code}\` | ${kind.severity} | ${cell(kind.fires)} | ${cell(kind.example)} |`);
    }
    lines.push('');
  }
  return lines.join('\n');
}
