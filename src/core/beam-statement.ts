/**
 * Turns a `beam` statement into a solved beam: evaluates the span, supports, loads (with their load
 * groups) and combinations in SI, hands them to the beam solver, and puts every problem on the line
 * of the support, load or combination at fault.
 */
import { ALL_LOADS_COMBINATION, type BeamInput, type BeamLoad, type BeamResult, type Side, solveBeam } from './beam';
import { type Diagnostic, NoteError, type Span } from './diagnostic';
import { type EvalContext, evaluate } from './evaluate';
import type { Expr } from './expression';
import type { BeamItem, Statement } from './statements';
import { DIM, type Dimension, describeDimension, isDimensionless, sameDimension } from './units';
import type { BeamModel, BeamValue } from './values';

interface Where {
  line: number;
  start: number;
  end: number;
}

export function evaluateBeamStatement(st: Extract<Statement, { kind: 'beam' }>, ctx: EvalContext): { value?: BeamValue; diagnostics: Diagnostic[] } {
  const diagnostics: Diagnostic[] = [];
  const push = (e: unknown, w: Where) => {
    if (e instanceof NoteError && e.span) diagnostics.push({ code: e.code, severity: 'error', message: e.message, line: e.span.line, column: e.span.start, endColumn: e.span.end });
    else diagnostics.push({ code: 'internal', severity: 'error', message: e instanceof Error ? e.message : String(e), line: w.line, column: w.start, endColumn: w.end });
  };
  const header: Where = { line: st.line, start: st.target.start, end: st.target.end };
  let span: number;
  try {
    span = measure(st.span, ctx, DIM.length, 'span');
  } catch (e) {
    push(e, header);
    return { diagnostics };
  }
  const input: BeamInput<Where> = { span, supports: [], loads: [], combinations: [] };
  let broken = false;
  for (const item of st.items) {
    const ictx: EvalContext = { ...ctx, line: item.line };
    const where: Where = { line: item.line, start: item.start, end: item.end };
    try {
      addItem(item, ictx, input, where);
    } catch (e) {
      broken = true;
      push(e, where);
    }
  }
  if (broken) {
    diagnostics.push({ code: 'beam.incomplete', severity: 'error', message: `The beam ${st.target.name} is not solved because one of its lines has an error.`, ...col(header) });
    return { diagnostics };
  }
  if (input.combinations!.length === 0) delete input.combinations;
  const solved = solveBeam(input);
  for (const p of solved.problems) {
    const w = p.tag ?? header;
    diagnostics.push({ code: p.code, severity: p.severity, message: p.message, ...col(w) });
  }
  if (!solved.beam) return { diagnostics };
  return { value: { kind: 'beam', name: st.target.name, beam: beamModel(solved.beam, st.items, input.loads) }, diagnostics };
}

function col(w: Where) {
  return { line: w.line, column: w.start, endColumn: w.end };
}

function measure(e: Expr, ctx: EvalContext, dim: Dimension, what: string): number {
  const v = evaluate(e, ctx);
  const at: Span = { line: ctx.line, start: e.start, end: e.end };
  if (v.kind !== 'quantity') throw new NoteError('type.quantity', `The ${what} must be ${describeDimension(dim, ctx.system)}.`, at);
  if (!sameDimension(v.dim, dim)) {
    if (isDimensionless(v.dim)) throw new NoteError('unit.missing', `The ${what} needs a unit: it must be ${describeDimension(dim, ctx.system)}.`, at);
    throw new NoteError('unit.argument', `The ${what} must be ${describeDimension(dim, ctx.system)}, but ${describeDimension(v.dim, ctx.system)} was given.`, at);
  }
  return v.si;
}

function addItem(item: BeamItem, ctx: EvalContext, input: BeamInput<Where>, where: Where): void {
  if (item.kind === 'support') {
    input.supports.push({ kind: item.support, x: measure(item.x, ctx, DIM.length, 'support position'), tag: where });
    return;
  }
  if (item.kind === 'combine') {
    const factors = item.terms.map((t) => {
      let factor = 1;
      if (t.factor) {
        const v = evaluate(t.factor, ctx);
        if (v.kind !== 'quantity' || !isDimensionless(v.dim)) {
          throw new NoteError('unit.argument', 'A load factor is a plain number, e.g. `1.2 dead + 1.6 live`.', { line: ctx.line, start: t.factor.start, end: t.factor.end });
        }
        factor = v.si;
      }
      return { group: t.group.name, factor };
    });
    input.combinations!.push({ name: item.name.name, factors, tag: where });
    return;
  }
  const v = item.values;
  const group = item.group?.name;
  const len = (k: string, what: string) => measure(v[k]!, ctx, DIM.length, what);
  let load: BeamLoad<Where>;
  switch (item.load) {
    case 'point':
      load = { kind: 'point', P: measure(v.P!, ctx, DIM.force, 'point load'), x: len('x', 'load position') };
      break;
    case 'moment':
      load = { kind: 'moment', M: measure(v.M!, ctx, DIM.moment, 'applied moment'), x: len('x', 'moment position') };
      break;
    case 'udl': {
      const w = measure(v.w!, ctx, DIM.lineLoad, 'line load');
      load = v.x1 ? { kind: 'udl', w, x1: len('x1', 'start of the load'), x2: len('x2', 'end of the load') } : { kind: 'udl', w, x1: 0, x2: input.span };
      break;
    }
    case 'ramp': {
      const w1 = measure(v.w1!, ctx, DIM.lineLoad, 'starting line load');
      const w2 = measure(v.w2!, ctx, DIM.lineLoad, 'ending line load');
      load = v.x1 ? { kind: 'ramp', w1, w2, x1: len('x1', 'start of the load'), x2: len('x2', 'end of the load') } : { kind: 'ramp', w1, w2, x1: 0, x2: input.span };
      break;
    }
  }
  if (group) load.group = group;
  load.tag = where;
  input.loads.push(load);
}

/** The evaluator's view of a solved beam: the envelope by default, or one combination or load group. */
export function beamModel(result: BeamResult, items: BeamItem[], loads: readonly BeamLoad[] = []): BeamModel {
  const userCombos = result.combinations.map((c) => c.name).filter((n) => n !== ALL_LOADS_COMBINATION);
  const named = new Set(items.flatMap((i) => (i.kind === 'load' && i.group ? [i.group.name] : [])));
  const groups = result.groups.filter((g) => named.has(g) && !userCombos.includes(g));
  const diagram = (name: string) => result.combination(name) ?? result.loadCase(name);
  return {
    result,
    loads: loads.map(({ tag: _tag, ...load }) => load),
    span: result.span,
    combinationNames: userCombos,
    groupNames: groups,
    summary(name?: string) {
      if (name) {
        const d = diagram(name)!;
        return { Vmax: Math.abs(d.Vmax.V), Mmax: d.Mmax.M, Mmin: d.Mmin.M };
      }
      return { Vmax: result.Vmax, Mmax: result.envelope.Mmax.M, Mmin: result.envelope.Mmin.M };
    },
    shear(x: number, side?: Side, name?: string) {
      return name ? diagram(name)!.shear(x, side) : result.shear(x, side);
    },
    moment(x: number, name?: string) {
      return name ? diagram(name)!.moment(x) : result.moment(x);
    },
    reaction(x: number, name?: string) {
      if (name) return diagram(name)!.reaction(x)?.R;
      return result.reaction(x)?.R.value;
    },
    reactions(name?: string) {
      if (name) return diagram(name)!.reactions.map((r) => (r.M === undefined ? { x: r.x, R: r.R } : { x: r.x, R: r.R, M: r.M }));
      return result.envelope.reactions.map((r) => (r.M === undefined ? { x: r.x, R: r.R.value } : { x: r.x, R: r.R.value, M: r.M.value }));
    },
  };
}
