/**
 * The hand-calculation form of a statement: the formula as written, the same with values put in,
 * and the result with its unit. For the shear-stress functions at the top of a line, the formula is
 * opened up to tau = V·Q/(I·t) (or q = V·Q/I) with the section's own Q, I and t at that height,
 * because that is how an engineer checks the number by hand.
 *
 * The core evaluates; this module only reads the statement's syntax tree, its trace of values and
 * the section API, so it never disagrees with the numbers the checker reports.
 */
import type { Expr } from '../core/expression';
import { formatNumber } from '../core/format';
import { formatQuantity, type StatementResult } from '../core/note';
import type { Section } from '../core/section';
import type { Statement } from '../core/statements';
import { DIM, type UnitSystem } from '../core/units';
import { quantity, type Quantity, type SectionValue, type Value } from '../core/values';
import { compareLatex, exprLatex, formattedLatex, hasSubstitution, isLiteral, nameLatex, objectNameLatex } from './latex';

/** One side of an equals sign: LaTeX, and the plain text read out by assistive technology. */
export interface Step {
  latex: string;
  plain: string;
}

export interface HandCalc {
  /** Written one after another with "=" between them (for a check, the relation is inside each step). */
  steps: Step[];
  /** Plain-text remarks: where tau_max occurs, both sides of a width jump. */
  notes: string[];
}

export interface FormulaContext {
  system: UnitSystem;
  sig?: number;
  /** The source text of an expression, for the plain-text form. */
  source: (e: { start: number; end: number }) => string;
  /** Whether a bare name in this statement stands for a unit rather than a value of the note. */
  isUnit?: (name: string) => boolean;
}

function unwrap(e: Expr): Expr {
  return e.kind === 'paren' ? unwrap(e.inner) : e;
}

function fmt(q: Quantity, c: FormulaContext): string {
  return formatQuantity(q, c.system, c.sig);
}

/** A call of tau, tau_max or flow with a section and a force whose values the trace holds. */
export interface StressCall {
  callee: 'tau' | 'tau_max' | 'flow';
  section: SectionValue;
  /** Shear force, N. */
  V: number;
  /** Height above the lowest point, m (tau and flow). */
  y?: number;
  /** Source text of the height argument, e.g. "y_joint". */
  yText?: string;
  expr: Extract<Expr, { kind: 'call' }>;
}

/** Every stress call in an expression whose section, force and height were evaluated. */
export function stressCalls(e: Expr, trace: Map<Expr, Value>, source: FormulaContext['source'], out: StressCall[] = []): StressCall[] {
  const visit = (n: Expr): void => {
    switch (n.kind) {
      case 'call': {
        if ((n.callee === 'tau' || n.callee === 'tau_max' || n.callee === 'flow') && trace.has(n)) {
          const s = n.args[0] && trace.get(unwrap(n.args[0]));
          const v = n.args[1] && trace.get(unwrap(n.args[1]));
          const y = n.args[2] && trace.get(unwrap(n.args[2]));
          if (s?.kind === 'section' && v?.kind === 'quantity') {
            const call: StressCall = { callee: n.callee, section: s, V: v.si, expr: n };
            if (n.callee !== 'tau_max') {
              if (y?.kind !== 'quantity') break;
              call.y = y.si;
              call.yText = source(n.args[2]!);
            }
            out.push(call);
          }
        }
        n.args.forEach(visit);
        break;
      }
      case 'member':
        visit(n.object);
        break;
      case 'paren':
        visit(n.inner);
        break;
      case 'unary':
        visit(n.operand);
        break;
      case 'binary':
        visit(n.left);
        visit(n.right);
        break;
      case 'convert':
        visit(n.value);
        break;
      default:
        break;
    }
  };
  visit(e);
  return out;
}

function lengthText(si: number, c: FormulaContext): string {
  return fmt(quantity(si, DIM.length, c.system === 'US' ? { text: 'in', factor: 0.0254 } : { text: 'mm', factor: 1e-3 }), c);
}

/** Opens tau(S, V, y), tau_max(S, V) or flow(S, V, y) into V·Q/(I·t) with the numbers put in. */
function stressExpansion(call: StressCall, c: FormulaContext): { symbolic: Step; substituted: Step; notes: string[] } | undefined {
  const s: Section = call.section.section;
  let y: number, Q: number, t: number;
  const notes: string[] = [];
  if (call.callee === 'tau_max') {
    const m = s.tauMax(call.V);
    if (m.problem || !m.locations.length) return undefined;
    const loc = m.locations[0]!;
    y = loc.y;
    Q = loc.firstMoment;
    t = loc.width;
    const offset = y - s.centroidY;
    const where = Math.abs(offset) <= 1e-9 * s.depth
      ? `at the neutral axis, y = ${lengthText(y, c)}`
      : `at y = ${lengthText(y, c)}, ${lengthText(Math.abs(offset), c)} ${offset > 0 ? 'above' : 'below'} the neutral axis`;
    notes.push(`Largest stress ${where}${m.locations.length > 1 ? ` (also at ${m.locations.slice(1).map((l) => `y = ${lengthText(l.y, c)}`).join(', ')})` : ''}.`);
    const k = m.perV * s.area;
    notes.push(`τmax = ${formatNumber(k, { significantFigures: c.sig })} × V/A for this section.`);
  } else {
    y = call.y!;
    const reading = s.tau(1, y);
    if (reading.problem) return undefined;
    Q = reading.firstMoment;
    t = reading.width;
    if (call.callee === 'tau') {
      const sides = s.tauSides(call.V, y);
      if (!sides.problem && sides.below !== undefined && sides.above !== undefined && Math.abs(sides.widthBelow - sides.widthAbove) > 1e-9 * Math.max(sides.widthBelow, sides.widthAbove)) {
        const stress = (v: number) => fmt(quantity(v, DIM.stress), c);
        notes.push(
          `The width jumps at y = ${lengthText(y, c)}: τ = ${stress(sides.below)} just below (t = ${lengthText(sides.widthBelow, c)}) and ${stress(sides.above)} just above (t = ${lengthText(sides.widthAbove, c)}); the narrower side governs.`,
        );
      }
    }
  }
  const Vq = quantity(call.V, DIM.force);
  const Qq = quantity(Q, DIM.volume);
  const Iq = quantity(s.I, DIM.quartic);
  const tq = quantity(t, DIM.length, c.system === 'US' ? { text: 'in', factor: 0.0254 } : { text: 'mm', factor: 1e-3 });
  const L = (q: Quantity) => formattedLatex(fmt(q, c));
  const P = (q: Quantity) => fmt(q, c);
  const section = objectNameLatex(call.section.name);
  if (call.callee === 'flow') {
    return {
      symbolic: { latex: `\\dfrac{V\\,Q}{I_{${section}}}`, plain: 'V Q / I' },
      substituted: { latex: `\\dfrac{${L(Vq)} \\cdot ${L(Qq)}}{${L(Iq)}}`, plain: `${P(Vq)} × ${P(Qq)} / ${P(Iq)}` },
      notes: [`Q is the first moment, about the neutral axis, of the area above y = ${lengthText(y, c)}.`, ...notes],
    };
  }
  if (call.callee === 'tau') notes.unshift(`Q and t at y = ${lengthText(y, c)}.`);
  return {
    symbolic: { latex: `\\dfrac{V\\,Q}{I_{${section}}\\,t}`, plain: 'V Q / (I t)' },
    substituted: { latex: `\\dfrac{${L(Vq)} \\cdot ${L(Qq)}}{${L(Iq)} \\cdot ${L(tq)}}`, plain: `${P(Vq)} × ${P(Qq)} / (${P(Iq)} × ${P(tq)})` },
    notes,
  };
}

/** The hand-calculation steps of an assignment or a check; undefined for other statements. */
export function handCalc(result: StatementResult, c: FormulaContext): HandCalc | undefined {
  const st: Statement = result.statement;
  const mode = { system: c.system, sig: c.sig, trace: result.trace, isUnit: c.isUnit };
  if (st.kind === 'assign') {
    const lhs: Step = { latex: nameLatex(st.target.name), plain: st.target.name };
    const expr = st.expr;
    const inner = unwrap(expr.kind === 'convert' ? expr.value : expr);
    const symbolic: Step = { latex: exprLatex(expr, { ...mode, substitute: false }), plain: c.source(expr) };
    const steps: Step[] = [lhs];
    const notes: string[] = [];
    const resultStep = result.text !== undefined ? { latex: formattedLatex(result.text), plain: result.text } : undefined;
    const plainNumber = inner.kind === 'number' || (inner.kind === 'unary' && unwrap(inner.operand).kind === 'number');
    if (plainNumber && expr.kind !== 'convert') {
      steps.push(symbolic);
      return { steps, notes };
    }
    steps.push(symbolic);
    if (isLiteral(inner, mode) && expr.kind !== 'convert') {
      if (resultStep && !failedValue(result)) steps.push(resultStep);
      return { steps, notes };
    }
    const calls = inner.kind === 'call' ? stressCalls(inner, result.trace, c.source).filter((s) => s.expr === inner) : [];
    const expansion = calls.length ? stressExpansion(calls[0]!, c) : undefined;
    if (expansion) {
      steps.push(expansion.symbolic, expansion.substituted);
      notes.push(...expansion.notes);
    } else if (hasSubstitution(expr, result.trace, c.isUnit) && !isSingleReference(inner)) {
      steps.push({ latex: exprLatex(expr, { ...mode, substitute: true }), plain: substitutedPlain(expr, result, c) });
    } else if (expr.kind === 'convert') {
      const v = result.trace.get(inner);
      if (v?.kind === 'quantity') steps.push({ latex: formattedLatex(fmt(v, c)), plain: fmt(v, c) });
    }
    if (resultStep && !failedValue(result)) steps.push(resultStep);
    return { steps, notes };
  }
  if (st.kind === 'check') {
    const rel = compareLatex(st.op);
    const symbolic: Step = {
      latex: `${exprLatex(st.left, { ...mode, substitute: false })} ${rel} ${exprLatex(st.right, { ...mode, substitute: false })}`,
      plain: `${c.source(st.left)} ${st.op} ${c.source(st.right)}`,
    };
    const steps: Step[] = [symbolic];
    if (result.check) {
      const { leftText, rightText } = result.check;
      const values = { latex: `${formattedLatex(leftText)} ${rel} ${formattedLatex(rightText)}`, plain: `${leftText} ${st.op} ${rightText}` };
      if (values.plain !== symbolic.plain) steps.push(values);
    }
    return { steps, notes: [] };
  }
  return undefined;
}

/** A name, member or call: substituting it gives just its value, which the result shows anyway. */
function isSingleReference(e: Expr): boolean {
  return e.kind === 'name' || e.kind === 'member' || e.kind === 'call';
}

function failedValue(result: StatementResult): boolean {
  return result.failed || result.value === undefined;
}

/** The expression's source with each traced value put in, as plain text. */
function substitutedPlain(e: Expr, result: StatementResult, c: FormulaContext): string {
  const walk = (n: Expr): string => {
    if ((n.kind === 'name' && !c.isUnit?.(n.name)) || n.kind === 'member' || n.kind === 'call') {
      const v = result.trace.get(n);
      if (v?.kind === 'quantity') return fmt(v, c);
    }
    switch (n.kind) {
      case 'binary':
        return `${walk(n.left)} ${n.op === '*' ? '×' : n.op} ${walk(n.right)}`;
      case 'paren':
        return `(${walk(n.inner)})`;
      case 'unary':
        return `${n.op}${walk(n.operand)}`;
      case 'convert':
        return walk(n.value);
      case 'call':
        return `${n.callee}(${n.args.map(walk).join(', ')})`;
      default:
        return c.source(n);
    }
  };
  return walk(e);
}

export { nameLatex };
