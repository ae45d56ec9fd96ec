// A diagnostic kind: stable code, severity, when it fires, and how its message reads.
// Every kind lives in its own file and is listed in ./index.ts, from which
// docs/diagnostics.md is generated.
import type { Diagnostic, Range, RelatedInformation, Severity } from '../types';

export interface DiagnosticKind<Args extends unknown[]> {
  code: string;
  severity: Severity;
  /** One sentence: when the model layer reports this. */
  fires: string;
  /** An example of the message as the engineer sees it. */
  example: string;
  message: (...args: Args) => string;
  create(range: Range, args: Args, extra?: DiagnosticExtra): Diagnostic;
}

export interface DiagnosticExtra {
  related?: RelatedInformation[];
  data?: { fix?: string; [key: string]: unknown };
  /** Override the kind's default severity (rare: e.g. an error demoted where a default applies). */
  severity?: Severity;
}

export function defineDiagnostic<Args extends unknown[]>(definition: {
  code: string;
  severity: Severity;
  fires: string;
  example: string;
  message: (...args: Args) => string;
}): DiagnosticKind<Args> {
  return {
    ...definition,
    create(range, args, extra) {
      const diagnostic: Diagnostic = {
        severity: extra?.severity ?? definition.severity,
        code: definition.code,
        message: definition.message(...args),
        range,
      };
      if (extra?.related && extra.related.length > 0) diagnostic.related = extra.related;
      if (extra?.data) diagnostic.data = extra.data;
      return diagnostic;
    },
  };
}

/** Backtick-quotes a name the way messages show code. */
export function code(text: string): string {
  return '`' + text + '`';
}
