/**
 * LaTeX for the hand-calculation form of a statement: names, expressions as written, expressions
 * with the values substituted, and formatted quantities. Everything is built from the syntax tree
 * and from numbers the core formatted, through whitelists: no text of a note reaches KaTeX as
 * LaTeX source, so a note cannot use KaTeX commands at all.
 */
import type { Expr, UnitTerm } from '../core/expression';
import { formatQuantity } from '../core/note';
import type { UnitSystem } from '../core/units';
import type { Quantity, Value } from '../core/values';

/** A table lookup that reads only the table's own keys: a note can name `constructor` or `valueOf`. */
function own<T>(table: Record<string, T>, key: string): T | undefined {
  return Object.prototype.hasOwnProperty.call(table, key) ? table[key] : undefined;
}

const GREEK = new Set([
  'alpha', 'beta', 'gamma', 'delta', 'epsilon', 'zeta', 'eta', 'theta', 'kappa', 'lambda', 'mu', 'nu', 'xi', 'pi', 'rho', 'sigma',
  'tau', 'phi', 'chi', 'psi', 'omega', 'Gamma', 'Delta', 'Theta', 'Lambda', 'Xi', 'Pi', 'Sigma', 'Phi', 'Psi', 'Omega',
]);

/** An identifier made safe for \mathrm{…}: letters and digits only, underscores escaped. */
function ident(text: string): string {
  return text.replace(/[^A-Za-z0-9_]/g, '').replace(/_/g, '\\_');
}

/** `tau_allow` → τ_allow, `t_max` → t_max, `F_v` → F_v, `weld_capacity` → weld_capacity (italic word). */
export function nameLatex(name: string): string {
  const clean = name.replace(/[^A-Za-z0-9_]/g, '');
  const cut = clean.indexOf('_');
  const base = cut > 0 ? clean.slice(0, cut) : clean;
  const sub = cut > 0 ? clean.slice(cut + 1) : '';
  const subIsWord = sub.length > 0 && /^[A-Za-z0-9]+$/.test(sub);
  if (cut > 0 && !subIsWord) return `\\mathit{${ident(clean)}}`;
  let head: string;
  if (GREEK.has(base)) head = `\\${base}`;
  else if (base.length === 1) head = base;
  else if (/^[A-Za-z]\d+$/.test(base)) head = `${base[0]}_{${base.slice(1)}}`;
  else head = `\\mathit{${ident(base)}}`;
  if (!sub) return head;
  if (head.includes('_{')) return `{${head}}_{\\mathrm{${ident(sub)}}}`;
  return `${head}_{${sub.length === 1 ? sub : `\\mathrm{${ident(sub)}}`}}`;
}

/** A section or beam name as it appears in a subscript or an argument list: upright. */
export function objectNameLatex(name: string): string {
  return `\\mathrm{${ident(name)}}`;
}

const SUPERSCRIPT_DIGITS = '⁰¹²³⁴⁵⁶⁷⁸⁹';

function superscriptToLatex(text: string): string {
  let out = '';
  let pending = '';
  const flush = () => {
    if (pending) out += `^{${pending}}`;
    pending = '';
  };
  for (const c of text) {
    const d = SUPERSCRIPT_DIGITS.indexOf(c);
    if (d >= 0) pending += String(d);
    else if (c === '⁻') pending += '-';
    else {
      flush();
      out += c;
    }
  }
  flush();
  return out;
}

/** "693×10⁶" → 693\times10^{6}; "-1.25" → -1.25. Characters outside a number are dropped. */
export function numberTextLatex(text: string): string {
  const safe = text.replace(/−/g, '-').replace(/[^0-9.+\-×⁰¹²³⁴⁵⁶⁷⁸⁹⁻∞]/g, '');
  return superscriptToLatex(safe.replace(/×10/g, '\\times 10').replace(/∞/g, '\\infty '));
}

/** "kN/m" → \mathrm{kN/m}; "mm⁴" → \mathrm{mm^{4}}; "kN·m" → \mathrm{kN{\cdot}m}. */
export function unitTextLatex(text: string): string {
  if (!text) return '';
  const safe = text.replace(/[^A-Za-z0-9_/·⁰¹²³⁴⁵⁶⁷⁸⁹⁻]/g, '');
  const body = superscriptToLatex(safe.replace(/_/g, '\\_').replace(/·/g, '{\\cdot}'));
  return `\\mathrm{${body}}`;
}

/** A number as written in the note: 0.4, 1.5e3, 5/16. */
function literalLatex(text: string): string {
  const frac = /^(\d+(?:\.\d*)?)\/(\d+(?:\.\d*)?)$/.exec(text);
  if (frac) return `\\tfrac{${frac[1]}}{${frac[2]}}`;
  const exp = /^(\d*\.?\d*)[eE]([+-]?\d+)$/.exec(text);
  if (exp) return `${exp[1]}\\times 10^{${Number(exp[2])}}`;
  return text.replace(/[^0-9.]/g, '');
}

export function unitTermsLatex(terms: UnitTerm[]): string {
  const num: string[] = [];
  const den: string[] = [];
  for (const t of terms) {
    const p = Math.abs(t.power);
    const piece = ident(t.name) + (p === 1 ? '' : `^{${p}}`);
    (t.power > 0 ? num : den).push(piece);
  }
  const top = num.length ? num.join('{\\cdot}') : '1';
  return `\\mathrm{${top}${den.length ? '/' + den.join('/') : ''}}`;
}

/** A quantity as the note shows it: number, thin space, unit. */
export function quantityLatex(q: Quantity, system: UnitSystem, sig?: number): string {
  return formattedLatex(formatQuantity(q, system, sig));
}

/** LaTeX for a string produced by formatQuantity ("66.6 kN", "693×10⁶ mm⁴"). */
export function formattedLatex(text: string): string {
  const space = text.indexOf(' ');
  if (space < 0) return numberTextLatex(text);
  return `${numberTextLatex(text.slice(0, space))}\\,${unitTextLatex(text.slice(space + 1))}`;
}

const MEMBER_SYMBOL: Record<string, string> = {
  A: 'A',
  I: 'I',
  Iy: 'I_{y}',
  Ixy: 'I_{xy}',
  yc: '\\bar{y}',
  xc: '\\bar{x}',
  depth: 'h',
  Vmax: 'V_{\\max}',
  Mmax: 'M_{\\max}',
  Mmin: 'M_{\\min}',
  span: 'L',
};

const CALL_SYMBOL: Record<string, string> = {
  tau: '\\tau',
  tau_max: '\\tau_{\\max}',
  tau_max_at: 'y_{\\tau\\max}',
  flow: 'q',
  Q: 'Q',
  width: 't',
  shear: 'V',
  moment: 'M',
  reaction: 'R',
  min: '\\min',
  max: '\\max',
};

/** `W1.ULS_a` as an upright object name, for a name or a chain of members; undefined for anything else. */
function objectPath(e: Expr): string | undefined {
  if (e.kind === 'name') return ident(e.name);
  if (e.kind === 'member') {
    const owner = objectPath(e.object);
    return owner === undefined ? undefined : `${owner}.${ident(e.member)}`;
  }
  return undefined;
}

function precedence(e: Expr): number {
  switch (e.kind) {
    case 'binary':
      return e.op === '+' || e.op === '-' ? 1 : e.op === '^' ? 3 : 2;
    case 'unary':
      return 2;
    case 'convert':
      return 0;
    default:
      return 4;
  }
}

/** How a sub-expression is shown: symbolically, or with the values of names, members and calls. */
export interface LatexMode {
  /** Put traced values in place of names, members and calls (default: show the expression as written). */
  substitute?: boolean;
  trace?: Map<Expr, Value>;
  /** Whether a bare name stands for a unit (`kN/mm` parses as 0.55 kN divided by the unit mm). */
  isUnit?: (name: string) => boolean;
  /** Unit system of substituted values (default SI). */
  system?: UnitSystem;
  sig?: number;
}

function unwrap(e: Expr): Expr {
  return e.kind === 'paren' ? unwrap(e.inner) : e;
}

/** The value shown in place of a node when substituting, or undefined to show the node itself. */
function substituted(e: Expr, mode: LatexMode): { latex: string; negative: boolean; withUnit: boolean } | undefined {
  if (!mode.substitute || !mode.trace) return undefined;
  if (e.kind !== 'name' && e.kind !== 'member' && e.kind !== 'call') return undefined;
  if (e.kind === 'name' && mode.isUnit?.(e.name)) return undefined;
  const v = mode.trace.get(e);
  if (!v || v.kind !== 'quantity') return undefined;
  const latex = quantityLatex(v, mode.system ?? 'SI', mode.sig);
  return { latex, negative: v.si < 0, withUnit: latex.includes('\\mathrm') || latex.includes('\\times') };
}

/** LaTeX of an expression; `mode.substitute` puts each traced value in place of its name. */
export function exprLatex(e: Expr, mode: LatexMode): string {
  const sub = substituted(e, mode);
  if (sub) return sub.negative ? `(${sub.latex})` : sub.latex;
  switch (e.kind) {
    case 'number': {
      const n = literalLatex(e.text);
      return e.unit ? `${n}\\,${unitTermsLatex(e.unit)}` : n;
    }
    case 'name': {
      if (e.name === 'pi') return '\\pi';
      if (e.name === 'left' || e.name === 'right') return `\\text{${e.name}}`;
      if (mode.isUnit?.(e.name)) return `\\mathrm{${ident(e.name)}}`;
      const v = mode.trace?.get(e);
      if (v && (v.kind === 'section' || v.kind === 'beam')) return objectNameLatex(e.name);
      return nameLatex(e.name);
    }
    case 'member': {
      const owner = objectPath(e.object);
      const symbol = own(MEMBER_SYMBOL, e.member);
      if (owner !== undefined && symbol) return attachSubscript(symbol, `\\mathrm{${owner}}`);
      if (owner !== undefined) return `\\mathrm{${owner}.${ident(e.member)}}`;
      return `${exprLatex(e.object, mode)}.\\mathrm{${ident(e.member)}}`;
    }
    case 'call': {
      const args = e.args.map((a) => exprLatex(a, mode));
      if (e.callee === 'sqrt' && args.length === 1) return `\\sqrt{${args[0]}}`;
      if (e.callee === 'abs' && args.length === 1) return `\\left|${args[0]}\\right|`;
      const head = own(CALL_SYMBOL, e.callee) ?? `\\mathrm{${ident(e.callee)}}`;
      return `${head}\\left(${args.join(',\\,')}\\right)`;
    }
    case 'paren':
      return `\\left(${exprLatex(e.inner, mode)}\\right)`;
    case 'unary': {
      const inner = exprLatex(e.operand, mode);
      const needs = precedence(unwrap(e.operand)) <= 1 || (substituted(unwrap(e.operand), mode)?.negative ?? false);
      return `${e.op}${needs && !inner.startsWith('\\left(') && !inner.startsWith('(') ? `\\left(${inner}\\right)` : inner}`;
    }
    case 'binary':
      return binaryLatex(e, mode);
    case 'convert':
      return exprLatex(e.value, mode);
  }
}

function attachSubscript(symbol: string, owner: string): string {
  const m = /^(.*)_\{(.*)\}$/.exec(symbol);
  if (m) return `${m[1]}_{${m[2]},${owner}}`;
  return `${symbol}_{${owner}}`;
}

function binaryLatex(e: Extract<Expr, { kind: 'binary' }>, mode: LatexMode): string {
  const p = precedence(e);
  const side = (child: Expr, right: boolean): string => {
    const inner = unwrap(child);
    const text = exprLatex(child, mode);
    if (child.kind === 'paren') return text;
    const cp = precedence(inner);
    const wrap = cp < p || (right && cp === p && (e.op === '-' || e.op === '/')) || (e.op === '^' && !right && (cp < 4 || isQuantityValue(inner, mode)));
    return wrap ? `\\left(${text}\\right)` : text;
  };
  if ((e.op === '/' || e.op === '*') && isUnitExpr(e.right, mode) && isLiteral(e.left, mode)) {
    return `${exprLatex(e.left, mode)}${e.op === '/' ? '/' : '\\,'}${exprLatex(e.right, mode)}`;
  }
  switch (e.op) {
    case '/':
      return `\\dfrac{${exprLatex(stripParen(e.left), mode)}}{${exprLatex(stripParen(e.right), mode)}}`;
    case '^':
      return `${side(e.left, false)}^{${exprLatex(stripParen(e.right), mode)}}`;
    case '*': {
      const l = side(e.left, false);
      const r = side(e.right, true);
      const plain = !mode.substitute && unwrap(e.left).kind === 'number' && !(unwrap(e.left) as { unit?: unknown }).unit && unwrap(e.right).kind !== 'number';
      return plain ? `${l}\\,${r}` : `${l} \\cdot ${r}`;
    }
    case '+':
    case '-':
      return `${side(e.left, false)} ${e.op} ${side(e.right, true)}`;
  }
}

/** A unit written as names: `mm`, `kN*m`, `m^2` (names the note did not define). */
export function isUnitExpr(e: Expr, mode: Pick<LatexMode, 'isUnit'>): boolean {
  if (e.kind === 'name') return !!mode.isUnit?.(e.name);
  if (e.kind === 'binary') {
    if (e.op === '^') return isUnitExpr(e.left, mode) && e.right.kind === 'number';
    if (e.op === '*' || e.op === '/') return isUnitExpr(e.left, mode) && isUnitExpr(e.right, mode);
  }
  return false;
}

/** A number as written, with or without units: `20 ksi`, `0.55 kN/mm`, `-3`. */
export function isLiteral(e: Expr, mode: Pick<LatexMode, 'isUnit'>): boolean {
  if (e.kind === 'number') return true;
  if (e.kind === 'unary') return isLiteral(e.operand, mode);
  if (e.kind === 'binary' && (e.op === '*' || e.op === '/')) return isLiteral(e.left, mode) && isUnitExpr(e.right, mode);
  return false;
}

function stripParen(e: Expr): Expr {
  return e.kind === 'paren' ? e.inner : e;
}

function isQuantityValue(e: Expr, mode: LatexMode): boolean {
  if (e.kind === 'number' && e.unit) return true;
  return substituted(e, mode)?.withUnit ?? false;
}

export function compareLatex(op: '<=' | '<' | '>=' | '>'): string {
  return op === '<=' ? '\\le' : op === '>=' ? '\\ge' : op;
}

/** Whether an expression shows anything new once values are substituted (it reads a name, member or call). */
export function hasSubstitution(e: Expr, trace: Map<Expr, Value>, isUnit?: (name: string) => boolean): boolean {
  switch (e.kind) {
    case 'name':
      return !isUnit?.(e.name) && trace.get(e)?.kind === 'quantity';
    case 'member':
    case 'call':
      return trace.get(e)?.kind === 'quantity';
    case 'paren':
      return hasSubstitution(e.inner, trace, isUnit);
    case 'unary':
      return hasSubstitution(e.operand, trace, isUnit);
    case 'binary':
      return hasSubstitution(e.left, trace, isUnit) || hasSubstitution(e.right, trace, isUnit);
    case 'convert':
      return hasSubstitution(e.value, trace, isUnit);
    case 'number':
      return false;
  }
}
