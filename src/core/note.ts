/**
 * Evaluates a whole note: its `shear` blocks top to bottom, names flowing from earlier blocks to
 * later ones. One bad line is one diagnostic; everything else still evaluates. Time per block is
 * bounded. A cache lets an editor re-evaluate only the blocks an edit can change.
 */
import { type Block, extractBlocks } from './blocks';
import { extractBlocksAfterEdit } from './blocks-edit';
import { type Diagnostic, NoteError } from './diagnostic';
import type { Expr } from './expression';
import { type Binding, type EvalContext, evaluate, UNAVAILABLE } from './evaluate';
import { formatNumber } from './format';
import { evaluateBeamStatement } from './beam-statement';
import { evaluateSectionStatement } from './section-statement';
import { type CompareOp, parseBlock, type Statement } from './statements';
import { DIM, describeDimension, isDimensionless, lookupUnit, preferredUnit, sameDimension, siUnitText, type UnitSystem } from './units';
import type { Quantity, Value } from './values';

export interface NoteOptions {
  /** 'auto' (default) picks the system most of the note's units belong to; `units SI|US` in a block wins over both. */
  unitSystem?: 'auto' | UnitSystem;
  significantFigures?: number;
  /** Milliseconds one block may take before the rest of it is skipped with a diagnostic. */
  blockBudgetMs?: number;
  /** A clock, injected so the core stays pure; defaults to Date.now. */
  now?: () => number;
}

/** One statement's outcome, in source order. */
export interface StatementResult {
  statement: Statement;
  /** The name the statement defines, if any. */
  name?: string;
  value?: Value;
  /** The value as shown: "66.6 kN"; for a section "A = 13 200 mm², I = …". */
  text?: string;
  check?: CheckResult;
  /** Values of names, members and calls inside the statement's expressions. */
  trace: Map<Expr, Value>;
  failed: boolean;
}

export interface CheckResult {
  line: number;
  text: string;
  op: CompareOp;
  left: Quantity;
  right: Quantity;
  pass: boolean;
  /** Utilisation: demand over capacity (left/right for <, <=; right/left for >, >=). */
  ratio: number;
  leftText: string;
  rightText: string;
}

export interface BlockResult {
  block: Block;
  statements: Statement[];
  results: StatementResult[];
  /** Names this block defines, in order, with their bindings. */
  defines: Map<string, Binding>;
  /** Names read from earlier blocks, with the binding seen (for incremental re-evaluation). */
  reads: Map<string, Binding | undefined>;
  checks: CheckResult[];
  diagnostics: Diagnostic[];
  unitSystem: UnitSystem;
}

export interface NoteResult {
  blocks: BlockResult[];
  unitSystem: UnitSystem;
  diagnostics: Diagnostic[];
  /** Blocks reused from the cache on this evaluation (for measuring incremental work). */
  reused: number;
}

/** Keeps the previous evaluation so an edit re-evaluates only the blocks it can change. */
export class NoteCache {
  previous: BlockResult[] = [];
  key = '';
  /** The text and blocks of the previous evaluation, so an edit inside one block skips the Markdown parse. */
  text?: string;
  blocks?: Block[];
}

const DEFAULT_BUDGET_MS = 3000;

export function evaluateNote(text: string, options: NoteOptions = {}, cache?: NoteCache): NoteResult {
  const blocks = (cache?.text !== undefined && cache.blocks && extractBlocksAfterEdit(cache.text, cache.blocks, text)) || extractBlocks(text);
  const system = chooseSystem(blocks, options);
  const now = options.now ?? Date.now;
  const budget = options.blockBudgetMs ?? DEFAULT_BUDGET_MS;
  const scope = new Map<string, Binding>();
  const results: BlockResult[] = [];
  const optionsKey = `${system}|${options.significantFigures ?? 3}`;
  const prior = cache && cache.key === optionsKey ? cache.previous : [];
  const priorBySource = new Map<string, BlockResult[]>();
  for (const r of prior) {
    const list = priorBySource.get(r.block.source) ?? [];
    list.push(r);
    priorBySource.set(r.block.source, list);
  }
  let reused = 0;
  for (const block of blocks) {
    const candidate = (priorBySource.get(block.source) ?? []).find((r) => sameShape(r.block, block) && readsUnchanged(r, scope));
    let result: BlockResult;
    if (candidate) {
      result = candidate.block.fenceLine === block.fenceLine && candidate.block.index === block.index ? candidate : relocate(candidate, block);
      reused++;
    } else {
      result = evaluateBlock(block, scope, { system, sig: options.significantFigures, now, budget });
    }
    for (const [name, b] of result.defines) scope.set(name, b);
    results.push(result);
  }
  if (cache) {
    cache.previous = results;
    cache.key = optionsKey;
    cache.text = text;
    cache.blocks = blocks;
  }
  return { blocks: results, unitSystem: system, diagnostics: results.flatMap((r) => r.diagnostics), reused };
}

/** Same text laid out the same way; the block may have moved up or down the note. */
function sameShape(a: Block, b: Block): boolean {
  // The cached result carries its Block: title, closing fence and length must match too, or a stale one leaks out.
  if (a.lines.length !== b.lines.length || a.title !== b.title || a.closed !== b.closed || a.endLine - a.fenceLine !== b.endLine - b.fenceLine) return false;
  for (let i = 0; i < a.lines.length; i++) if (a.lines[i]!.column !== b.lines[i]!.column) return false;
  return true;
}

/** A block's results depend only on the values it read, so compare values, not where they were defined. */
function readsUnchanged(r: BlockResult, scope: Map<string, Binding>): boolean {
  // Misses are recorded too (as undefined), so a name defined later upstream invalidates the block.
  for (const [name, b] of r.reads) {
    const now = scope.get(name);
    if (now === undefined ? b !== undefined : b === undefined || now.value !== b.value) return false;
  }
  return true;
}

/**
 * A cached result moved to where its block now sits: lines shifted, values kept (the same objects,
 * so blocks that read them stay cached too). Adding a line above a block costs no re-evaluation.
 */
function relocate(r: BlockResult, block: Block): BlockResult {
  const delta = block.fenceLine - r.block.fenceLine;
  const moved = new Map<Statement, Statement>();
  const shiftStatement = (st: Statement): Statement => {
    let out: Statement;
    if (st.kind === 'section') out = { ...st, line: st.line + delta, parts: st.parts.map((p) => ({ ...p, line: p.line + delta })) };
    else if (st.kind === 'beam') out = { ...st, line: st.line + delta, items: st.items.map((i) => ({ ...i, line: i.line + delta })) };
    else out = { ...st, line: st.line + delta };
    moved.set(st, out);
    return out;
  };
  const statements = r.statements.map(shiftStatement);
  const checks: CheckResult[] = [];
  const results = r.results.map((res) => {
    const out: StatementResult = { ...res, statement: moved.get(res.statement) ?? shiftStatement(res.statement) };
    if (res.check) {
      out.check = { ...res.check, line: res.check.line + delta };
      checks.push(out.check);
    }
    return out;
  });
  const defines = new Map<string, Binding>();
  for (const [name, b] of r.defines) defines.set(name, { ...b, line: b.line + delta, blockIndex: block.index });
  return {
    block,
    statements,
    results,
    defines,
    reads: r.reads,
    checks,
    diagnostics: r.diagnostics.map((d) => ({ ...d, line: d.line + delta })),
    unitSystem: r.unitSystem,
  };
}

interface SystemVotes {
  explicit?: UnitSystem;
  si: number;
  us: number;
}

/** Unit-system votes per block text, kept across evaluations so a keystroke rescans one block. */
const votesBySource = new Map<string, SystemVotes>();

function votesOf(b: Block): SystemVotes {
  const known = votesBySource.get(b.source);
  if (known) return known;
  const names: string[] = [];
  let explicit: UnitSystem | undefined;
  for (const l of b.lines) {
    const t = l.text;
    if (t.includes('units')) {
      const m = /^\s*units\s+(SI|US)\s*(#.*)?$/i.exec(t);
      if (m && !explicit) explicit = m[1]!.toUpperCase() as UnitSystem;
    }
    const hash = t.indexOf('#');
    const code = hash >= 0 ? t.slice(0, hash) : t;
    for (const m of code.matchAll(/[0-9)]\s*([A-Za-z]+)/g)) names.push(m[1]!);
  }
  const votes: SystemVotes = { explicit, si: 0, us: 0 };
  for (const n of names) {
    const def = lookupUnit(n);
    if (def?.system === 'SI') votes.si++;
    else if (def?.system === 'US') votes.us++;
  }
  if (votesBySource.size > 20000) votesBySource.clear();
  votesBySource.set(b.source, votes);
  return votes;
}

function chooseSystem(blocks: Block[], options: NoteOptions): UnitSystem {
  let si = 0;
  let us = 0;
  for (const b of blocks) {
    const v = votesOf(b);
    if (v.explicit) return v.explicit;
    si += v.si;
    us += v.us;
  }
  if (options.unitSystem && options.unitSystem !== 'auto') return options.unitSystem;
  return us > si ? 'US' : 'SI';
}

interface BlockSettings {
  system: UnitSystem;
  sig?: number;
  now: () => number;
  budget: number;
}

export function evaluateBlock(block: Block, outer: Map<string, Binding>, settings: BlockSettings): BlockResult {
  const parsed = parseBlock(block);
  // The budget covers evaluation (parsing is bounded by the line limits), and the first statement
  // always runs, so a slow machine still makes progress on every block.
  const started = settings.now();
  const diagnostics = [...parsed.diagnostics];
  const defines = new Map<string, Binding>();
  const reads = new Map<string, Binding | undefined>();
  const results: StatementResult[] = [];
  const checks: CheckResult[] = [];
  const lookup = (name: string): Binding | undefined => {
    const inner = defines.get(name);
    if (inner) return inner;
    const b = outer.get(name);
    reads.set(name, b);
    return b;
  };
  const fmt = (q: Quantity) => formatQuantity(q, settings.system, settings.sig);
  for (const [index, st] of parsed.statements.entries()) {
    if (index > 0 && settings.now() - started > settings.budget) {
      diagnostics.push({ code: 'block.budget', severity: 'error', message: `This block took longer than ${settings.budget} ms; the statements from here on were not evaluated.`, line: st.line, column: st.start, endColumn: st.end });
      break;
    }
    const trace = new Map<Expr, Value>();
    const ctx: EvalContext = { lookup, line: st.line, system: settings.system, trace };
    const res: StatementResult = { statement: st, trace, failed: false };
    results.push(res);
    try {
      switch (st.kind) {
        case 'assign': {
          const v = evaluate(st.expr, ctx);
          if (v.kind === 'side') throw new NoteError('type.quantity', '`left` and `right` only name the side of a jump in shear(beam, x, left).', { line: st.line, start: st.expr.start, end: st.expr.end });
          res.name = st.target.name;
          res.value = v;
          res.text = v.kind === 'quantity' ? fmt(v) : undefined;
          if (v.kind === 'quantity' && lookupUnit(st.target.name)) {
            diagnostics.push({ code: 'name.shadows-unit', severity: 'warning', message: `The name "${st.target.name}" hides the unit ${st.target.name} in the lines below; pick another name if you mean the unit there.`, line: st.line, column: st.target.start, endColumn: st.target.end });
          }
          define(st.target.name, v, st.line, st.target.start, st.target.end);
          break;
        }
        case 'section':
        case 'beam': {
          const out = st.kind === 'section' ? evaluateSectionStatement(st, ctx) : evaluateBeamStatement(st, ctx);
          diagnostics.push(...out.diagnostics);
          if (out.value) {
            res.name = st.target.name;
            res.value = out.value;
          } else res.failed = true;
          define(st.target.name, out.value ?? { kind: 'unavailable', name: st.target.name }, st.line, st.target.start, st.target.end);
          break;
        }
        case 'check': {
          const lv = evaluate(st.left, ctx);
          const rv = evaluate(st.right, ctx);
          if (lv.kind !== 'quantity' || rv.kind !== 'quantity') throw new NoteError('check.kind', 'A check compares two quantities.', { line: st.line, start: st.left.start, end: st.right.end });
          if (!sameDimension(lv.dim, rv.dim)) {
            throw new NoteError('unit.mismatch', `Cannot compare ${describeDimension(lv.dim, settings.system)} with ${describeDimension(rv.dim, settings.system)}.`, { line: st.line, start: st.left.start, end: st.right.end });
          }
          const check = makeCheck(st, lv, rv, fmt);
          res.check = check;
          res.text = `${check.pass ? 'pass' : 'FAIL'}, ratio ${formatNumber(check.ratio, { significantFigures: Math.max(2, settings.sig ?? 3) })}`;
          checks.push(check);
          if (Math.sign(lv.si) !== Math.sign(rv.si) && lv.si !== 0 && rv.si !== 0) {
            diagnostics.push({ code: 'check.sign', severity: 'warning', message: 'The two sides have opposite signs, so this check says little; compare magnitudes with abs(…).', line: st.line, column: st.left.start, endColumn: st.right.end });
          }
          if (!check.pass) {
            diagnostics.push({ code: 'check.fails', severity: 'warning', message: `Check fails: ${check.leftText} ${negate(st.op)} ${check.rightText} (utilisation ${formatNumber(check.ratio)}).`, line: st.line, column: st.start, endColumn: st.end });
          }
          break;
        }
        case 'units':
          break;
      }
    } catch (e) {
      res.failed = true;
      if (st.kind === 'assign') define(st.target.name, { kind: 'unavailable', name: st.target.name }, st.line, st.target.start, st.target.end);
      if (e instanceof NoteError && e.code === UNAVAILABLE) {
        // Already reported where the name is defined.
      } else if (e instanceof NoteError && e.span) {
        diagnostics.push({ code: e.code, severity: 'error', message: e.message, line: e.span.line, column: e.span.start, endColumn: e.span.end });
      } else {
        diagnostics.push({ code: 'internal', severity: 'error', message: `Could not evaluate this line: ${e instanceof Error ? e.message : String(e)}`, line: st.line, column: st.start, endColumn: st.end });
      }
    }
  }
  return { block, statements: parsed.statements, results, defines, reads, checks, diagnostics, unitSystem: settings.system };

  function define(name: string, value: Value, line: number, start: number, end: number) {
    defines.set(name, { value, line, start, end, blockIndex: block.index });
  }
}

function negate(op: CompareOp): string {
  return op === '<=' ? '>' : op === '<' ? '>=' : op === '>=' ? '<' : '<=';
}

function makeCheck(st: Extract<Statement, { kind: 'check' }>, l: Quantity, r: Quantity, fmt: (q: Quantity) => string): CheckResult {
  const pass = st.op === '<=' ? l.si <= r.si : st.op === '<' ? l.si < r.si : st.op === '>=' ? l.si >= r.si : l.si > r.si;
  const [demand, capacity] = st.op === '<=' || st.op === '<' ? [l.si, r.si] : [r.si, l.si];
  let ratio: number;
  if (capacity === 0) {
    if (demand === 0) ratio = 0;
    else throw new NoteError('check.zero', 'The limit of this check is zero, so no utilisation ratio exists; write a non-zero limit.', { line: st.line, start: st.left.start, end: st.right.end });
  } else ratio = demand / capacity;
  // A limit a hair above zero (or a demand near the float limit) overflows the ratio: no number to show.
  if (!Number.isFinite(ratio)) throw new NoteError('check.zero', 'The limit of this check is so close to zero that no utilisation ratio can be shown; write a realistic limit.', { line: st.line, start: st.left.start, end: st.right.end });
  return { line: st.line, text: st.text, op: st.op, left: l, right: r, pass, ratio, leftText: fmt(l), rightText: fmt(r) };
}

/** "66.6 kN": in the unit the note wrote for it, else the unit system's choice for its dimension. */
export function formatQuantity(q: Quantity, system: UnitSystem, sig?: number): string {
  const unit = q.shown ?? preferredUnit(q.dim, q.si, system);
  // 1e308 mm² is a finite 1e302 m² that overflows in mm²: show such a value in SI base units.
  if (unit && Number.isFinite(q.si / unit.factor)) {
    const n = formatNumber(q.si / unit.factor, { significantFigures: sig });
    return unit.text ? `${n} ${unit.text}` : n;
  }
  const u = siUnitText(q.dim);
  return `${formatNumber(q.si, { significantFigures: sig })}${u ? ' ' + u : ''}`;
}

export { DIM, isDimensionless };
