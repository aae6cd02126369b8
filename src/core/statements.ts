/**
 * The statements of a `shear` block, one a line, `#` to the end of a line is a comment:
 *
 *   NAME = EXPR                       a quantity
 *   section NAME[: TITLE]             a cross-section; indented parts follow
 *   beam NAME: SPAN                   a beam; indented supports, loads and combinations follow
 *   check EXPR <= EXPR                also <, >=, >
 *   units SI | US                     the unit system results are shown in
 *
 * The parser never fails as a whole: a line it cannot read becomes one diagnostic and the others
 * are kept. A broken header drops its indented lines quietly, so one typo is one message.
 */
import type { Diagnostic } from './diagnostic';
import { NoteError } from './diagnostic';
import { type Block, MAX_NESTING } from './blocks';
import { type Expr, type Token, TokenCursor, tokenize, type UnitTerm } from './expression';

export type CompareOp = '<=' | '<' | '>=' | '>';

export interface NameRef {
  name: string;
  start: number;
  end: number;
}

export type PartShape = 'plate' | 'circle' | 'tube' | 'box' | 'isection' | 'tee' | 'channel' | 'angle' | 'polygon';

export interface PartStatement {
  line: number;
  start: number;
  end: number;
  hole: boolean;
  shape: PartShape;
  /** Named dimensions: plate {b, h}; circle {d}; tube {d, t}; box {b, h, t}; isection/tee/channel {d, bf, tf, tw}; angle {d, b, t}. */
  dims: Record<string, Expr>;
  at?: [Expr, Expr];
  points?: [Expr, Expr][];
  /** A unit written once after a polygon's points, applied to plain-number coordinates. */
  pointsUnit?: UnitTerm[];
}

export type SupportKind = 'pin' | 'roller' | 'fixed';
export type LoadKind = 'point' | 'udl' | 'ramp' | 'moment';

export type BeamItem =
  | { kind: 'support'; line: number; start: number; end: number; support: SupportKind; x: Expr }
  | {
      kind: 'load';
      line: number;
      start: number;
      end: number;
      load: LoadKind;
      group?: NameRef;
      /** point: P, x; udl: w, [x1, x2]; ramp: w1, w2, [x1, x2]; moment: M, x. */
      values: Record<string, Expr>;
    }
  | { kind: 'combine'; line: number; start: number; end: number; name: NameRef; terms: { factor?: Expr; group: NameRef }[] };

export type Statement =
  | { kind: 'assign'; line: number; start: number; end: number; target: NameRef; expr: Expr }
  | { kind: 'check'; line: number; start: number; end: number; left: Expr; op: CompareOp; right: Expr; text: string }
  | { kind: 'units'; line: number; start: number; end: number; system: 'SI' | 'US' }
  | { kind: 'section'; line: number; start: number; end: number; target: NameRef; title: string; parts: PartStatement[] }
  | { kind: 'beam'; line: number; start: number; end: number; target: NameRef; span: Expr; items: BeamItem[] };

export const KEYWORDS = ['section', 'beam', 'check', 'units', 'hole', 'at', 'x', 'to', 'from', 'pin', 'roller', 'fixed', 'point', 'udl', 'ramp', 'moment', 'combine'] as const;
export const PART_SHAPES: readonly PartShape[] = ['plate', 'circle', 'tube', 'box', 'isection', 'tee', 'channel', 'angle', 'polygon'];
export const RESERVED = new Set<string>(['section', 'beam', 'check', 'units', 'hole', 'to', 'left', 'right', 'pi']);

/** Statements are limited per block, so one pasted table cannot stall the editor. */
export const MAX_BLOCK_LINES = 20000;

export interface ParsedBlock {
  statements: Statement[];
  diagnostics: Diagnostic[];
}

function indentOf(text: string): number {
  const m = /^[ \t]*/.exec(text)!;
  return m[0].replace(/\t/g, '    ').length;
}

function isBlank(text: string): boolean {
  return /^\s*(#.*)?$/.test(text);
}

export function parseBlock(block: Block): ParsedBlock {
  const statements: Statement[] = [];
  const diagnostics: Diagnostic[] = [];
  const lines = block.lines;
  if (block.nestedTooDeep) {
    diagnostics.push({ code: 'block.too-deep', severity: 'error', message: `This block sits inside lists or quotes nested more than ${MAX_NESTING} levels deep, where the Markdown reader stops; it was not read or evaluated. Move it out of the nesting.`, line: block.fenceLine, column: 0, endColumn: 1 });
    return { statements, diagnostics };
  }
  if (lines.length > MAX_BLOCK_LINES) {
    const first = lines[0]!;
    diagnostics.push({ code: 'block.too-long', severity: 'error', message: `This block has ${lines.length} lines; a block may hold at most ${MAX_BLOCK_LINES}. Split it into several blocks.`, line: first.line, column: first.column, endColumn: first.column + first.text.length });
    return { statements, diagnostics };
  }
  const report = (e: unknown, line: number, column: number, text: string) => {
    if (e instanceof NoteError && e.span) {
      diagnostics.push({ code: e.code, severity: 'error', message: e.message, line: e.span.line, column: e.span.start, endColumn: e.span.end });
    } else {
      diagnostics.push({ code: 'syntax.error', severity: 'error', message: e instanceof Error ? e.message : String(e), line, column, endColumn: column + text.length });
    }
  };
  let i = 0;
  while (i < lines.length) {
    const bl = lines[i]!;
    if (isBlank(bl.text)) {
      i++;
      continue;
    }
    const indent = indentOf(bl.text);
    // The indented lines that belong to a header on this line.
    let j = i + 1;
    while (j < lines.length && (isBlank(lines[j]!.text) || indentOf(lines[j]!.text) > indent)) j++;
    while (j > i + 1 && isBlank(lines[j - 1]!.text)) j--;
    let tokens: Token[];
    try {
      tokens = tokenize(bl.text, bl.column, bl.line);
    } catch (e) {
      report(e, bl.line, bl.column, bl.text);
      i = j;
      continue;
    }
    const cur = new TokenCursor(tokens, bl.line);
    const head = cur.peek();
    try {
      if (head.kind === 'name' && head.text === 'section' && cur.peek(1).kind === 'name') {
        const st = parseSectionHeader(cur, bl.text, bl.column);
        for (let k = i + 1; k < j; k++) {
          const child = lines[k]!;
          if (isBlank(child.text)) continue;
          try {
            st.parts.push(parsePart(new TokenCursor(tokenize(child.text, child.column, child.line), child.line)));
          } catch (e) {
            report(e, child.line, child.column, child.text);
          }
        }
        statements.push(st);
        i = j;
        continue;
      }
      if (head.kind === 'name' && head.text === 'beam' && cur.peek(1).kind === 'name') {
        const st = parseBeamHeader(cur);
        for (let k = i + 1; k < j; k++) {
          const child = lines[k]!;
          if (isBlank(child.text)) continue;
          try {
            st.items.push(parseBeamItem(new TokenCursor(tokenize(child.text, child.column, child.line), child.line)));
          } catch (e) {
            report(e, child.line, child.column, child.text);
          }
        }
        statements.push(st);
        i = j;
        continue;
      }
      statements.push(parseSimple(cur, bl.text, bl.column));
    } catch (e) {
      report(e, bl.line, bl.column, bl.text);
    }
    i = head.kind === 'name' && (head.text === 'section' || head.text === 'beam') ? j : i + 1;
  }
  return { statements, diagnostics };
}

function nameRef(t: Token): NameRef {
  return { name: t.text, start: t.start, end: t.end };
}

function checkTarget(cur: TokenCursor, t: Token, what: string): void {
  if (t.text.startsWith('__')) cur.fail(`Names may not start with two underscores.`, t, 'name.reserved');
  if (RESERVED.has(t.text)) cur.fail(`"${t.text}" is a word of the block language and cannot name ${what}.`, t, 'name.reserved');
}

function parseSimple(cur: TokenCursor, text: string, column: number): Statement {
  const head = cur.peek();
  const line = cur.line;
  const start = head.start;
  const lineEnd = column + text.replace(/\s*(#.*)?$/, '').length;
  if (head.kind === 'name' && head.text === 'check') {
    cur.next();
    const left = cur.expression();
    const opTok = cur.peek();
    if (!(opTok.kind === 'op' && ['<=', '<', '>=', '>'].includes(opTok.text))) {
      cur.fail(`A check compares two values with <=, <, >= or >; found ${opTok.kind === 'end' ? 'the end of the line' : `"${opTok.text}"`}.`, opTok, 'check.operator');
    }
    cur.next();
    const right = cur.expression();
    cur.expectEnd('after the check');
    const body = text.slice(left.start - column, right.end - column);
    return { kind: 'check', line, start, end: lineEnd, left, op: opTok.text as CompareOp, right, text: body };
  }
  if (head.kind === 'name' && head.text === 'units' && cur.peek(1).kind === 'name') {
    cur.next();
    const sys = cur.next();
    const upper = sys.text.toUpperCase();
    if (upper !== 'SI' && upper !== 'US') cur.fail('Write `units SI` or `units US`.', sys, 'units.system');
    cur.expectEnd('after the unit system');
    return { kind: 'units', line, start, end: lineEnd, system: upper as 'SI' | 'US' };
  }
  if (head.kind === 'name' && cur.isOp('=', 1)) {
    cur.next();
    checkTarget(cur, head, 'a quantity');
    cur.next();
    const expr = cur.expression();
    cur.expectEnd('after the expression');
    return { kind: 'assign', line, start, end: lineEnd, target: nameRef(head), expr };
  }
  if (head.kind === 'name' && (head.text === 'section' || head.text === 'beam')) {
    cur.fail(`Write \`${head.text} NAME${head.text === 'beam' ? ': SPAN' : ''}\`.`, head, 'syntax.header');
  }
  if (head.kind === 'name' && PART_SHAPES.includes(head.text as PartShape)) {
    cur.fail(`A \`${head.text}\` is a part of a section: indent it under a \`section NAME\` line.`, head, 'syntax.part-outside');
  }
  if (head.kind === 'name' && cur.peek(1).kind === 'end') {
    cur.fail(`"${head.text}" on its own does nothing; write \`${head.text} = …\` to define it.`, head, 'syntax.statement');
  }
  cur.fail('Expected `NAME = value`, `section`, `beam`, `check` or `units` at the start of the line.', head, 'syntax.statement');
}

function parseSectionHeader(cur: TokenCursor, text: string, column: number): Extract<Statement, { kind: 'section' }> {
  const kw = cur.next();
  const name = cur.expectName('a name for the section');
  checkTarget(cur, name, 'a section');
  let title = '';
  if (cur.isOp(':')) cur.next();
  // The title is free text: take it from the raw line, not from tokens.
  const after = text.slice(name.end - column);
  const m = /^\s*:\s*(.*?)\s*(#.*)?$/.exec(after);
  if (m) title = m[1] ?? '';
  else if (!/^\s*(#.*)?$/.test(after)) cur.fail('Write `section NAME` or `section NAME: title`.', cur.peek(), 'syntax.header');
  return { kind: 'section', line: cur.line, start: kw.start, end: column + text.replace(/\s*(#.*)?$/, '').length, target: nameRef(name), title, parts: [] };
}

const DIM_NAMES: Record<string, string[]> = {
  plate: ['b', 'h'],
  circle: ['d'],
  tube: ['d', 't'],
  box: ['b', 'h', 't'],
  isection: ['d', 'bf', 'tf', 'tw'],
  tee: ['d', 'bf', 'tf', 'tw'],
  channel: ['d', 'bf', 'tf', 'tw'],
  angle: ['d', 'b', 't'],
};

const STOP_AT = new Set(['at']);
const STOP_X_AT = new Set(['x', 'at']);

/** Reads a part line: `[hole] plate B x H [at X, Y]`, `circle D`, `tube D, T`, `isection d=… bf=…`, `polygon (X, Y) …`. */
function parsePart(cur: TokenCursor): PartStatement {
  const first = cur.peek();
  let hole = false;
  if (cur.isWord('hole')) {
    hole = true;
    cur.next();
  }
  const shapeTok = cur.expectName('a part shape (plate, circle, tube, box, isection, tee, channel, angle, polygon)');
  const shape = shapeTok.text as PartShape;
  if (!PART_SHAPES.includes(shape)) {
    cur.fail(`"${shapeTok.text}" is not a part shape. Use plate, circle, tube, box, isection, tee, channel, angle or polygon.`, shapeTok, 'part.shape');
  }
  const part: PartStatement = { line: cur.line, start: first.start, end: first.end, hole, shape, dims: {} };
  if (shape === 'polygon') {
    part.points = [];
    while (cur.isOp('(')) {
      cur.next();
      const x = cur.expression();
      cur.expectOp(',', 'between the x and y of a point');
      const y = cur.expression();
      cur.expectOp(')', 'to close the point');
      part.points.push([x, y]);
      if (cur.isOp(',')) cur.next();
    }
    if (part.points.length === 0) cur.fail('A polygon lists its corners as (x, y) pairs, e.g. `polygon (0, 0) (100, 0) (50, 80) mm`.', cur.peek(), 'part.polygon');
    if (cur.peek().kind === 'name' && !cur.isWord('at')) part.pointsUnit = cur.unitExpression();
  } else {
    const names = DIM_NAMES[shape]!;
    if (cur.peek().kind === 'name' && cur.isOp('=', 1)) {
      // Named dimensions: d=300 mm bf=150 mm ...
      while (cur.peek().kind === 'name' && cur.isOp('=', 1)) {
        const key = cur.next();
        cur.next();
        if (!names.includes(key.text)) cur.fail(`A ${shape} takes ${names.join(', ')}; "${key.text}" is not one of them.`, key, 'part.dimension');
        if (part.dims[key.text]) cur.fail(`"${key.text}" is given twice.`, key, 'part.dimension');
        part.dims[key.text] = cur.expression(stopBeforeKey(names));
        if (cur.isOp(',')) cur.next();
      }
      const missing = names.filter((n) => !part.dims[n]);
      if (missing.length) cur.fail(`This ${shape} needs ${missing.map((m) => `${m}=…`).join(' ')}.`, cur.peek(), 'part.dimension');
    } else if (shape === 'plate') {
      part.dims.b = cur.expression(STOP_X_AT);
      if (!cur.isWord('x')) cur.fail('Write a plate as `plate WIDTH x HEIGHT`, e.g. `plate 250 mm x 16 mm`.', cur.peek(), 'part.dimension');
      cur.next();
      part.dims.h = cur.expression(STOP_AT);
    } else {
      names.forEach((n, k) => {
        if (k > 0) cur.expectOp(',', `before the ${describeDim(shape, n)}`);
        part.dims[n] = cur.expression(STOP_AT);
      });
    }
    if (cur.isWord('at')) {
      cur.next();
      const x = cur.expression();
      cur.expectOp(',', 'between the x and y of `at`');
      const y = cur.expression();
      part.at = [x, y];
    }
  }
  if (shape === 'polygon' && cur.isWord('at')) cur.fail('A polygon is written in absolute coordinates and takes no `at`.', cur.peek(), 'part.polygon');
  cur.expectEnd(`after the ${shape}`);
  part.end = cur.tokens[Math.max(0, cur.pos - 1)]!.end;
  return part;
}

function stopBeforeKey(names: string[]): ReadonlySet<string> {
  return new Set([...names, 'at']);
}

function describeDim(shape: PartShape, n: string): string {
  const words: Record<string, string> = { b: 'width', h: 'height', d: shape === 'angle' ? 'leg depth' : 'diameter', t: 'wall thickness' };
  return words[n] ?? n;
}

function parseBeamHeader(cur: TokenCursor): Extract<Statement, { kind: 'beam' }> {
  const kw = cur.next();
  const name = cur.expectName('a name for the beam');
  checkTarget(cur, name, 'a beam');
  cur.expectOp(':', 'after the beam name (write `beam NAME: SPAN`)');
  const span = cur.expression();
  cur.expectEnd('after the span');
  return { kind: 'beam', line: cur.line, start: kw.start, end: span.end, target: nameRef(name), span, items: [] };
}

const STOP_AT_FROM = new Set(['at', 'from']);
const STOP_TO = new Set(['to']);
const STOP_TO_FROM = new Set(['to', 'from']);

/** Reads a beam line: `pin at X`, `[GROUP:] point P at X`, `udl W [from X1 to X2]`, `ramp W1 to W2 [from X1 to X2]`, `moment M at X`, `combine NAME = 1.2 dead + 1.6 live`. */
function parseBeamItem(cur: TokenCursor): BeamItem {
  const first = cur.peek();
  const line = cur.line;
  if (first.kind === 'name' && (first.text === 'pin' || first.text === 'roller' || first.text === 'fixed')) {
    cur.next();
    if (!cur.isWord('at')) cur.fail(`Write \`${first.text} at X\`.`, cur.peek(), 'beam.syntax');
    cur.next();
    const x = cur.expression();
    cur.expectEnd('after the support');
    return { kind: 'support', line, start: first.start, end: x.end, support: first.text, x };
  }
  if (first.kind === 'name' && first.text === 'combine') {
    cur.next();
    const name = cur.expectName('a name for the combination');
    checkTarget(cur, name, 'a combination');
    cur.expectOp('=', 'after the combination name');
    const terms: { factor?: Expr; group: NameRef }[] = [];
    for (;;) {
      let factor: Expr | undefined;
      if (!(cur.peek().kind === 'name' && (cur.isOp('+', 1) || cur.peek(1).kind === 'end'))) {
        factor = cur.expression(GROUP_STOP(cur));
        if (cur.isOp('*')) cur.next();
      }
      const g = cur.expectName('a load group name');
      terms.push({ factor, group: nameRef(g) });
      if (cur.isOp('+')) {
        cur.next();
        continue;
      }
      break;
    }
    cur.expectEnd('after the combination');
    return { kind: 'combine', line, start: first.start, end: cur.tokens[cur.pos - 1]!.end, name: nameRef(name), terms };
  }
  let group: NameRef | undefined;
  if (first.kind === 'name' && cur.isOp(':', 1)) {
    group = nameRef(first);
    cur.next();
    cur.next();
  }
  const kw = cur.expectName('a support (pin, roller, fixed), a load (point, udl, ramp, moment) or `combine`');
  const values: Record<string, Expr> = {};
  switch (kw.text) {
    case 'point':
    case 'moment': {
      values[kw.text === 'point' ? 'P' : 'M'] = cur.expression(STOP_AT);
      if (!cur.isWord('at')) cur.fail(`Write \`${kw.text} VALUE at X\`.`, cur.peek(), 'beam.syntax');
      cur.next();
      values.x = cur.expression();
      break;
    }
    case 'udl':
      values.w = cur.expression(STOP_AT_FROM);
      break;
    case 'ramp':
      values.w1 = cur.expression(STOP_TO);
      if (!cur.isWord('to')) cur.fail('Write `ramp W1 to W2`, e.g. `ramp 0 kN/m to 12 kN/m`.', cur.peek(), 'beam.syntax');
      cur.next();
      values.w2 = cur.expression(STOP_AT_FROM);
      break;
    default:
      cur.fail(`"${kw.text}" is not a support or load. Use pin, roller, fixed, point, udl, ramp, moment or combine.`, kw, 'beam.syntax');
  }
  if ((kw.text === 'udl' || kw.text === 'ramp') && cur.isWord('from')) {
    cur.next();
    values.x1 = cur.expression(STOP_TO);
    if (!cur.isWord('to')) cur.fail('Write `from X1 to X2`.', cur.peek(), 'beam.syntax');
    cur.next();
    values.x2 = cur.expression();
  }
  cur.expectEnd(`after the ${kw.text} load`);
  const lastEnd = cur.tokens[Math.max(0, cur.pos - 1)]!.end;
  return { kind: 'load', line, start: first.start, end: lastEnd, load: kw.text as LoadKind, group, values };
}

/** In `1.2 dead + 1.6 live` a factor ends where the group name begins. */
function GROUP_STOP(cur: TokenCursor): ReadonlySet<string> {
  const s = new Set<string>();
  for (let k = cur.pos; k < cur.tokens.length; k++) {
    const t = cur.tokens[k]!;
    const nx = cur.tokens[k + 1];
    if (t.kind === 'name' && nx && (nx.kind === 'end' || (nx.kind === 'op' && nx.text === '+'))) s.add(t.text);
  }
  return s;
}

export type { UnitTerm };
