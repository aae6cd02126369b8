/**
 * Turns a `section` statement into a cross-section: evaluates each part's dimensions, places it
 * (`at X, Y` = centre-x, bottom-y; without `at`, centred on x = 0 and stacked on the parts before),
 * and hands the parts to the section engine. A bad part is a diagnostic on its own line.
 */
import { type Diagnostic, NoteError } from './diagnostic';
import { type EvalContext, evaluate, unitFromTerms } from './evaluate';
import type { Expr } from './expression';
import * as shapes from './section';
import { buildSection } from './section';
import type { PartStatement, Statement } from './statements';
import { DIM, describeDimension, isDimensionless, sameDimension } from './units';
import type { SectionValue } from './values';

type Part = shapes.Part;

export function evaluateSectionStatement(st: Extract<Statement, { kind: 'section' }>, ctx: EvalContext): { value?: SectionValue; diagnostics: Diagnostic[] } {
  const diagnostics: Diagnostic[] = [];
  const built: { part: Part; hole: boolean; tag: PartStatement }[] = [];
  let stackTop: number | undefined;
  let xMin = 0;
  let xMax = 0;
  let yMin = 0;
  const fail = (e: unknown, p: PartStatement) => {
    if (e instanceof NoteError && e.span) diagnostics.push({ code: e.code, severity: 'error', message: e.message, line: e.span.line, column: e.span.start, endColumn: e.span.end });
    else diagnostics.push({ code: 'internal', severity: 'error', message: e instanceof Error ? e.message : String(e), line: p.line, column: p.start, endColumn: p.end });
  };
  if (st.parts.length === 0) {
    diagnostics.push({ code: 'section.empty', severity: 'error', message: `The section ${st.target.name} has no parts: indent plate, circle, tube, box, isection, tee, channel, angle or polygon lines under it.`, line: st.line, column: st.target.start, endColumn: st.target.end });
    return { diagnostics };
  }
  for (const p of st.parts) {
    const pctx: EvalContext = { ...ctx, line: p.line };
    try {
      const made = makePart(p, pctx);
      let part = made;
      const b = shapes.bounds(part);
      if (p.shape !== 'polygon') {
        if (p.at) {
          const x = length(p.at[0], pctx, 'x of `at`', true);
          const y = length(p.at[1], pctx, 'y of `at`', true);
          // Circles and tubes are placed by their centre; every other part by centre-x, bottom-y.
          const lift = p.shape === 'circle' || p.shape === 'tube' ? (b.maxY - b.minY) / 2 : 0;
          part = shapes.translate(part, x, y - lift);
        } else if (p.hole) {
          // A hole without `at` sits in the middle of the material placed so far.
          const cx = (xMin + xMax) / 2;
          const cy = stackTop === undefined ? 0 : (yMin + stackTop) / 2 - (b.maxY - b.minY) / 2;
          part = shapes.translate(part, cx, cy);
        } else {
          part = shapes.translate(part, 0, stackTop ?? 0);
        }
      }
      const nb = shapes.bounds(part);
      if (!p.hole) {
        if (stackTop === undefined) {
          stackTop = nb.maxY;
          xMin = nb.minX;
          xMax = nb.maxX;
          yMin = nb.minY;
        } else {
          stackTop = Math.max(stackTop, nb.maxY);
          xMin = Math.min(xMin, nb.minX);
          xMax = Math.max(xMax, nb.maxX);
          yMin = Math.min(yMin, nb.minY);
        }
      }
      built.push({ part, hole: p.hole, tag: p });
    } catch (e) {
      fail(e, p);
    }
  }
  if (built.length !== st.parts.length) {
    diagnostics.push({ code: 'section.incomplete', severity: 'error', message: `The section ${st.target.name} is not built because one of its parts has an error.`, line: st.line, column: st.target.start, endColumn: st.target.end });
    return { diagnostics };
  }
  const out = buildSection(built.map((b) => ({ part: b.part, hole: b.hole, tag: b.tag })));
  for (const problem of out.problems) {
    const p = problem.tag as PartStatement | undefined;
    diagnostics.push(p
      ? { code: problem.code, severity: problem.severity, message: problem.message, line: p.line, column: p.start, endColumn: p.end }
      : { code: problem.code, severity: problem.severity, message: `${st.target.name}: ${problem.message}`, line: st.line, column: st.target.start, endColumn: st.target.end });
  }
  if (!out.section || out.problems.some((p) => p.severity === 'error')) return { diagnostics };
  const s = out.section;
  // Parts of wildly different sizes or far-apart positions can exhaust the floats the properties are computed in.
  if (![s.area, s.I, s.Iy, s.Ixy, s.centroidX, s.centroidY, s.depth].every(Number.isFinite)) {
    diagnostics.push({ code: 'section.not-finite', severity: 'error', message: `The properties of ${st.target.name} cannot be computed: its parts' sizes or positions span too wide a range. Check the dimensions and \`at\` positions.`, line: st.line, column: st.target.start, endColumn: st.target.end });
    return { diagnostics };
  }
  return { value: { kind: 'section', name: st.target.name, title: st.title, section: out.section }, diagnostics };
}

function length(e: Expr, ctx: EvalContext, what: string, allowNegative = false): number {
  const v = evaluate(e, ctx);
  if (v.kind !== 'quantity') throw new NoteError('type.quantity', `The ${what} must be a length.`, { line: ctx.line, start: e.start, end: e.end });
  if (isDimensionless(v.dim)) {
    throw new NoteError('unit.missing', `The ${what} needs a unit, e.g. ${v.si} mm.`, { line: ctx.line, start: e.start, end: e.end });
  }
  if (!sameDimension(v.dim, DIM.length)) {
    throw new NoteError('unit.argument', `The ${what} must be a length, but ${describeDimension(v.dim, ctx.system)} was given.`, { line: ctx.line, start: e.start, end: e.end });
  }
  if (!allowNegative && !(v.si > 0)) throw new NoteError('part.dimension', `The ${what} must be greater than zero.`, { line: ctx.line, start: e.start, end: e.end });
  return v.si;
}

const DIM_WORDS: Record<string, string> = { b: 'width', h: 'height', d: 'depth', t: 'thickness', bf: 'flange width bf', tf: 'flange thickness tf', tw: 'web thickness tw' };

function makePart(p: PartStatement, ctx: EvalContext): Part {
  const dim = (k: string) => length(p.dims[k]!, ctx, p.shape === 'circle' || p.shape === 'tube' ? (k === 'd' ? 'diameter' : 'wall thickness') : DIM_WORDS[k] ?? k);
  let made: { part?: Part; problems: { code: string; message: string }[] };
  switch (p.shape) {
    case 'plate':
      made = shapes.plate(dim('b'), dim('h'));
      break;
    case 'circle':
      made = shapes.circle(dim('d'));
      break;
    case 'tube':
      made = shapes.tube(dim('d'), dim('t'));
      break;
    case 'box':
      made = shapes.box(dim('b'), dim('h'), dim('t'));
      break;
    case 'isection':
      made = shapes.isection({ d: dim('d'), bf: dim('bf'), tf: dim('tf'), tw: dim('tw') });
      break;
    case 'tee':
      made = shapes.tee({ d: dim('d'), bf: dim('bf'), tf: dim('tf'), tw: dim('tw') });
      break;
    case 'channel':
      made = shapes.channel({ d: dim('d'), bf: dim('bf'), tf: dim('tf'), tw: dim('tw') });
      break;
    case 'angle':
      made = shapes.angle({ d: dim('d'), b: dim('b'), t: dim('t') });
      break;
    case 'polygon': {
      const unit = p.pointsUnit ? unitFromTerms(p.pointsUnit, ctx) : undefined;
      if (unit && !sameDimension(unit.dim, DIM.length)) {
        throw new NoteError('unit.argument', `The unit after the points must be a length, not ${describeDimension(unit.dim, ctx.system)}.`, { line: ctx.line, start: p.pointsUnit![0]!.start, end: p.pointsUnit![p.pointsUnit!.length - 1]!.end });
      }
      const coord = (e: Expr, what: string): number => {
        const v = evaluate(e, ctx);
        if (v.kind === 'quantity' && isDimensionless(v.dim) && unit) return v.si * unit.factor;
        return length(e, ctx, what, true);
      };
      made = shapes.polygon(p.points!.map(([x, y], i) => [coord(x, `x of point ${i + 1}`), coord(y, `y of point ${i + 1}`)] as [number, number]));
      break;
    }
  }
  if (!made.part || made.problems.length) {
    const pr = made.problems[0] ?? { code: 'part.invalid', message: 'This part cannot be built.' };
    throw new NoteError(pr.code, pr.message, { line: p.line, start: p.start, end: p.end });
  }
  return made.part;
}
