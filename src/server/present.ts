/**
 * How results read in the editor: quantities in the note's unit system, a statement's formula with
 * the values it used substituted (as a hand calculation shows it), and short one-line summaries of
 * sections, beams and checks for inlay hints, symbols and code lenses.
 */
import type { Expr } from '../core/expression';
import { formatNumber } from '../core/format';
import { formatQuantity, type CheckResult, type StatementResult } from '../core/note';
import { DIM, type UnitSystem } from '../core/units';
import { quantity, type Quantity, type Value } from '../core/values';
import type { NoteAnalysis } from './analysis';
import type { ServerSettings } from './settings';

export interface Presenter {
  system: UnitSystem;
  sig: number;
  q(q: Quantity): string;
  length(metres: number): string;
  value(v: Value): string;
}

export function presenter(a: NoteAnalysis, settings: ServerSettings): Presenter {
  const system = a.unitSystem;
  const sig = settings.significantFigures;
  const q = (x: Quantity) => formatQuantity(x, system, sig);
  return {
    system,
    sig,
    q,
    length: (m: number) => q(quantity(m, DIM.length)),
    value: (v: Value) => (v.kind === 'quantity' ? q(v) : v.kind === 'section' ? `section ${v.name}` : v.kind === 'beam' ? `beam ${v.name}` : v.kind === 'side' ? v.side : `${v.name} (not evaluated)`),
  };
}

/** A check's utilisation as shown at a line end: "pass 0.28", "FAIL 1.12". */
export function checkBadge(c: CheckResult): string {
  return `${c.pass ? 'pass' : 'FAIL'} ${ratioText(c.ratio)}`;
}

export function ratioText(r: number): string {
  if (!Number.isFinite(r)) return '—';
  return Math.abs(r) >= 10 ? formatNumber(r, { significantFigures: 3 }) : r.toFixed(2);
}

/** The short result of a statement for the end of its line, or undefined when it has none. */
export function lineResult(r: StatementResult, pr: Presenter): string | undefined {
  if (r.failed) return undefined;
  if (r.check) return checkBadge(r.check);
  const v = r.value;
  if (!v) return undefined;
  if (v.kind === 'quantity') return `= ${r.text ?? pr.q(v)}`;
  if (v.kind === 'section') {
    const s = v.section;
    return `A = ${pr.q(quantity(s.area, DIM.area))}, I = ${pr.q(quantity(s.I, DIM.quartic))}`;
  }
  if (v.kind === 'beam') {
    const sum = v.beam.summary(v.combination);
    return `Vmax = ${pr.q(quantity(Math.abs(sum.Vmax), DIM.force))}, Mmax = ${pr.q(quantity(Math.max(Math.abs(sum.Mmax), Math.abs(sum.Mmin)), DIM.moment))}`;
  }
  return undefined;
}

const OP_TEXT: Record<string, string> = { '+': ' + ', '-': ' − ', '*': '·', '/': ' / ', '^': '^' };

/**
 * The expression as written, with each name, member and call of a quantity replaced by its value:
 * `q_joint / 2` becomes `88.6 kN/m / 2`. Numbers keep the text the engineer wrote.
 */
export function substitute(e: Expr, trace: Map<Expr, Value>, lineText: string, pr: Presenter, top = true): string {
  const traced = trace.get(e);
  const shown = (v: Value | undefined, fallback: string) => (v && v.kind === 'quantity' ? pr.q(v) : fallback);
  switch (e.kind) {
    case 'number':
      return lineText.slice(e.start, e.end) || e.text;
    case 'name':
      return shown(traced, e.name);
    case 'member':
      return shown(traced, lineText.slice(e.start, e.end));
    case 'call': {
      const inner = `${e.callee}(${e.args.map((a) => substitute(a, trace, lineText, pr, false)).join(', ')})`;
      return inner;
    }
    case 'unary':
      return `${e.op === '-' ? '−' : '+'}${substitute(e.operand, trace, lineText, pr, false)}`;
    case 'binary': {
      const l = substitute(e.left, trace, lineText, pr, false);
      const r = substitute(e.right, trace, lineText, pr, false);
      const wrap = (s: string, side: Expr) => (/[ ]/.test(s) && (e.op === '*' || e.op === '/' || e.op === '^') && side.kind !== 'paren' && side.kind !== 'call' ? `(${s})` : s);
      return `${wrap(l, e.left)}${OP_TEXT[e.op]}${wrap(r, e.right)}`;
    }
    case 'paren':
      return `(${substitute(e.inner, trace, lineText, pr, false)})`;
    case 'convert':
      return `${substitute(e.value, trace, lineText, pr, top)} to ${lineText.slice(e.unitStart, e.end)}`;
  }
}

/** True when substituting changes nothing worth showing (a plain number with a unit, say). */
export function isLiteral(e: Expr): boolean {
  return e.kind === 'number' || (e.kind === 'unary' && isLiteral(e.operand)) || (e.kind === 'convert' && isLiteral(e.value));
}
