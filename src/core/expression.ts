/**
 * The expression language of a `shear` block: numbers with units, names, + - * / ^, parentheses,
 * member access on sections and beams (`S.I`, `B.Vmax`), calls of a fixed list of functions, and
 * `to UNIT` for conversion. It has no strings, no assignment inside expressions, no indexing and
 * no way to name anything outside the note: there is nothing to escape to.
 * Every node keeps its columns, for diagnostics, hovers and formulas with values substituted.
 */
import { NoteError } from './diagnostic';

export type TokenKind = 'number' | 'name' | 'op' | 'end';

export interface Token {
  kind: TokenKind;
  text: string;
  start: number;
  end: number;
}

export const MAX_LINE_LENGTH = 4000;
export const MAX_TOKENS = 1000;
export const MAX_DEPTH = 64;

const OPERATORS = ['<=', '>=', '==', ':', '+', '-', '*', '/', '^', '(', ')', ',', '.', '=', '<', '>', '·', '×', '−', '²', '³', '⁴'];

/** Splits one line (or part of one) into tokens. `base` is the column of text[0] in the Markdown line. */
export function tokenize(text: string, base: number, line: number): Token[] {
  if (text.length > MAX_LINE_LENGTH) {
    throw new NoteError('syntax.too-long', `This line is ${text.length} characters long; lines are limited to ${MAX_LINE_LENGTH}.`, { line, start: base, end: base + text.length });
  }
  const tokens: Token[] = [];
  let i = 0;
  const n = text.length;
  while (i < n) {
    const code = text.charCodeAt(i);
    if (code === 32 || code === 9 || code === 13 || code === 0xa0) {
      i++;
      continue;
    }
    if (code === 35 /* # */) break;
    const start = i;
    if (isDigit(code) || (code === 46 && isDigit(text.charCodeAt(i + 1)))) {
      while (i < n && (isDigit(text.charCodeAt(i)) || text.charCodeAt(i) === 95)) i++;
      if (text.charCodeAt(i) === 46 && isDigit(text.charCodeAt(i + 1))) {
        i++;
        while (i < n && (isDigit(text.charCodeAt(i)) || text.charCodeAt(i) === 95)) i++;
      } else if (text.charCodeAt(i) === 46 && !isNameStart(text.charCodeAt(i + 1))) {
        i++;
      }
      const e = text.charCodeAt(i);
      if ((e === 101 || e === 69) && /^[eE][+-]?[0-9]/.test(text.slice(i, i + 3))) {
        i++;
        if (text[i] === '+' || text[i] === '-') i++;
        while (i < n && isDigit(text.charCodeAt(i))) i++;
      }
      const raw = text.slice(start, i);
      tokens.push({ kind: 'number', text: raw.includes('_') ? raw.replace(/_/g, '') : raw, start: base + start, end: base + i });
    } else if (isNameStart(code)) {
      while (i < n && isNamePart(text.charCodeAt(i))) i++;
      tokens.push({ kind: 'name', text: text.slice(start, i), start: base + start, end: base + i });
    } else {
      const op = OPERATORS.find((o) => text.startsWith(o, i));
      if (!op) {
        throw new NoteError('syntax.character', `The character "${text[i]}" has no meaning here.`, { line, start: base + i, end: base + i + 1 });
      }
      i += op.length;
      const normal = op === '·' || op === '×' ? '*' : op === '−' ? '-' : op;
      tokens.push({ kind: 'op', text: normal, start: base + start, end: base + i });
    }
    if (tokens.length > MAX_TOKENS) {
      throw new NoteError('syntax.too-long', `This line has more than ${MAX_TOKENS} tokens.`, { line, start: base, end: base + text.length });
    }
  }
  tokens.push({ kind: 'end', text: '', start: base + i, end: base + i });
  return tokens;
}

function isDigit(c: number): boolean {
  return c >= 48 && c <= 57;
}
function isNameStart(c: number): boolean {
  return (c >= 65 && c <= 90) || (c >= 97 && c <= 122) || c === 95;
}
function isNamePart(c: number): boolean {
  return isNameStart(c) || isDigit(c);
}

/** A unit written in an expression: names with integer powers, e.g. kN/m is [kN^1, m^-1]. */
export interface UnitTerm {
  name: string;
  power: number;
  start: number;
  end: number;
}

interface NodeBase {
  start: number;
  end: number;
}

export type Expr =
  | (NodeBase & { kind: 'number'; value: number; text: string; unit?: UnitTerm[] })
  | (NodeBase & { kind: 'name'; name: string })
  | (NodeBase & { kind: 'member'; object: Expr; member: string; memberStart: number })
  | (NodeBase & { kind: 'call'; callee: string; calleeEnd: number; args: Expr[] })
  | (NodeBase & { kind: 'unary'; op: '-' | '+'; operand: Expr })
  | (NodeBase & { kind: 'binary'; op: '+' | '-' | '*' | '/' | '^'; left: Expr; right: Expr })
  | (NodeBase & { kind: 'paren'; inner: Expr })
  | (NodeBase & { kind: 'convert'; value: Expr; unit: UnitTerm[]; unitStart: number });

/**
 * A cursor over a token list. Statement parsers read keywords with it and call `expression()`
 * for the quantities between them; `stopWords` ends an expression at a keyword (`x`, `at`, `to`…).
 */
export class TokenCursor {
  pos = 0;
  depth = 0;
  constructor(
    readonly tokens: Token[],
    readonly line: number,
  ) {}

  peek(offset = 0): Token {
    return this.tokens[Math.min(this.pos + offset, this.tokens.length - 1)]!;
  }
  next(): Token {
    const t = this.peek();
    if (t.kind !== 'end') this.pos++;
    return t;
  }
  atEnd(): boolean {
    return this.peek().kind === 'end';
  }
  isOp(text: string, offset = 0): boolean {
    const t = this.peek(offset);
    return t.kind === 'op' && t.text === text;
  }
  isWord(text: string, offset = 0): boolean {
    const t = this.peek(offset);
    return t.kind === 'name' && t.text === text;
  }
  fail(message: string, token: Token = this.peek(), code = 'syntax.unexpected'): never {
    throw new NoteError(code, message, { line: this.line, start: token.start, end: Math.max(token.end, token.start + 1) });
  }
  expectOp(text: string, what: string): Token {
    if (!this.isOp(text)) this.fail(`Expected "${text}" ${what}, found ${describeToken(this.peek())}.`);
    return this.next();
  }
  expectName(what: string): Token {
    const t = this.peek();
    if (t.kind !== 'name') this.fail(`Expected ${what}, found ${describeToken(t)}.`);
    return this.next();
  }
  expectEnd(what: string): void {
    if (!this.atEnd()) this.fail(`Unexpected ${describeToken(this.peek())} ${what}.`);
  }

  /** Parses an expression; stops before a stop word, a comma, a closing parenthesis or a comparison. */
  expression(stopWords: ReadonlySet<string> = NO_STOP): Expr {
    const saved = this.stop;
    this.stop = stopWords;
    try {
      const value = this.additive();
      if (this.isWord('to') && !stopWords.has('to')) {
        this.next();
        const unitStart = this.peek().start;
        const unit = this.unitExpression();
        return { kind: 'convert', value, unit, unitStart, start: value.start, end: this.tokens[this.pos - 1]!.end };
      }
      return value;
    } finally {
      this.stop = saved;
    }
  }

  private stop: ReadonlySet<string> = NO_STOP;

  private enter(): void {
    if (++this.depth > MAX_DEPTH) this.fail(`This expression nests deeper than ${MAX_DEPTH} levels.`, this.peek(), 'syntax.too-deep');
  }

  private additive(): Expr {
    this.enter();
    let left = this.multiplicative();
    while (this.isOp('+') || this.isOp('-')) {
      const op = this.next().text as '+' | '-';
      const right = this.multiplicative();
      left = { kind: 'binary', op, left, right, start: left.start, end: right.end };
    }
    this.depth--;
    return left;
  }

  private multiplicative(): Expr {
    let left = this.unary();
    while (this.isOp('*') || this.isOp('/')) {
      const op = this.next().text as '*' | '/';
      const right = this.unary();
      left = { kind: 'binary', op, left, right, start: left.start, end: right.end };
    }
    return left;
  }

  private unary(): Expr {
    if (this.isOp('-') || this.isOp('+')) {
      const t = this.next();
      this.enter();
      const operand = this.unary();
      this.depth--;
      return { kind: 'unary', op: t.text as '-' | '+', operand, start: t.start, end: operand.end };
    }
    return this.power();
  }

  private power(): Expr {
    const base = this.postfix();
    if (this.isOp('^')) {
      this.next();
      this.enter();
      const exponent = this.unary();
      this.depth--;
      return { kind: 'binary', op: '^', left: base, right: exponent, start: base.start, end: exponent.end };
    }
    const sup = this.superscriptPower();
    if (sup !== undefined) {
      const t = this.tokens[this.pos - 1]!;
      return { kind: 'binary', op: '^', left: base, right: { kind: 'number', value: sup, text: String(sup), start: t.start, end: t.end }, start: base.start, end: t.end };
    }
    return base;
  }

  private superscriptPower(): number | undefined {
    const t = this.peek();
    if (t.kind === 'op' && (t.text === '²' || t.text === '³' || t.text === '⁴')) {
      this.next();
      return t.text === '²' ? 2 : t.text === '³' ? 3 : 4;
    }
    return undefined;
  }

  private postfix(): Expr {
    let node = this.primary();
    while (this.isOp('.') && this.peek(1).kind === 'name') {
      this.next();
      const m = this.next();
      node = { kind: 'member', object: node, member: m.text, memberStart: m.start, start: node.start, end: m.end };
    }
    return node;
  }

  private primary(): Expr {
    const t = this.peek();
    if (t.kind === 'number') {
      this.next();
      let value = Number(t.text);
      let text = t.text;
      let end = t.end;
      // 5/16 in: a fraction written without spaces, directly followed by a unit, is one number.
      if (this.isOp('/') && this.peek().start === t.end && this.peek(1).kind === 'number' && this.peek(1).start === this.peek().end && this.peek(2).kind === 'name' && !this.stop.has(this.peek(2).text) && !this.isOp('(', 3)) {
        this.next();
        const d = this.next();
        value = value / Number(d.text);
        text = `${t.text}/${d.text}`;
        end = d.end;
      }
      if (!Number.isFinite(value)) this.fail(`The number ${t.text} is too large.`, t, 'value.not-finite');
      const unit = this.implicitUnit();
      return { kind: 'number', value, text, unit, start: t.start, end: unit ? unit[unit.length - 1]!.end : end };
    }
    if (t.kind === 'name') {
      if (this.stop.has(t.text)) this.fail(`Expected a value before "${t.text}".`, t);
      this.next();
      if (this.isOp('(')) {
        this.next();
        this.enter();
        const args: Expr[] = [];
        if (!this.isOp(')')) {
          for (;;) {
            args.push(this.expression(NO_STOP));
            if (this.isOp(',')) {
              this.next();
              continue;
            }
            break;
          }
        }
        const close = this.expectOp(')', `to close the call of ${t.text}`);
        this.depth--;
        return { kind: 'call', callee: t.text, calleeEnd: t.end, args, start: t.start, end: close.end };
      }
      return { kind: 'name', name: t.text, start: t.start, end: t.end };
    }
    if (t.kind === 'op' && t.text === '(') {
      this.next();
      this.enter();
      const inner = this.expression(NO_STOP);
      const close = this.expectOp(')', 'to close the parenthesis');
      this.depth--;
      return { kind: 'paren', inner, start: t.start, end: close.end };
    }
    if (t.kind === 'end') this.fail('An expression is missing here.', t, 'syntax.missing');
    this.fail(`Unexpected ${describeToken(t)}.`, t);
  }

  /** A unit written straight after a number: `250 mm`, `2 in^4`, `30 in²`. */
  private implicitUnit(): UnitTerm[] | undefined {
    const t = this.peek();
    // `to` is never a unit: `(2 m)^2 to mm^2` converts the power.
    if (t.kind !== 'name' || t.text === 'to' || this.stop.has(t.text) || this.isOp('(', 1) || this.isOp('.', 1)) return undefined;
    this.next();
    const { power, end } = this.unitPower(t, true);
    return [{ name: t.text, power, start: t.start, end }];
  }

  /**
   * The power written after a unit name: `^2`, `^-1` or a superscript. After a number (`lenient`)
   * a `^` not followed by a whole number is left for the expression to read.
   */
  private unitPower(t: Token, lenient: boolean): { power: number; end: number } {
    let power = 1;
    let end = t.end;
    if (this.isOp('^') && (!lenient || this.peek(1).kind === 'number' || (this.isOp('-', 1) && this.peek(2).kind === 'number'))) {
      this.next();
      let sign = 1;
      if (this.isOp('-')) {
        this.next();
        sign = -1;
      }
      const n = this.next();
      if (n.kind !== 'number') this.fail('Expected a whole-number power.', n, 'unit.power');
      power = sign * Number(n.text);
      end = n.end;
    } else {
      const sup = this.superscriptPower();
      if (sup !== undefined) {
        power = sup;
        end = this.tokens[this.pos - 1]!.end;
      }
    }
    if (!Number.isInteger(power) || Math.abs(power) > 6) this.fail('A unit power must be a whole number from -6 to 6.', t, 'unit.power');
    return { power, end };
  }

  /** The unit after `to`: names joined by * · / with integer powers, e.g. `kN/m`, `kip*ft`, `in^4`. */
  unitExpression(): UnitTerm[] {
    const terms: UnitTerm[] = [];
    let sign = 1;
    for (;;) {
      const t = this.peek();
      if (t.kind === 'number' && t.text === '1' && this.isOp('/', 1)) {
        this.next();
      } else {
        if (t.kind !== 'name') this.fail(`Expected a unit, found ${describeToken(t)}.`, t, 'unit.expected');
        this.next();
        const { power, end } = this.unitPower(t, false);
        terms.push({ name: t.text, power: power * sign, start: t.start, end });
      }
      if (this.isOp('*')) {
        this.next();
        sign = 1;
      } else if (this.isOp('/')) {
        this.next();
        sign = -1;
      } else break;
    }
    return terms;
  }
}

const NO_STOP: ReadonlySet<string> = new Set();

export function describeToken(t: Token): string {
  if (t.kind === 'end') return 'the end of the line';
  if (t.kind === 'number') return `the number ${t.text}`;
  if (t.kind === 'name') return `"${t.text}"`;
  return `"${t.text}"`;
}

/** Names an expression reads (not units, not function names, not members). */
export function namesIn(e: Expr, out: Expr[] = []): Expr[] {
  switch (e.kind) {
    case 'name':
      out.push(e);
      break;
    case 'member':
      namesIn(e.object, out);
      break;
    case 'call':
      for (const a of e.args) namesIn(a, out);
      break;
    case 'unary':
      namesIn(e.operand, out);
      break;
    case 'binary':
      namesIn(e.left, out);
      namesIn(e.right, out);
      break;
    case 'paren':
      namesIn(e.inner, out);
      break;
    case 'convert':
      namesIn(e.value, out);
      break;
    case 'number':
      break;
  }
  return out;
}
