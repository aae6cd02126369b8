/**
 * Evaluates expressions over quantities with dimensions, in SI floats. Names resolve to the note's
 * own definitions first, then to units. Functions are a fixed table; members a fixed list per kind.
 * Unit errors are worded for an engineer: "cannot add a force (kN) to a length (mm)".
 */
import { NoteError, type Span } from './diagnostic';
import type { Expr, UnitTerm } from './expression';
import { formatNumber } from './format';
import {
  DIM,
  DIMENSIONLESS,
  describeDimension,
  type Dimension,
  type DisplayUnit,
  isDimensionless,
  lookupUnit,
  mulDim,
  powDim,
  sameDimension,
  superscript,
  type UnitSystem,
} from './units';
import { type BeamValue, quantity, type Quantity, type SectionValue, type Value } from './values';

export interface Binding {
  value: Value;
  /** Where the name is defined: 0-based Markdown line and columns of the name. */
  line: number;
  start: number;
  end: number;
  blockIndex: number;
}

export interface EvalContext {
  lookup(name: string): Binding | undefined;
  line: number;
  system: UnitSystem;
  /** Values of the sub-expressions worth showing (names, members, calls), for hovers and substituted formulas. */
  trace?: Map<Expr, Value>;
  /** Names read from the scope, with the binding seen. */
  reads?: Map<string, Binding>;
}

/** Raised when a name's own definition failed; reported once, at the definition, not at every use. */
export const UNAVAILABLE = 'name.unavailable';

export const CONSTANTS: Record<string, number> = { pi: Math.PI };

export interface FunctionInfo {
  signature: string;
  doc: string;
}

/** The functions a note can call, for completion and signature help. */
export const FUNCTIONS: Record<string, FunctionInfo> = {
  tau: { signature: 'tau(section, V, y)', doc: 'Shear stress V·Q/(I·t) at height y above the lowest point; at a width jump, the narrower (governing) side.' },
  tau_max: { signature: 'tau_max(section, V)', doc: 'Largest shear stress over the depth (found exactly, not by sampling).' },
  tau_max_at: { signature: 'tau_max_at(section)', doc: 'Height above the lowest point where the shear stress is largest.' },
  flow: { signature: 'flow(section, V, y)', doc: 'Shear flow q = V·Q/I across the horizontal cut at height y.' },
  Q: { signature: 'Q(section, y)', doc: 'First moment of the area above height y about the neutral axis.' },
  width: { signature: 'width(section, y)', doc: 'Material width t at height y (all webs; holes removed); at a jump, the narrower side.' },
  shear: { signature: 'shear(beam, x[, left | right])', doc: 'Shear force V at x; at a jump, the side named, else the larger magnitude.' },
  moment: { signature: 'moment(beam, x)', doc: 'Bending moment M at x (sagging positive).' },
  reaction: { signature: 'reaction(beam, x)', doc: 'Support reaction at x (upward positive).' },
  sqrt: { signature: 'sqrt(value)', doc: 'Square root.' },
  abs: { signature: 'abs(value)', doc: 'Magnitude.' },
  min: { signature: 'min(a, b, …)', doc: 'Smallest of values of one kind.' },
  max: { signature: 'max(a, b, …)', doc: 'Largest of values of one kind.' },
};

export const SECTION_MEMBERS: Record<string, string> = {
  A: 'area',
  I: 'second moment of area about the horizontal centroidal axis',
  Iy: 'second moment of area about the vertical centroidal axis',
  Ixy: 'product of area about the centroidal axes',
  yc: 'height of the centroid (neutral axis) above the lowest point',
  xc: 'horizontal position of the centroid',
  depth: 'overall depth',
};

export const BEAM_MEMBERS: Record<string, string> = {
  Vmax: 'largest shear force magnitude',
  Mmax: 'largest sagging moment',
  Mmin: 'largest hogging moment (most negative)',
  span: 'span length',
};

function spanOf(e: { start: number; end: number }, ctx: EvalContext): Span {
  return { line: ctx.line, start: e.start, end: Math.max(e.end, e.start + 1) };
}

export function unitFromTerms(terms: UnitTerm[], ctx: EvalContext): { factor: number; dim: Dimension; text: string } {
  let factor = 1;
  let dim: Dimension = DIMENSIONLESS;
  const num: string[] = [];
  const den: string[] = [];
  for (const t of terms) {
    const def = lookupUnit(t.name);
    if (!def) {
      throw new NoteError('unit.unknown', `"${t.name}" is not a unit this tool knows.${unitHint(t.name)}`, { line: ctx.line, start: t.start, end: t.end });
    }
    factor *= def.factor ** t.power;
    dim = mulDim(dim, powDim(def.dim, t.power));
    const p = Math.abs(t.power);
    (t.power > 0 ? num : den).push(p === 1 ? t.name : `${t.name}${superscript(p)}`);
  }
  const text = (num.length ? num.join('·') : '1') + (den.length ? '/' + den.join('/') : '');
  return { factor, dim, text };
}

function unitHint(name: string): string {
  const hints: Record<string, string> = { KN: ' Did you mean kN?', kn: ' Did you mean kN?', Mpa: ' Did you mean MPa?', mpa: ' Did you mean MPa?', MM: ' Did you mean mm?', Kip: ' Did you mean kip?', KSI: ' Did you mean ksi?' };
  // Own keys only: a note may write `1 __proto__` or `1 constructor`.
  return Object.prototype.hasOwnProperty.call(hints, name) ? hints[name]! : '';
}

function asQuantity(v: Value, e: Expr, ctx: EvalContext, what: string): Quantity {
  if (v.kind === 'quantity') return v;
  throw new NoteError('type.quantity', `${what} must be a quantity, but ${describeValue(v)} was given.`, spanOf(e, ctx));
}

export function describeValue(v: Value): string {
  switch (v.kind) {
    case 'quantity':
      return describeDimension(v.dim);
    case 'section':
      return `the section ${v.name}`;
    case 'beam':
      return `the beam ${v.name}`;
    case 'side':
      return `the word ${v.side}`;
    case 'unavailable':
      return `${v.name} (which has an error)`;
  }
}

function finite(si: number, e: Expr, ctx: EvalContext): number {
  if (!Number.isFinite(si)) {
    throw new NoteError('value.not-finite', Number.isNaN(si) ? 'This has no numeric value (for example 0/0 or the root of a negative number).' : 'This value is too large to represent (a division by zero or an overflow).', spanOf(e, ctx));
  }
  return si;
}

function record(ctx: EvalContext, e: Expr, v: Value): Value {
  ctx.trace?.set(e, v);
  return v;
}

export function evaluate(e: Expr, ctx: EvalContext): Value {
  switch (e.kind) {
    case 'number': {
      if (!e.unit) return quantity(e.value, DIMENSIONLESS);
      const u = unitFromTerms(e.unit, ctx);
      return record(ctx, e, quantity(finite(e.value * u.factor, e, ctx), u.dim, { text: u.text, factor: u.factor }));
    }
    case 'name':
      return record(ctx, e, resolveName(e.name, e, ctx));
    case 'paren':
      return evaluate(e.inner, ctx);
    case 'unary': {
      const v = asQuantity(evaluate(e.operand, ctx), e.operand, ctx, 'The value after a sign');
      return e.op === '-' ? quantity(-v.si, v.dim, v.shown) : v;
    }
    case 'binary':
      return binary(e, ctx);
    case 'convert': {
      const v = asQuantity(evaluate(e.value, ctx), e.value, ctx, 'The value converted with `to`');
      const u = unitFromTerms(e.unit, ctx);
      if (!sameDimension(v.dim, u.dim)) {
        throw new NoteError('unit.mismatch', `Cannot show ${describeDimension(v.dim, ctx.system)} in ${u.text}, which measures ${describeDimension(u.dim, ctx.system)}.`, { line: ctx.line, start: e.unitStart, end: e.end });
      }
      return quantity(v.si, v.dim, { text: u.text, factor: u.factor });
    }
    case 'member':
      return record(ctx, e, finiteValue(member(e, ctx), e, ctx));
    case 'call':
      return record(ctx, e, finiteValue(call(e, ctx), e, ctx));
  }
}

/** Members and calls read the engines' numbers: one that is not finite becomes a diagnostic here, never a result. */
function finiteValue(v: Value, e: Expr, ctx: EvalContext): Value {
  if (v.kind === 'quantity') finite(v.si, e, ctx);
  return v;
}

function resolveName(name: string, e: Expr, ctx: EvalContext): Value {
  const b = ctx.lookup(name);
  if (b) {
    ctx.reads?.set(name, b);
    if (b.value.kind === 'unavailable') throw new NoteError(UNAVAILABLE, `${name} has an error on its own line.`, spanOf(e, ctx));
    return b.value;
  }
  if (name === 'left' || name === 'right') return { kind: 'side', side: name };
  if (Object.prototype.hasOwnProperty.call(CONSTANTS, name)) return quantity(CONSTANTS[name]!, DIMENSIONLESS);
  const unit = lookupUnit(name);
  if (unit) return quantity(unit.factor, unit.dim, { text: name, factor: unit.factor });
  if (Object.prototype.hasOwnProperty.call(FUNCTIONS, name)) {
    throw new NoteError('name.function', `${name} is a function: write ${FUNCTIONS[name]!.signature}.`, spanOf(e, ctx));
  }
  throw new NoteError('name.undefined', `"${name}" is not defined above this line (in this block or an earlier one), and it is not a unit.`, spanOf(e, ctx));
}

function binary(e: Extract<Expr, { kind: 'binary' }>, ctx: EvalContext): Value {
  const l = asQuantity(evaluate(e.left, ctx), e.left, ctx, `The left side of "${e.op}"`);
  const r = asQuantity(evaluate(e.right, ctx), e.right, ctx, `The right side of "${e.op}"`);
  switch (e.op) {
    case '+':
    case '-': {
      if (!sameDimension(l.dim, r.dim)) {
        const verb = e.op === '+' ? 'add' : 'subtract';
        const prep = e.op === '+' ? 'to' : 'from';
        const [a, b] = e.op === '+' ? [r, l] : [r, l];
        throw new NoteError('unit.mismatch', `Cannot ${verb} ${describeDimension(a.dim, ctx.system)} ${prep} ${describeDimension(b.dim, ctx.system)}.`, spanOf(e, ctx));
      }
      return quantity(finite(e.op === '+' ? l.si + r.si : l.si - r.si, e, ctx), l.dim);
    }
    case '*':
      return quantity(finite(l.si * r.si, e, ctx), mulDim(l.dim, r.dim));
    case '/':
      if (r.si === 0) throw new NoteError('value.division-by-zero', 'Division by zero.', spanOf(e.right, ctx));
      return quantity(finite(l.si / r.si, e, ctx), mulDim(l.dim, r.dim, -1));
    case '^': {
      if (!isDimensionless(r.dim)) throw new NoteError('unit.exponent', `A power must be a plain number, not ${describeDimension(r.dim, ctx.system)}.`, spanOf(e.right, ctx));
      if (!isDimensionless(l.dim) && (!Number.isInteger(r.si * 2) || Math.abs(r.si) > 12)) {
        throw new NoteError('unit.exponent', 'A quantity with a unit can only be raised to a whole or half power up to 12.', spanOf(e.right, ctx));
      }
      return quantity(finite(l.si ** r.si, e, ctx), powDim(l.dim, r.si));
    }
  }
}

function member(e: Extract<Expr, { kind: 'member' }>, ctx: EvalContext): Value {
  const obj = evaluate(e.object, ctx);
  const at: Span = { line: ctx.line, start: e.memberStart, end: e.end };
  if (obj.kind === 'section') {
    const s = obj.section;
    switch (e.member) {
      case 'A':
        return quantity(s.area, DIM.area);
      case 'I':
        return quantity(s.I, DIM.quartic);
      case 'Iy':
        return quantity(s.Iy, DIM.quartic);
      case 'Ixy':
        return quantity(s.Ixy, DIM.quartic);
      case 'yc':
        return quantity(s.centroidY, DIM.length);
      case 'xc':
        return quantity(s.centroidX, DIM.length);
      case 'depth':
        return quantity(s.depth, DIM.length);
    }
    throw new NoteError('member.unknown', `A section has ${Object.keys(SECTION_MEMBERS).join(', ')}; "${e.member}" is not one of them.`, at);
  }
  if (obj.kind === 'beam') {
    const view = beamView(obj);
    switch (e.member) {
      case 'Vmax':
        return quantity(view.Vmax, DIM.force);
      case 'Mmax':
        return quantity(view.Mmax, DIM.moment);
      case 'Mmin':
        return quantity(view.Mmin, DIM.moment);
      case 'span':
        return quantity(obj.beam.span, DIM.length);
    }
    if (!obj.combination && (obj.beam.combinationNames.includes(e.member) || obj.beam.groupNames.includes(e.member))) {
      return { kind: 'beam', name: `${obj.name}.${e.member}`, beam: obj.beam, combination: e.member };
    }
    const combos = [...obj.beam.combinationNames, ...obj.beam.groupNames];
    throw new NoteError('member.unknown', `A beam has ${Object.keys(BEAM_MEMBERS).join(', ')}${combos.length && !obj.combination ? ` and its load groups and combinations ${combos.join(', ')}` : ''}; "${e.member}" is not one of them.`, at);
  }
  throw new NoteError('member.unknown', `Only sections and beams have members; ${describeValue(obj)} has none.`, at);
}

/** What a beam value answers: the envelope, or one combination. */
export function beamView(b: BeamValue): { Vmax: number; Mmax: number; Mmin: number } {
  return b.beam.summary(b.combination);
}

function call(e: Extract<Expr, { kind: 'call' }>, ctx: EvalContext): Value {
  const info = FUNCTIONS[e.callee];
  if (!info || !Object.prototype.hasOwnProperty.call(FUNCTIONS, e.callee)) {
    throw new NoteError('name.function-unknown', `There is no function "${e.callee}". Functions: ${Object.keys(FUNCTIONS).join(', ')}.`, { line: ctx.line, start: e.start, end: e.calleeEnd });
  }
  const args = e.args.map((a) => evaluate(a, ctx));
  const arity = (n: number, m = n) => {
    if (args.length < n || args.length > m) {
      throw new NoteError('call.arguments', `${e.callee} takes ${n === m ? n : `${n} to ${m}`} argument${m === 1 ? '' : 's'}: ${info.signature}.`, spanOf(e, ctx));
    }
  };
  const sectionArg = (i: number): SectionValue => {
    const v = args[i]!;
    if (v.kind !== 'section') throw new NoteError('type.section', `The ${ordinal(i)} argument of ${e.callee} must be a section, but ${describeValue(v)} was given.`, spanOf(e.args[i]!, ctx));
    return v;
  };
  const beamArg = (i: number): BeamValue => {
    const v = args[i]!;
    if (v.kind !== 'beam') throw new NoteError('type.beam', `The ${ordinal(i)} argument of ${e.callee} must be a beam, but ${describeValue(v)} was given.`, spanOf(e.args[i]!, ctx));
    return v;
  };
  const q = (i: number, dim: Dimension, what: string): number => {
    const v = args[i]!;
    if (v.kind !== 'quantity' || !sameDimension(v.dim, dim)) {
      throw new NoteError('unit.argument', `The ${what} in ${e.callee} must be ${describeDimension(dim, ctx.system)}, but ${describeValue(v)} was given.`, spanOf(e.args[i]!, ctx));
    }
    return v.si;
  };
  const height = (s: SectionValue, i: number): number => {
    const y = q(i, DIM.length, 'height y');
    const problem = s.section.heightProblem(y);
    if (problem) throw new NoteError(problem.code, problem.message, spanOf(e.args[i]!, ctx));
    return y;
  };
  const position = (b: BeamValue, i: number): number => {
    const x = q(i, DIM.length, 'position x');
    if (x < -1e-12 || x > b.beam.span * (1 + 1e-12)) {
      throw new NoteError('beam.outside', `x = ${formatNumber(x)} m is outside the beam ${b.name} (0 to ${formatNumber(b.beam.span)} m).`, spanOf(e.args[i]!, ctx));
    }
    return Math.min(Math.max(x, 0), b.beam.span);
  };
  switch (e.callee) {
    case 'tau': {
      arity(3);
      const s = sectionArg(0);
      const V = q(1, DIM.force, 'shear force V');
      const y = height(s, 2);
      return quantity(reading(s.section.tau(V, y), e, ctx), DIM.stress);
    }
    case 'tau_max': {
      arity(2);
      const s = sectionArg(0);
      const m = s.section.tauMax(q(1, DIM.force, 'shear force V'));
      return quantity(reading(m, e, ctx), DIM.stress);
    }
    case 'tau_max_at': {
      arity(1);
      const m = sectionArg(0).section.tauMax(1);
      reading(m, e, ctx);
      return quantity(m.locations[0]?.y ?? 0, DIM.length);
    }
    case 'flow': {
      arity(3);
      const s = sectionArg(0);
      const V = q(1, DIM.force, 'shear force V');
      return quantity(reading(s.section.shearFlow(V, height(s, 2)), e, ctx), DIM.lineLoad);
    }
    case 'Q': {
      arity(2);
      const s = sectionArg(0);
      return quantity(reading(s.section.firstMoment(height(s, 1)), e, ctx), DIM.volume);
    }
    case 'width': {
      arity(2);
      const s = sectionArg(0);
      const w = s.section.widthAt(height(s, 1));
      if (w.problem) throw new NoteError(w.problem.code, w.problem.message, spanOf(e, ctx));
      const positive = [w.below, w.above].filter((x) => x > 0);
      return quantity(positive.length ? Math.min(...positive) : 0, DIM.length);
    }
    case 'shear': {
      arity(2, 3);
      const b = beamArg(0);
      const x = position(b, 1);
      let side: 'left' | 'right' | undefined;
      if (args.length === 3) {
        const s = args[2]!;
        if (s.kind !== 'side') throw new NoteError('call.arguments', 'The third argument of shear is `left` or `right`: the side of x to read at a jump.', spanOf(e.args[2]!, ctx));
        side = s.side;
      }
      return quantity(b.beam.shear(x, side, b.combination), DIM.force);
    }
    case 'moment': {
      arity(2);
      const b = beamArg(0);
      return quantity(b.beam.moment(position(b, 1), b.combination), DIM.moment);
    }
    case 'reaction': {
      arity(2);
      const b = beamArg(0);
      const x = position(b, 1);
      const r = b.beam.reaction(x, b.combination);
      if (r === undefined) throw new NoteError('beam.no-support', `The beam ${b.name} has no support at x = ${formatNumber(x)} m.`, spanOf(e.args[1]!, ctx));
      return quantity(r, DIM.force);
    }
    case 'sqrt': {
      arity(1);
      const v = asQuantity(args[0]!, e.args[0]!, ctx, 'The value under sqrt');
      if (v.si < 0) throw new NoteError('value.negative-root', 'The square root of a negative value has no real result.', spanOf(e.args[0]!, ctx));
      return quantity(Math.sqrt(v.si), powDim(v.dim, 0.5));
    }
    case 'abs': {
      arity(1);
      const v = asQuantity(args[0]!, e.args[0]!, ctx, 'The value in abs');
      return quantity(Math.abs(v.si), v.dim, v.shown);
    }
    case 'min':
    case 'max': {
      if (args.length === 0) arity(1, 100);
      const qs = args.map((a, i) => asQuantity(a, e.args[i]!, ctx, `Each value in ${e.callee}`));
      for (let i = 1; i < qs.length; i++) {
        if (!sameDimension(qs[i]!.dim, qs[0]!.dim)) {
          throw new NoteError('unit.mismatch', `${e.callee} compares values of one kind; ${describeDimension(qs[i]!.dim, ctx.system)} is not ${describeDimension(qs[0]!.dim, ctx.system)}.`, spanOf(e.args[i]!, ctx));
        }
      }
      const pick = qs.reduce((a, b) => ((e.callee === 'min' ? b.si < a.si : b.si > a.si) ? b : a));
      return pick;
    }
  }
  throw new NoteError('name.function-unknown', `There is no function "${e.callee}".`, spanOf(e, ctx));
}

/** The section engine returns a problem instead of a number where none exists (no material at y). */
function reading(r: { value: number; problem?: { code: string; message: string } }, e: Expr, ctx: EvalContext): number {
  if (r.problem) throw new NoteError(r.problem.code, r.problem.message, spanOf(e, ctx));
  return finite(r.value, e, ctx);
}

function ordinal(i: number): string {
  return ['first', 'second', 'third', 'fourth'][i] ?? `${i + 1}th`;
}

export function displayUnitText(u: DisplayUnit | undefined): string {
  return u?.text ?? '';
}
