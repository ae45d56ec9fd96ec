// Every diagnostic code the parser reports, with its severity and when it fires
// (docs/diagnostics.md is generated from this list; a test fails when parser.ts uses a
// `syntax/…` code that is missing here).

export interface SyntaxDiagnosticCode {
  code: string;
  severity: 'error' | 'warning';
  /** One sentence: when the parser reports this. */
  fires: string;
  /** An example of the message as the engineer sees it. */
  example: string;
}

export const syntaxDiagnosticCodes: readonly SyntaxDiagnosticCode[] = [
  {
    code: 'syntax/bad-character',
    severity: 'error',
    fires: 'The text contains a character that starts no token of the language.',
    example: 'unexpected character `$`',
  },
  {
    code: 'syntax/internal-error',
    severity: 'error',
    fires: 'The parser itself failed on a line or on the whole text; the rest of the file is still analysed where possible.',
    example: 'the parser failed on this line (…)',
  },
  {
    code: 'syntax/missing-expression',
    severity: 'error',
    fires: 'A value is expected but nothing is written, e.g. an empty matrix entry between commas or nothing after `=`.',
    example: 'expected a matrix entry after `,`',
  },
  {
    code: 'syntax/missing-name',
    severity: 'error',
    fires: 'A name is expected (plant, controller, signal, parameter) but is absent or is a reserved word.',
    example: 'expected the plant name after `plant`',
  },
  {
    code: 'syntax/missing-token',
    severity: 'error',
    fires: 'A required punctuation mark is missing: a closing bracket, a comma between entries or names, or `{` after a block header.',
    example: 'this `(` is never closed: expected `)`',
  },
  {
    code: 'syntax/outside-block',
    severity: 'error',
    fires: 'A statement is written outside any `plant` or `controller` block.',
    example: 'this line is outside any block: write it inside `plant <name> { ... }` or `controller <name> for <plant> { ... }`',
  },
  {
    code: 'syntax/too-deep',
    severity: 'error',
    fires: 'An expression nests brackets beyond the parser’s depth limit; the line is skipped.',
    example: 'expression nested too deeply (more than 64 levels of brackets); this line is skipped',
  },
  {
    code: 'syntax/unexpected-token',
    severity: 'error',
    fires: 'A token appears where the grammar does not allow it (a stray `}`, an extra word in a header, a stray symbol in a matrix, an incomplete line).',
    example: 'unexpected `}`: there is no open block to close',
  },
  {
    code: 'syntax/unit-power',
    severity: 'warning',
    fires: 'A power after a number with a unit (`2 s^2` reads as (2 s)²) raises the whole quantity, which is rarely meant.',
    example: '`2 s^…` raises the whole `2 s` to the power; write `2*s^…` if only `s` is meant',
  },
  {
    code: 'syntax/unknown-block',
    severity: 'error',
    fires: 'A top-level block starts with a word other than `plant` or `controller`; its lines are skipped and reported once.',
    example: 'unknown block `plnt`: a block starts with `plant <name>` or `controller <name> for <plant>`',
  },
  {
    code: 'syntax/unknown-statement',
    severity: 'error',
    fires: 'A line inside a block starts with a word that is no statement of that block.',
    example: 'unknown plant line `stae`: a plant line is `param`, `states`, `inputs`, …',
  },
  {
    code: 'syntax/unterminated-block',
    severity: 'error',
    fires: 'A block is never closed with `}` before the end of the file or the next block header.',
    example: 'plant `hoist` is missing its closing `}` at the end of the file',
  },
];
