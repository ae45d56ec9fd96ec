// Fault-tolerant parser: text → typed syntax tree with exact ranges + syntax diagnostics.
//
// Design: the token stream is first cut into statements by `statements.ts` (a newline ends a
// statement unless it is inside brackets or follows an operator or comma; `{` and `}` are
// block structure). Each statement is then parsed on its own by one shared Chevrotain
// parser, so an error can never swallow the following lines. Missing pieces become
// `ErrorExpr` nodes or empty-named identifiers, each covered by a diagnostic.
import { EmbeddedActionsParser, type IToken, type TokenType } from 'chevrotain';
import type {
  ControllerDecl,
  ControllerItem,
  DocumentNode,
  ErrorExpr,
  Expr,
  Identifier,
  IntegralLine,
  LimitLine,
  MatrixExpr,
  MatrixRow,
  NamedValue,
  Node,
  NumberExpr,
  ObserverLine,
  ParseResult,
  PlantDecl,
  PlantItem,
  SignalDecl,
  SpecItem,
  SyntaxDiagnostic,
} from './ast';
import { FOLD_MIN_ENTRIES, plainMatrixNode, setFoldThreshold, type PlainMatrixScan } from './plainMatrix';
import { LineIndex } from './positions';
import { cutStatements, MAX_NESTING, type Statement, type StatementUnit } from './statements';
import * as T from './tokens';

/** Deepest expression tree handed to the model (its evaluators recurse). */
export const MAX_EXPRESSION_DEPTH = 400;

const UNIT_SET: ReadonlySet<string> = new Set(T.UNIT_NAMES);

function describeToken(token: IToken): string {
  if (token.tokenType === T.Newline) return 'the end of the line';
  // A matrix read in one piece is blamed, like the grammar would, at its opening bracket.
  if (token.tokenType === T.PlainNumberMatrix) return '`[`';
  const image = token.image.length > 24 ? `${token.image.slice(0, 24)}…` : token.image;
  if (T.isKeywordToken(token.tokenType)) return `the reserved word \`${image}\``;
  return `\`${image}\``;
}

function tokenEnd(token: IToken): number {
  return token.startOffset + token.image.length;
}

/** End of the text a diagnostic about this one token covers (a folded matrix: its `[`). */
function blameEnd(token: IToken): number {
  return token.tokenType === T.PlainNumberMatrix ? token.startOffset + 1 : tokenEnd(token);
}

function isRealToken(token: IToken | undefined): token is IToken {
  return (
    token !== undefined &&
    token.tokenType !== undefined &&
    token.tokenType.name !== 'EOF' &&
    Number.isFinite(token.startOffset) &&
    !token.isInsertedInRecovery
  );
}

class PlantParser extends EmbeddedActionsParser {
  lines: LineIndex = new LineIndex('');
  diagnostics: SyntaxDiagnostic[] = [];
  /** Offsets already blamed by a diagnostic (avoids a second report for the same token). */
  blamed = new Set<number>();
  /** End offset of the statement being parsed (where "missing at end of line" points). */
  statementEnd = 0;
  /** Span including the parentheses for parenthesised expressions (the node itself excludes them). */
  outerSpans = new WeakMap<Expr, { start: number; end: number }>();
  /** Read simple matrix entries without the expression rules (see quickMatrixEntry). */
  quickEntries = true;

  /**
   * Chevrotain's grammar validations (ambiguities, left recursion…) take about a third of the
   * one-time start-up; the shared parser skips them and `validateGrammar` (run by the grammar
   * tests) performs them, so a broken grammar still fails the build.
   */
  constructor(validate = false) {
    super(T.parserTokens, { recoveryEnabled: true, maxLookahead: 3, skipValidations: !validate });
    this.performSelfAnalysis();
  }

  // ------------------------------------------------------------ helpers (not grammar rules)

  span(startOffset: number, endOffset: number): Node {
    return this.lines.span(startOffset, endOffset);
  }

  tokenSpan(first: IToken, last: IToken = first): Node {
    return this.span(first.startOffset, tokenEnd(last));
  }

  outerStart(e: Expr): number {
    return this.outerSpans.get(e)?.start ?? e.startOffset;
  }

  outerEnd(e: Expr): number {
    return this.outerSpans.get(e)?.end ?? e.endOffset;
  }

  report(
    code: string,
    message: string,
    startOffset: number,
    endOffset: number,
    severity: 'error' | 'warning' = 'error',
  ): void {
    // One diagnostic per offending token: later complaints about the same token add nothing.
    if (startOffset !== endOffset && this.blamed.has(startOffset)) return;
    this.diagnostics.push({
      severity,
      code,
      message,
      range: this.lines.range(startOffset, endOffset),
    });
    this.blamed.add(startOffset);
  }

  identifier(token: IToken): Identifier {
    return { kind: 'identifier', name: token.image, ...this.tokenSpan(token) };
  }

  /** Where something expected was not found: the next token, or the end of the statement. */
  missingSpot(what: string): { start: number; end: number; message: string } {
    const next = this.LA(1);
    const previous = this.LA(0);
    // A token on a later line (after a continuation) is not where the gap is: blame the line end.
    const sameLine =
      !isRealToken(previous) ||
      !isRealToken(next) ||
      !/[\r\n]/.test(this.lines.text.slice(tokenEnd(previous), next.startOffset));
    if (isRealToken(next) && next.tokenType !== T.Newline && sameLine) {
      return {
        start: next.startOffset,
        end: blameEnd(next),
        message: `expected ${what}, found ${describeToken(next)}`,
      };
    }
    const at = isRealToken(previous) ? tokenEnd(previous) : this.statementEnd;
    return { start: at, end: at, message: `expected ${what}` };
  }

  missingExpr(what: string): ErrorExpr {
    const spot = this.missingSpot(what);
    const code = spot.start === spot.end ? 'syntax/missing-expression' : 'syntax/unexpected-token';
    this.report(code, spot.message, spot.start, spot.end);
    return { kind: 'error', ...this.span(spot.start, spot.end) };
  }

  missingName(what: string): Identifier {
    const spot = this.missingSpot(what);
    this.report('syntax/missing-name', spot.message, spot.start, spot.end);
    return { kind: 'identifier', name: '', ...this.span(spot.start, spot.start) };
  }

  missingToken(what: string): void {
    const spot = this.missingSpot(what);
    this.report('syntax/missing-token', spot.message, spot.start, spot.end);
  }

  binary(opToken: IToken, left: Expr, right: Expr): Expr {
    return {
      kind: 'binary',
      op: opToken.image as '+' | '-' | '*' | '/' | '^',
      left,
      right,
      ...this.span(this.outerStart(left), this.outerEnd(right)),
    };
  }

  unaryChain(signs: IToken[], operand: Expr): Expr {
    let result = operand;
    for (let i = signs.length - 1; i >= 0; i--) {
      result = {
        kind: 'unary',
        op: signs[i].image as '+' | '-',
        operand: result,
        ...this.span(signs[i].startOffset, this.outerEnd(result)),
      };
    }
    return result;
  }

  /** `name = value` pieces shared by lqr, observer noise and around. */
  expectIdentifier(idx: number, what: string): Identifier {
    const token = this.option(idx, () => this.consume(idx, T.Identifier));
    return this.ACTION(() => (token ? this.identifier(token) : this.missingName(what)));
  }

  expectToken(idx: number, tokenType: TokenType, what: string): IToken | undefined {
    const token = this.option(idx, () => this.consume(idx, tokenType));
    this.ACTION(() => {
      if (!token) this.missingToken(what);
    });
    return token;
  }

  /** An expression where one is required; a missing one becomes an ErrorExpr plus diagnostic. */
  expectExpression(idx: number, what: string): Expr {
    const value = this.option(idx, () => this.subrule(idx, this.expression));
    return this.ACTION(() => value ?? this.missingExpr(what));
  }

  // ------------------------------------------------------------ expressions

  expression = this.RULE('expression', (): Expr => {
    let left = this.SUBRULE(this.term);
    this.MANY(() => {
      const op = this.OR([{ ALT: () => this.CONSUME(T.Plus) }, { ALT: () => this.CONSUME(T.Minus) }]);
      const right = this.option(1, () => this.subrule(1, this.term));
      this.ACTION(() => {
        left = this.binary(op, left, right ?? this.missingExpr(`a term after \`${op.image}\``));
      });
    });
    return left;
  });

  term = this.RULE('term', (): Expr => {
    let left = this.SUBRULE(this.unary);
    this.MANY(() => {
      const op = this.OR([{ ALT: () => this.CONSUME(T.Star) }, { ALT: () => this.CONSUME(T.Slash) }]);
      const right = this.option(1, () => this.subrule(1, this.unary));
      this.ACTION(() => {
        left = this.binary(op, left, right ?? this.missingExpr(`a factor after \`${op.image}\``));
      });
    });
    return left;
  });

  /** Signs bind looser than `^`: `-2^2` is −(2^2). Built iteratively (no recursion per sign). */
  unary = this.RULE('unary', (): Expr => {
    return this.OR([
      {
        ALT: () => {
          const signs: IToken[] = [];
          this.AT_LEAST_ONE(() => {
            const sign = this.OR2([{ ALT: () => this.CONSUME(T.Plus) }, { ALT: () => this.CONSUME(T.Minus) }]);
            this.ACTION(() => signs.push(sign));
          });
          const operand = this.OPTION(() => this.SUBRULE(this.power));
          return this.ACTION(() => {
            const last = signs[signs.length - 1];
            return this.unaryChain(signs, operand ?? this.missingExpr(`a value after \`${last.image}\``));
          });
        },
      },
      { ALT: () => this.SUBRULE2(this.power) },
    ]);
  });

  /** `a ^ b ^ c` is `a ^ (b ^ c)`; an exponent may carry signs: `2^-3`. */
  power = this.RULE('power', (): Expr => {
    const base = this.SUBRULE(this.primary);
    const links: { caret: IToken; signs: IToken[]; operand: Expr | undefined }[] = [];
    this.MANY(() => {
      const caret = this.CONSUME(T.Caret);
      const signs: IToken[] = [];
      this.MANY2(() => {
        const sign = this.OR([{ ALT: () => this.CONSUME(T.Plus) }, { ALT: () => this.CONSUME(T.Minus) }]);
        this.ACTION(() => signs.push(sign));
      });
      const operand = this.OPTION(() => this.SUBRULE2(this.primary));
      this.ACTION(() => {
        links.push({
          caret,
          signs,
          operand: operand ?? this.missingExpr('an exponent after `^`'),
        });
      });
    });
    return this.ACTION(() => {
      if (links.length === 0) return base;
      if (base.kind === 'number' && base.unit) {
        // `2 s^2` reads as (2 s)^2 = 4 s^2, rarely what was meant.
        const unit = base.unit.name;
        this.report(
          'syntax/unit-power',
          `\`${base.text} ${unit}^…\` raises the whole \`${base.text} ${unit}\` to the power; write \`${base.text}*${unit}^…\` if only \`${unit}\` is meant`,
          base.startOffset,
          base.endOffset,
          'warning',
        );
      }
      // Fold from the right: p0 ^ s1(p1 ^ s2(p2 ...)).
      let exponent: Expr | undefined;
      for (let i = links.length - 1; i >= 0; i--) {
        const operand = links[i].operand as Expr;
        const raised = exponent ? this.binary(links[i + 1].caret, operand, exponent) : operand;
        exponent = this.unaryChain(links[i].signs, raised);
      }
      return this.binary(links[0].caret, base, exponent as Expr);
    });
  });

  primary = this.RULE('primary', (): Expr => {
    return this.OR([
      { ALT: () => this.SUBRULE(this.numberLiteral) },
      {
        ALT: () => {
          const name = this.CONSUME(T.Identifier);
          const call = this.OPTION(() => this.SUBRULE(this.callArguments));
          return this.ACTION((): Expr => {
            if (!call) return { kind: 'name', name: name.image, ...this.tokenSpan(name) };
            return {
              kind: 'call',
              callee: this.identifier(name),
              args: call.args,
              ...this.span(name.startOffset, call.end),
            };
          });
        },
      },
      {
        ALT: () => {
          const open = this.CONSUME(T.LParen);
          const inner = this.expectExpression(10, 'an expression after `(`');
          const close = this.OPTION2(() => this.CONSUME(T.RParen));
          return this.ACTION(() => {
            if (!close) {
              this.report(
                'syntax/missing-token',
                'this `(` is never closed: expected `)`',
                open.startOffset,
                tokenEnd(open),
              );
            }
            const end = close ? tokenEnd(close) : Math.max(this.outerEnd(inner), tokenEnd(open));
            this.outerSpans.set(inner, { start: open.startOffset, end });
            return inner;
          });
        },
      },
      { ALT: () => this.SUBRULE(this.matrix) },
      {
        ALT: () => {
          const folded = this.CONSUME(T.PlainNumberMatrix);
          return this.ACTION(() => plainMatrixNode(folded.payload as PlainMatrixScan, folded.startOffset, this.lines));
        },
      },
    ]);
  });

  numberLiteral = this.RULE('numberLiteral', (): NumberExpr => {
    const token = this.OR(this.numberTokenAlternatives);
    const unit = this.OPTION({
      GATE: () => this.unitFollows(token),
      DEF: () =>
        this.OR2([{ ALT: () => this.CONSUME(T.Identifier) }, { ALT: () => this.CONSUME(T.Percent) }]),
    });
    return this.ACTION((): NumberExpr => {
      const node = this.numberNode(token);
      if (unit) {
        node.unit = this.identifier(unit);
        Object.assign(node, this.span(token.startOffset, tokenEnd(unit)));
      }
      return node;
    });
  });

  /** A unit name directly after a number on the same line (`5 ms`, `200 Hz`, `5 %`). */
  unitFollows(number: IToken): boolean {
    const next = this.LA(1);
    if (!isRealToken(next) || !isRealToken(number)) return false;
    if (next.tokenType === T.Percent) return true;
    if (next.tokenType !== T.Identifier || !UNIT_SET.has(next.image)) return false;
    const between = this.lines.text.slice(tokenEnd(number), next.startOffset);
    return !/[\r\n]/.test(between);
  }

  callArguments = this.RULE('callArguments', (): { args: Expr[]; end: number } => {
    const open = this.CONSUME(T.LParen);
    const args: Expr[] = [];
    this.OPTION(() => {
      const first = this.SUBRULE(this.expression);
      this.ACTION(() => args.push(first));
      this.MANY(() => {
        this.CONSUME(T.Comma);
        const next = this.expectExpression(10, 'an argument after `,`');
        this.ACTION(() => args.push(next));
      });
    });
    const close = this.OPTION2(() => this.CONSUME(T.RParen));
    return this.ACTION(() => {
      if (!close) {
        this.missingToken('`)` to close the argument list');
      }
      const lastArg = args[args.length - 1];
      const end = close ? tokenEnd(close) : lastArg ? this.outerEnd(lastArg) : tokenEnd(open);
      return { args, end };
    });
  });

  /**
   * A matrix entry that is only a (signed) number or name followed by `,`, `;`, a row break or
   * `]` — most entries of a physical model's matrices (`0`, `-1`, `k`) — read straight from the
   * tokens: the node is exactly what the expression rules build, without their seven rule calls.
   * Off when the grammar-only parse is asked for (tests compare the two).
   */
  quickMatrixEntry(): Expr | undefined {
    if (!this.quickEntries) return undefined;
    const first = this.LA(1);
    const signed = first.tokenType === T.Minus || first.tokenType === T.Plus;
    const atom = signed ? this.LA(2) : first;
    const type = atom.tokenType;
    if (type !== T.NumberLiteral && type !== T.ImaginaryNumber && type !== T.Identifier) return undefined;
    const follower = (signed ? this.LA(3) : this.LA(2)).tokenType;
    if (follower !== T.Comma && follower !== T.Semicolon && follower !== T.Newline && follower !== T.RSquare) return undefined;
    const sign = signed ? this.consume(7, first.tokenType) : undefined;
    this.consume(8, type);
    const operand: Expr =
      type === T.Identifier ? { kind: 'name', name: atom.image, ...this.tokenSpan(atom) } : this.numberNode(atom);
    return sign ? this.unaryChain([sign], operand) : operand;
  }

  /** `[a, b; c, d]`: `;` or newline between rows (repeated breaks count once), `,` between entries. */
  matrix = this.RULE('matrix', (): MatrixExpr => {
    const open = this.CONSUME(T.LSquare);
    const rows: MatrixRow[] = [];
    let entries: Expr[] = [];
    let lastComma: IToken | undefined;
    let afterStray = false;
    const recording = this.RECORDING_PHASE;
    const endRow = (): void => {
      if (lastComma) {
        const at = tokenEnd(lastComma);
        this.report('syntax/missing-expression', 'expected a matrix entry after `,`', at, at);
        entries.push({ kind: 'error', ...this.span(at, at) });
        lastComma = undefined;
      }
      afterStray = false;
      if (entries.length === 0) return;
      const first = entries[0];
      const last = entries[entries.length - 1];
      rows.push({
        kind: 'row',
        entries,
        ...this.span(this.outerStart(first), this.outerEnd(last)),
      });
      entries = [];
    };
    const addEntry = (entry: Expr): void => {
      if (entries.length > 0 && !lastComma && !afterStray) {
        const start = this.outerStart(entry);
        this.report('syntax/missing-token', 'expected `,` between matrix entries', start, this.outerEnd(entry));
      }
      entries.push(entry);
      lastComma = undefined;
      afterStray = false;
    };
    const afterComma = (comma: IToken): void => {
      if (entries.length === 0 || lastComma) {
        this.report('syntax/missing-expression', 'expected a matrix entry before `,`', comma.startOffset, tokenEnd(comma));
        entries.push({ kind: 'error', ...this.tokenSpan(comma) });
      }
      lastComma = comma;
      afterStray = false;
    };
    // One alternatives array per matrix (not per entry): large matrices allocate far less.
    const alternatives = [
      {
        ALT: () => {
          this.CONSUME(T.Semicolon);
          if (!recording) endRow();
        },
      },
      {
        ALT: () => {
          this.CONSUME(T.Newline);
          if (!recording) endRow();
        },
      },
      {
        ALT: () => {
          const comma = this.CONSUME(T.Comma);
          if (!recording) afterComma(comma);
        },
      },
      {
        ALT: () => {
          const quick = recording ? undefined : this.quickMatrixEntry();
          if (quick) {
            addEntry(quick);
            return;
          }
          const entry = this.SUBRULE(this.expression);
          if (!recording) addEntry(entry);
        },
      },
      {
        // A token that cannot appear in a matrix (`[1, step]`, `[1 = 2]`): report it, skip it,
        // and keep reading the matrix so its `]` still closes it.
        ALT: () => {
          const stray = this.OR2(this.strayMatrixTokenAlternatives);
          if (recording) return;
          this.report(
            'syntax/unexpected-token',
            `unexpected ${describeToken(stray)} in a matrix`,
            stray.startOffset,
            tokenEnd(stray),
          );
          if (entries.length === 0 || lastComma) {
            // It stands where an entry belongs: keep the entry count right with an ErrorExpr.
            entries.push({ kind: 'error', ...this.tokenSpan(stray) });
            lastComma = undefined;
          }
          afterStray = true;
        },
      },
    ];
    // Runs of separators and simple entries (most of a large matrix) are read straight from the
    // tokens, exactly as the alternatives would read them, without a lookahead and a rule call per
    // token; anything else goes back through the alternatives.
    const readSimpleRun = (): void => {
      for (;;) {
        const type = this.LA(1).tokenType;
        if (type === T.Semicolon || type === T.Newline) {
          this.consume(9, type);
          endRow();
        } else if (type === T.Comma) {
          afterComma(this.consume(10, T.Comma));
        } else {
          const quick = this.quickMatrixEntry();
          if (!quick) return;
          addEntry(quick);
        }
      }
    };
    this.MANY(() => {
      this.OR(alternatives);
      if (!recording && this.quickEntries) readSimpleRun();
    });
    const close = this.OPTION(() => this.CONSUME(T.RSquare));
    return this.ACTION((): MatrixExpr => {
      endRow();
      if (!close) {
        this.report(
          'syntax/missing-token',
          'this `[` is never closed: expected `]`',
          open.startOffset,
          tokenEnd(open),
        );
      }
      const lastRow = rows[rows.length - 1];
      const end = close ? tokenEnd(close) : lastRow ? lastRow.endOffset : tokenEnd(open);
      return { kind: 'matrix', rows, ...this.span(open.startOffset, end) };
    });
  });

  /** Tokens that can neither start a matrix entry nor separate entries. */
  strayMatrixTokenAlternatives = [
    ...T.KEYWORDS.map((word) => T.keywordTokens[word]),
    T.RParen,
    T.Equals,
    T.LessEqual,
    T.Less,
    T.Prime,
    T.Percent,
    T.Caret,
    T.Star,
    T.Slash,
  ].map((tokenType) => ({ ALT: () => this.CONSUME(tokenType) }));

  numberTokenAlternatives = [
    { ALT: () => this.CONSUME(T.NumberLiteral) },
    { ALT: () => this.CONSUME(T.ImaginaryNumber) },
  ];

  numberNode(token: IToken): NumberExpr {
    const imaginary = token.tokenType === T.ImaginaryNumber;
    const start = token.startOffset;
    const end = start + token.image.length;
    return {
      kind: 'number',
      value: Number(imaginary ? token.image.slice(0, -1) : token.image),
      imaginary,
      text: token.image,
      range: this.lines.range(start, end),
      startOffset: start,
      endOffset: end,
    };
  }

  /** Comma-separated names (`states a, b`); at least one is required. */
  identifierList = this.RULE('identifierList', (what: string): Identifier[] => {
    const names: Identifier[] = [];
    const first = this.OPTION(() => this.CONSUME(T.Identifier));
    this.ACTION(() => names.push(first ? this.identifier(first) : this.missingName(what)));
    this.MANY(() => {
      this.OR([
        {
          ALT: () => {
            this.CONSUME(T.Comma);
            const name = this.OPTION2(() => this.CONSUME2(T.Identifier));
            this.ACTION(() => names.push(name ? this.identifier(name) : this.missingName('a name after `,`')));
          },
        },
        {
          // `states x y`: keep the name, report the missing comma.
          ALT: () => {
            const name = this.CONSUME3(T.Identifier);
            this.ACTION(() => {
              this.report('syntax/missing-token', 'expected `,` between names', name.startOffset, tokenEnd(name));
              names.push(this.identifier(name));
            });
          },
        },
      ]);
    });
    return names;
  });

  /** `Q = ..., R = ...` (lqr, observer noise, around). */
  namedValueList = this.RULE('namedValueList', (): NamedValue[] => {
    const values: NamedValue[] = [];
    const first = this.SUBRULE(this.namedValue);
    this.ACTION(() => values.push(first));
    this.MANY(() => {
      this.CONSUME(T.Comma);
      const next = this.SUBRULE2(this.namedValue);
      this.ACTION(() => values.push(next));
    });
    return values;
  });

  namedValue = this.RULE('namedValue', (): NamedValue => {
    const name = this.expectIdentifier(10, 'a name');
    this.expectToken(11, T.Equals, `\`=\` after the name`);
    const value = this.expectExpression(12, 'a value after `=`');
    return this.ACTION(
      (): NamedValue => ({
        kind: 'namedValue',
        name,
        value,
        ...this.span(name.startOffset, Math.max(name.endOffset, this.outerEnd(value))),
      }),
    );
  });

  specItem = this.RULE('specItem', (): SpecItem => {
    const name = this.expectIdentifier(10, 'a specification name (settling, overshoot or rise)');
    const op = this.OPTION(() =>
      this.OR([{ ALT: () => this.CONSUME(T.LessEqual) }, { ALT: () => this.CONSUME(T.Less) }]),
    );
    this.ACTION(() => {
      if (!op) this.missingToken('`<=` after the specification name');
    });
    const value = this.expectExpression(11, 'a bound');
    return this.ACTION(
      (): SpecItem => ({
        kind: 'specItem',
        name,
        op: op ? (op.image as '<=' | '<') : '<=',
        value,
        ...this.span(name.startOffset, Math.max(name.endOffset, this.outerEnd(value))),
      }),
    );
  });

  // ------------------------------------------------------------ statements

  plantItem = this.RULE('plantItem', (): PlantItem => {
    return this.OR([
      {
        ALT: () => {
          const keyword = this.CONSUME(T.keywordTokens.param);
          const name = this.expectIdentifier(10, 'the parameter name after `param`');
          this.expectToken(11, T.Equals, '`=` after the parameter name');
          const value = this.expectExpression(12, 'a value after `=`');
          return this.ACTION(
            (): PlantItem => ({
              kind: 'param',
              name,
              value,
              ...this.span(keyword.startOffset, this.statementEnd),
            }),
          );
        },
      },
      {
        ALT: () => {
          const keyword = this.OR2([
            { ALT: () => this.CONSUME(T.keywordTokens.states) },
            { ALT: () => this.CONSUME(T.keywordTokens.inputs) },
            { ALT: () => this.CONSUME(T.keywordTokens.outputs) },
            { ALT: () => this.CONSUME(T.keywordTokens.disturbances) },
          ]);
          const names = this.SUBRULE(this.identifierList, { ARGS: [`a signal name after \`${keyword.image}\``] });
          return this.ACTION(
            (): SignalDecl => ({
              kind: 'signals',
              role: keyword.image as SignalDecl['role'],
              keyword: this.tokenSpan(keyword),
              names,
              ...this.span(keyword.startOffset, this.statementEnd),
            }),
          );
        },
      },
      {
        ALT: () => {
          const keyword = this.CONSUME(T.keywordTokens.output);
          const output = this.expectIdentifier(13, 'the output name after `output`');
          this.expectToken(14, T.Equals, '`=` after the output name');
          const value = this.expectExpression(15, 'an expression after `=`');
          return this.ACTION(
            (): PlantItem => ({
              kind: 'outputEquation',
              output,
              value,
              ...this.span(keyword.startOffset, this.statementEnd),
            }),
          );
        },
      },
      {
        ALT: () => {
          const keyword = this.CONSUME(T.keywordTokens.transfer);
          this.expectToken(16, T.Equals, '`=` after `transfer`');
          const value = this.expectExpression(17, 'a transfer function after `=`');
          return this.ACTION(
            (): PlantItem => ({
              kind: 'transfer',
              value,
              ...this.span(keyword.startOffset, this.statementEnd),
            }),
          );
        },
      },
      {
        ALT: () => {
          const keyword = this.CONSUME(T.keywordTokens.around);
          const assignments = this.SUBRULE(this.namedValueList);
          return this.ACTION(
            (): PlantItem => ({
              kind: 'around',
              assignments,
              ...this.span(keyword.startOffset, this.statementEnd),
            }),
          );
        },
      },
      {
        ALT: () => {
          const nameToken = this.CONSUME(T.Identifier);
          const prime = this.OPTION(() => this.CONSUME(T.Prime));
          this.expectToken(18, T.Equals, '`=` after the name');
          const value = this.expectExpression(19, 'a value after `=`');
          return this.ACTION((): PlantItem => {
            const name = this.identifier(nameToken);
            const where = this.span(nameToken.startOffset, this.statementEnd);
            return prime
              ? { kind: 'stateEquation', state: name, value, ...where }
              : { kind: 'matrixAssign', name, value, ...where };
          });
        },
      },
    ]);
  });

  controllerItem = this.RULE('controllerItem', (): ControllerItem => {
    return this.OR([
      {
        ALT: () => {
          const keyword = this.CONSUME(T.keywordTokens.poles);
          this.expectToken(10, T.Equals, '`=` after `poles`');
          const value = this.expectExpression(11, 'the poles after `=`');
          return this.ACTION(
            (): ControllerItem => ({ kind: 'poles', value, ...this.span(keyword.startOffset, this.statementEnd) }),
          );
        },
      },
      {
        ALT: () => {
          const keyword = this.CONSUME(T.keywordTokens.lqr);
          const weights = this.SUBRULE(this.namedValueList);
          return this.ACTION(
            (): ControllerItem => ({ kind: 'lqr', weights, ...this.span(keyword.startOffset, this.statementEnd) }),
          );
        },
      },
      {
        ALT: () => {
          const keyword = this.CONSUME(T.keywordTokens.spec);
          const items: SpecItem[] = [];
          const first = this.SUBRULE(this.specItem);
          this.ACTION(() => items.push(first));
          this.MANY(() => {
            this.CONSUME(T.Comma);
            const next = this.SUBRULE2(this.specItem);
            this.ACTION(() => items.push(next));
          });
          return this.ACTION(
            (): ControllerItem => ({ kind: 'spec', items, ...this.span(keyword.startOffset, this.statementEnd) }),
          );
        },
      },
      {
        ALT: () => {
          const keyword = this.CONSUME(T.keywordTokens.track);
          const outputs = this.SUBRULE(this.identifierList, { ARGS: ['an output name after `track`'] });
          return this.ACTION(
            (): ControllerItem => ({ kind: 'track', outputs, ...this.span(keyword.startOffset, this.statementEnd) }),
          );
        },
      },
      {
        ALT: () => {
          const keyword = this.CONSUME(T.keywordTokens.integral);
          const outputs = this.SUBRULE2(this.identifierList, { ARGS: ['an output name after `integral`'] });
          const pole = this.OPTION(() => {
            this.CONSUME(T.keywordTokens.pole);
            return this.expectExpression(12, 'a pole value after `pole`');
          });
          return this.ACTION((): ControllerItem => {
            const line: IntegralLine = {
              kind: 'integral',
              outputs,
              ...this.span(keyword.startOffset, this.statementEnd),
            };
            if (pole) line.pole = pole;
            return line;
          });
        },
      },
      {
        ALT: () => {
          const keyword = this.CONSUME(T.keywordTokens.observer);
          const line: Partial<ObserverLine> = {};
          this.OR2([
            {
              ALT: () => {
                this.CONSUME2(T.keywordTokens.poles);
                this.expectToken(13, T.Equals, '`=` after `poles`');
                const poles = this.expectExpression(14, 'the observer poles after `=`');
                this.ACTION(() => (line.poles = poles));
              },
            },
            {
              ALT: () => {
                this.CONSUME(T.keywordTokens.noise);
                const noise = this.SUBRULE2(this.namedValueList);
                this.ACTION(() => (line.noise = noise));
              },
            },
            {
              ALT: () => {
                this.ACTION(() => this.missingToken('`poles = ...` or `noise W = ..., V = ...` after `observer`'));
              },
            },
          ]);
          const form = this.OPTION2(() => this.CONSUME(T.Identifier));
          return this.ACTION((): ControllerItem => {
            const result: ObserverLine = {
              kind: 'observer',
              ...line,
              ...this.span(keyword.startOffset, this.statementEnd),
            };
            if (form) result.form = this.identifier(form);
            return result;
          });
        },
      },
      {
        ALT: () => {
          const keyword = this.CONSUME(T.keywordTokens.sample);
          const value = this.expectExpression(15, 'a sample period or rate after `sample` (e.g. `5 ms` or `200 Hz`)');
          return this.ACTION(
            (): ControllerItem => ({ kind: 'sample', value, ...this.span(keyword.startOffset, this.statementEnd) }),
          );
        },
      },
      {
        ALT: () => {
          const keyword = this.CONSUME(T.keywordTokens.delay);
          const value = this.expectExpression(16, 'a whole number of samples after `delay`');
          this.OPTION3(() => this.CONSUME3(T.keywordTokens.sample));
          return this.ACTION(
            (): ControllerItem => ({ kind: 'delay', value, ...this.span(keyword.startOffset, this.statementEnd) }),
          );
        },
      },
      {
        ALT: () => {
          const keyword = this.CONSUME(T.keywordTokens.limit);
          const input = this.expectIdentifier(17, 'an input name after `limit`');
          this.expectToken(18, T.keywordTokens.in, '`in` after the input name');
          const open = this.expectToken(19, T.LSquare, '`[` before the lower limit');
          const low = this.expectExpression(20, 'the lower limit');
          this.expectToken(21, T.Comma, '`,` between the lower and upper limit');
          const high = this.expectExpression(22, 'the upper limit');
          const close = this.option(23, () => this.consume(23, T.RSquare));
          return this.ACTION((): ControllerItem => {
            if (open && !close) this.missingToken('`]` after the upper limit');
            const line: LimitLine = {
              kind: 'limit',
              input,
              low,
              high,
              ...this.span(keyword.startOffset, this.statementEnd),
            };
            return line;
          });
        },
      },
      {
        ALT: () => {
          const keyword = this.CONSUME(T.keywordTokens.step);
          const output = this.expectIdentifier(24, 'an output name after `step`');
          this.expectToken(25, T.keywordTokens.to, '`to` after the output name');
          const value = this.expectExpression(26, 'the step size after `to`');
          return this.ACTION(
            (): ControllerItem => ({
              kind: 'step',
              output,
              value,
              ...this.span(keyword.startOffset, this.statementEnd),
            }),
          );
        },
      },
    ]);
  });
}

// ---------------------------------------------------------------------------- driver

let sharedParser: PlantParser | undefined;

export interface ParseOptions {
  /**
   * Entry count from which all-number matrices skip the grammar (tests set Infinity / 1).
   * Infinity is the grammar-only parse: simple entries then also go through the expression rules.
   */
  foldMinEntries?: number;
}

/** Builds a parser with Chevrotain's grammar validations on; throws when the grammar is broken. */
export function validateGrammar(): void {
  new PlantParser(true);
}

function getParser(): PlantParser {
  sharedParser ??= new PlantParser();
  return sharedParser;
}

const PLANT_STARTERS: ReadonlySet<TokenType> = new Set([
  T.keywordTokens.param,
  T.keywordTokens.states,
  T.keywordTokens.inputs,
  T.keywordTokens.outputs,
  T.keywordTokens.disturbances,
  T.keywordTokens.output,
  T.keywordTokens.transfer,
  T.keywordTokens.around,
  T.Identifier,
]);

const CONTROLLER_STARTERS: ReadonlySet<TokenType> = new Set([
  T.keywordTokens.poles,
  T.keywordTokens.lqr,
  T.keywordTokens.spec,
  T.keywordTokens.track,
  T.keywordTokens.integral,
  T.keywordTokens.observer,
  T.keywordTokens.sample,
  T.keywordTokens.delay,
  T.keywordTokens.limit,
  T.keywordTokens.step,
]);

interface OpenBlock {
  decl: PlantDecl | ControllerDecl;
  open: IToken | undefined;
  header: IToken;
  lastEnd: number;
}

/**
 * Parse a `.plant` document. Never throws: internal failures become a diagnostic with code
 * `syntax/internal-error`.
 */
export function parsePlantText(text: string, options: ParseOptions = {}): ParseResult {
  const foldThreshold = options.foldMinEntries ?? FOLD_MIN_ENTRIES;
  setFoldThreshold(foldThreshold);
  getParser().quickEntries = Number.isFinite(foldThreshold);
  const source = typeof text === 'string' ? text : String(text ?? '');
  const lines = new LineIndex(source);
  const diagnostics: SyntaxDiagnostic[] = [];
  const document: DocumentNode = {
    kind: 'document',
    declarations: [],
    ...lines.span(0, source.length),
  };
  try {
    parseInto(source, lines, document, diagnostics);
  } catch (error) {
    diagnostics.push({
      severity: 'error',
      code: 'syntax/internal-error',
      message: `the parser failed unexpectedly (${error instanceof Error ? error.message : String(error)}); results may be incomplete`,
      range: lines.range(0, 0),
    });
  }
  diagnostics.sort(
    (a, b) => a.range.start.line - b.range.start.line || a.range.start.character - b.range.start.character,
  );
  return { document, diagnostics };
}

function parseInto(
  source: string,
  lines: LineIndex,
  document: DocumentNode,
  diagnostics: SyntaxDiagnostic[],
): void {
  const report = (code: string, message: string, start: number, end: number): void => {
    diagnostics.push({ severity: 'error', code, message, range: lines.range(start, end) });
  };

  const lexed = T.parseLexer.tokenize(source);
  for (const error of lexed.errors) {
    const bad = source.slice(error.offset, error.offset + error.length);
    const shown = bad.length > 12 ? `${bad.slice(0, 12)}…` : bad;
    report(
      'syntax/bad-character',
      bad.length === 1 ? `unexpected character \`${shown}\`` : `unexpected characters \`${shown}\``,
      error.offset,
      error.offset + error.length,
    );
  }

  const units = cutStatements(lexed.tokens);
  const parser = getParser();
  parser.lines = lines;

  let block: OpenBlock | undefined;
  const closeBlock = (end: number): void => {
    if (!block) return;
    Object.assign(block.decl, lines.span(block.decl.startOffset, end));
    block = undefined;
  };
  const reportUnterminated = (reason: string): void => {
    if (!block) return;
    const at = block.open ?? block.header;
    const what = `${block.decl.kind} \`${block.decl.name.name || '?'}\``;
    report('syntax/unterminated-block', `${what} is missing its closing \`}\`${reason}`, at.startOffset, tokenEnd(at));
  };

  // Depth of braces of an unrecognised top-level block being skipped (`plnt hoist { ... }`):
  // its lines are not reported one by one; one diagnostic at its head says what is wrong.
  let skippedDepth = 0;
  const isHeader = (unit: StatementUnit | undefined): boolean =>
    unit?.kind === 'statement' &&
    (unit.tokens[0].tokenType === T.keywordTokens.plant || unit.tokens[0].tokenType === T.keywordTokens.controller);

  for (let index = 0; index < units.length; index++) {
    const unit = units[index];
    if (skippedDepth > 0) {
      if (unit.kind === 'open') skippedDepth++;
      else if (unit.kind === 'close') skippedDepth--;
      if (!isHeader(unit)) continue;
      skippedDepth = 0;
    }
    if (unit.kind !== 'statement') {
      const brace = unit.token;
      if (unit.kind === 'open') {
        report(
          'syntax/unexpected-token',
          'unexpected `{`: a block starts with `plant <name>` or `controller <name> for <plant>`',
          brace.startOffset,
          tokenEnd(brace),
        );
        if (!block) skippedDepth = 1;
      } else if (block) {
        closeBlock(tokenEnd(brace));
      } else {
        report('syntax/unexpected-token', 'unexpected `}`: there is no open block to close', brace.startOffset, tokenEnd(brace));
      }
      continue;
    }
    const statement = unit;
    const first = statement.tokens[0];
    if (first.tokenType === T.keywordTokens.plant || first.tokenType === T.keywordTokens.controller) {
      if (block) {
        reportUnterminated(` before the next ${first.image}`);
        closeBlock(block.lastEnd);
      }
      const decl = parseHeader(statement, lines, report);
      document.declarations.push(decl);
      const next = units[index + 1];
      let open: IToken | undefined;
      if (next && next.kind === 'open') {
        open = next.token;
        index++;
      } else {
        const last = statement.tokens[statement.tokens.length - 1];
        report('syntax/missing-token', `expected \`{\` after the ${first.image} header`, tokenEnd(last), tokenEnd(last));
      }
      block = { decl, open, header: first, lastEnd: open ? tokenEnd(open) : statement.end };
      continue;
    }
    if (!block && units[index + 1]?.kind === 'open') {
      report(
        'syntax/unknown-block',
        `unknown block ${describeToken(first)}: a block starts with \`plant <name>\` or \`controller <name> for <plant>\``,
        statement.start,
        statement.end,
      );
      index++;
      skippedDepth = 1;
      continue;
    }
    if (!block) {
      report(
        'syntax/outside-block',
        'this line is outside any block: write it inside `plant <name> { ... }` or `controller <name> for <plant> { ... }`',
        statement.start,
        statement.end,
      );
      continue;
    }
    block.lastEnd = statement.end;
    if (statement.tooDeep) {
      const t = statement.tooDeep;
      report(
        'syntax/too-deep',
        `expression nested too deeply (more than ${MAX_NESTING} levels of brackets); this line is skipped`,
        t.startOffset,
        tokenEnd(t),
      );
      continue;
    }
    const isPlant = block.decl.kind === 'plant';
    const starters = isPlant ? PLANT_STARTERS : CONTROLLER_STARTERS;
    const second = statement.tokens[1];
    // `frobnicate the plant`: a name followed by another word is not a broken assignment.
    const wordAfterName =
      first.tokenType === T.Identifier &&
      second !== undefined &&
      (second.tokenType === T.Identifier || T.isKeywordToken(second.tokenType));
    if (!starters.has(first.tokenType) || wordAfterName) {
      report('syntax/unknown-statement', unknownStatementMessage(first, isPlant), statement.start, statement.end);
      continue;
    }
    try {
      const item = parseStatement(parser, statement, isPlant ? 'plant' : 'controller');
      diagnostics.push(...parser.diagnostics);
      if (item) {
        guardDepth(item, lines, report);
        (block.decl.items as (PlantItem | ControllerItem)[]).push(item);
      }
    } catch (error) {
      report(
        'syntax/internal-error',
        `the parser failed on this line (${error instanceof Error ? error.message : String(error)})`,
        statement.start,
        statement.end,
      );
    }
  }
  if (block) {
    reportUnterminated(' at the end of the file');
    closeBlock(block.lastEnd);
  }
}

function unknownStatementMessage(first: IToken, isPlant: boolean): string {
  const shown = describeToken(first);
  if (isPlant && CONTROLLER_STARTERS.has(first.tokenType)) {
    return `\`${first.image}\` belongs in a controller block, not in a plant`;
  }
  if (!isPlant && PLANT_STARTERS.has(first.tokenType) && first.tokenType !== T.Identifier) {
    return `\`${first.image}\` belongs in a plant block, not in a controller`;
  }
  if (isPlant) {
    const what = first.tokenType === T.Identifier ? `unknown plant line ${shown}` : `unexpected ${shown}`;
    return `${what}: a plant line is \`param\`, \`states\`, \`inputs\`, \`outputs\`, \`disturbances\`, a matrix \`A = [...]\`, an equation \`x' = ...\`, \`output y = ...\`, \`transfer = ...\` or \`around ...\``;
  }
  return `unknown controller line ${shown}: expected \`poles\`, \`lqr\`, \`spec\`, \`track\`, \`integral\`, \`observer\`, \`sample\`, \`delay\`, \`limit\` or \`step\``;
}

function parseStatement(
  parser: PlantParser,
  statement: Statement,
  kind: 'plant' | 'controller',
): PlantItem | ControllerItem | undefined {
  parser.diagnostics = [];
  parser.blamed = new Set();
  parser.statementEnd = statement.end;
  parser.input = statement.tokens;
  const item = kind === 'plant' ? parser.plantItem() : parser.controllerItem();
  for (const error of parser.errors) {
    const token = error.token;
    if (!isRealToken(token)) {
      parser.report('syntax/unexpected-token', 'this line is incomplete', statement.end, statement.end);
      continue;
    }
    if (parser.blamed.has(token.startOffset)) continue;
    const last = statement.tokens[statement.tokens.length - 1];
    const isLeftover = error.name === 'NotAllInputParsedException';
    const head = statement.tokens[0];
    const lineName = `\`${head.image}\` line`;
    parser.report(
      'syntax/unexpected-token',
      isLeftover
        ? `unexpected ${describeToken(token)}: the ${lineName} is already complete here`
        : `unexpected ${describeToken(token)}`,
      token.startOffset,
      isLeftover ? Math.max(blameEnd(token), tokenEnd(last)) : blameEnd(token),
    );
  }
  return item ?? undefined;
}

type Report = (code: string, message: string, start: number, end: number) => void;

function parseHeader(statement: Statement, lines: LineIndex, report: Report): PlantDecl | ControllerDecl {
  const tokens = statement.tokens;
  const keyword = tokens[0];
  let position = 1;
  const takeName = (what: string, after: IToken): Identifier => {
    const token = tokens[position];
    if (token && token.tokenType === T.Identifier) {
      position++;
      return { kind: 'identifier', name: token.image, ...lines.span(token.startOffset, tokenEnd(token)) };
    }
    if (token && T.isKeywordToken(token.tokenType)) {
      report('syntax/missing-name', `expected ${what}, found the reserved word \`${token.image}\` (choose another name)`, token.startOffset, tokenEnd(token));
      position++;
      return { kind: 'identifier', name: token.image, ...lines.span(token.startOffset, tokenEnd(token)) };
    }
    const at = token ? token.startOffset : tokenEnd(after);
    const atEnd = token ? blameEnd(token) : at;
    report('syntax/missing-name', token ? `expected ${what}, found ${describeToken(token)}` : `expected ${what}`, at, atEnd);
    return { kind: 'identifier', name: '', ...lines.span(at, at) };
  };
  let decl: PlantDecl | ControllerDecl;
  if (keyword.tokenType === T.keywordTokens.plant) {
    const name = takeName('the plant name after `plant`', keyword);
    decl = { kind: 'plant', name, items: [], ...lines.span(keyword.startOffset, statement.end) };
  } else {
    const name = takeName('the controller name after `controller`', keyword);
    decl = { kind: 'controller', name, items: [], ...lines.span(keyword.startOffset, statement.end) };
    const forToken = tokens[position];
    if (forToken && forToken.tokenType === T.keywordTokens.for) {
      position++;
      decl.plant = takeName('the plant name after `for`', forToken);
      if (!decl.plant.name) delete decl.plant;
    } else {
      const at = forToken ? forToken.startOffset : statement.end;
      report(
        'syntax/missing-token',
        forToken
          ? `expected \`for <plant>\` after the controller name, found ${describeToken(forToken)}`
          : 'expected `for <plant>` after the controller name',
        at,
        forToken ? blameEnd(forToken) : at,
      );
      if (forToken) position = tokens.length;
    }
  }
  if (position < tokens.length) {
    const extra = tokens[position];
    report('syntax/unexpected-token', `unexpected ${describeToken(extra)} in the ${keyword.image} header`, extra.startOffset, statement.end);
  }
  return decl;
}

/** Replace expressions deeper than the model can safely walk by an ErrorExpr. */
function guardDepth(item: PlantItem | ControllerItem, lines: LineIndex, report: Report): void {
  const record = item as unknown as Record<string, unknown>;
  for (const key of ['value', 'pole', 'poles', 'low', 'high']) {
    const value = record[key] as Expr | undefined;
    if (value && exceedsDepth(value)) {
      report('syntax/too-deep', `expression nested too deeply (more than ${MAX_EXPRESSION_DEPTH} levels)`, value.startOffset, value.endOffset);
      record[key] = { kind: 'error', ...lines.span(value.startOffset, value.endOffset) } satisfies ErrorExpr;
    }
  }
  for (const key of ['weights', 'noise', 'assignments', 'items']) {
    const list = record[key] as { value: Expr }[] | undefined;
    if (!Array.isArray(list)) continue;
    for (const entry of list) {
      if (entry.value && exceedsDepth(entry.value)) {
        report('syntax/too-deep', `expression nested too deeply (more than ${MAX_EXPRESSION_DEPTH} levels)`, entry.value.startOffset, entry.value.endOffset);
        entry.value = { kind: 'error', ...lines.span(entry.value.startOffset, entry.value.endOffset) };
      }
    }
  }
}

/** Iterative depth check (the tree may be arbitrarily deep; no recursion here). */
function exceedsDepth(root: Expr): boolean {
  const stack: [Expr, number][] = [[root, 1]];
  while (stack.length > 0) {
    const [node, depth] = stack.pop() as [Expr, number];
    if (depth > MAX_EXPRESSION_DEPTH) return true;
    switch (node.kind) {
      case 'unary':
        stack.push([node.operand, depth + 1]);
        break;
      case 'binary':
        stack.push([node.left, depth + 1], [node.right, depth + 1]);
        break;
      case 'call':
        for (const arg of node.args) stack.push([arg, depth + 1]);
        break;
      case 'matrix':
        if (node.plain) break; // folded: entries of at most 32 operands, far below the limit
        for (const row of node.rows) {
          for (const entry of row.entries) {
            if (entry.kind !== 'number' && entry.kind !== 'name') stack.push([entry, depth + 1]);
          }
        }
        break;
      default:
        break;
    }
  }
  return false;
}
