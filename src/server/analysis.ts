/**
 * What the server knows about one open note: the core's evaluation (kept incremental by a
 * NoteCache per document) or, when evaluation is off, the parse alone; plus an index of every name
 * written in the note (definitions and uses, resolved top to bottom the way the evaluator resolves
 * them) that hovers, navigation, completion and symbols share.
 */
import { type Block, extractBlocks } from '../core/blocks';
import type { Diagnostic } from '../core/diagnostic';
import type { Expr } from '../core/expression';
import { evaluateNote, NoteCache, type BlockResult, type NoteResult, type StatementResult } from '../core/note';
import { parseBlock, type Statement } from '../core/statements';
import type { UnitSystem } from '../core/units';
import type { ServerSettings } from './settings';

export interface NameSite {
  name: string;
  line: number;
  start: number;
  end: number;
}

export interface Definition extends NameSite {
  blockIndex: number;
  statement: Statement;
  kind: 'quantity' | 'section' | 'beam';
}

export interface Use extends NameSite {
  expr: Expr;
  statement: Statement;
  blockIndex: number;
  /** The definition this use reads, if the name is defined above it. */
  definition?: Definition;
}

/** A top-level expression of a statement, with the line it is written on. */
export interface ExprSite {
  line: number;
  expr: Expr;
  statement: Statement;
  blockIndex: number;
}

export interface NoteAnalysis {
  uri: string;
  version: number;
  text: string;
  readonly lines: string[];
  blocks: Block[];
  /** Statements per block (from the evaluation when there is one). */
  statements: Statement[][];
  /** Parse diagnostics when evaluation is off; the evaluation's diagnostics otherwise. */
  diagnostics: Diagnostic[];
  /** Undefined when evaluation is off (restricted mode without the setting). */
  note?: NoteResult;
  unitSystem: UnitSystem;
  readonly definitions: Definition[];
  readonly uses: Use[];
  readonly exprs: ExprSite[];
  /** Result of each statement (evaluation only). */
  readonly resultOf: Map<Statement, StatementResult>;
  readonly blockResultOf: Map<Statement, BlockResult>;
  /** Milliseconds the evaluation took, and how many blocks were reused from the cache. */
  evaluationMs: number;
  /** Milliseconds for the whole analysis: evaluation plus the name index. */
  analysisMs: number;
  reused: number;
}

/** The expressions a statement holds, each with the line it is on (section parts and beam items have their own lines). */
export function statementExprs(st: Statement): { line: number; expr: Expr }[] {
  const out: { line: number; expr: Expr }[] = [];
  switch (st.kind) {
    case 'assign':
      out.push({ line: st.line, expr: st.expr });
      break;
    case 'check':
      out.push({ line: st.line, expr: st.left }, { line: st.line, expr: st.right });
      break;
    case 'section':
      for (const p of st.parts) {
        for (const e of Object.values(p.dims)) out.push({ line: p.line, expr: e });
        if (p.at) out.push({ line: p.line, expr: p.at[0] }, { line: p.line, expr: p.at[1] });
        for (const [x, y] of p.points ?? []) out.push({ line: p.line, expr: x }, { line: p.line, expr: y });
      }
      break;
    case 'beam':
      out.push({ line: st.line, expr: st.span });
      for (const it of st.items) {
        if (it.kind === 'support') out.push({ line: it.line, expr: it.x });
        else if (it.kind === 'load') for (const e of Object.values(it.values)) out.push({ line: it.line, expr: e });
        else for (const t of it.terms) if (t.factor) out.push({ line: it.line, expr: t.factor });
      }
      break;
    case 'units':
      break;
  }
  return out;
}

/** Every name node inside an expression, including the objects of members and the arguments of calls. */
export function nameNodes(e: Expr, out: Extract<Expr, { kind: 'name' }>[] = []): Extract<Expr, { kind: 'name' }>[] {
  switch (e.kind) {
    case 'name':
      out.push(e);
      break;
    case 'member':
      nameNodes(e.object, out);
      break;
    case 'call':
      for (const a of e.args) nameNodes(a, out);
      break;
    case 'unary':
      nameNodes(e.operand, out);
      break;
    case 'binary':
      nameNodes(e.left, out);
      nameNodes(e.right, out);
      break;
    case 'paren':
      nameNodes(e.inner, out);
      break;
    case 'convert':
      nameNodes(e.value, out);
      break;
    case 'number':
      break;
  }
  return out;
}

/** The innermost expression node covering a column (the end column counts, so a cursor just after a word finds it). */
export function nodeAt(e: Expr, column: number): Expr | undefined {
  if (column < e.start || column > e.end) return undefined;
  const children: Expr[] =
    e.kind === 'member' ? [e.object] : e.kind === 'call' ? e.args : e.kind === 'unary' ? [e.operand] : e.kind === 'binary' ? [e.left, e.right] : e.kind === 'paren' ? [e.inner] : e.kind === 'convert' ? [e.value] : [];
  for (const c of children) {
    const hit = nodeAt(c, column);
    if (hit) return hit;
  }
  return e;
}

function definitionKind(st: Statement): Definition['kind'] {
  return st.kind === 'section' ? 'section' : st.kind === 'beam' ? 'beam' : 'quantity';
}

export class NoteStore {
  private caches = new Map<string, NoteCache>();
  private analyses = new Map<string, NoteAnalysis>();

  constructor(private readonly now: () => number = () => Date.now()) {}

  get(uri: string): NoteAnalysis | undefined {
    return this.analyses.get(uri);
  }

  forget(uri: string): void {
    this.caches.delete(uri);
    this.analyses.delete(uri);
  }

  /** Drops cached evaluations (after a settings change, every note must be re-evaluated). */
  invalidate(): void {
    this.analyses.clear();
  }

  /** The analysis of this version of the text, computing it (incrementally) if needed. */
  analyze(uri: string, version: number, text: string, settings: ServerSettings): NoteAnalysis {
    const known = this.analyses.get(uri);
    if (known && known.version === version && known.text === text) return known;
    let cache = this.caches.get(uri);
    if (!cache) {
      cache = new NoteCache();
      this.caches.set(uri, cache);
    }
    const started = this.now();
    let note: NoteResult | undefined;
    let blocks: Block[];
    let statements: Statement[][];
    let diagnostics: Diagnostic[];
    let unitSystem: UnitSystem = 'SI';
    if (settings.evaluate) {
      note = evaluateNote(text, { unitSystem: settings.unitSystem, significantFigures: settings.significantFigures, blockBudgetMs: 2000, now: this.now }, cache);
      blocks = note.blocks.map((b) => b.block);
      statements = note.blocks.map((b) => b.statements);
      diagnostics = note.diagnostics;
      unitSystem = note.unitSystem;
    } else {
      blocks = extractBlocks(text);
      const parsed = blocks.map((b) => parseBlock(b));
      statements = parsed.map((p) => p.statements);
      diagnostics = parsed.flatMap((p) => p.diagnostics);
      unitSystem = settings.unitSystem === 'US' ? 'US' : 'SI';
    }
    const evaluationMs = this.now() - started;
    // The name index and the split lines are built on first use: a keystroke that only needs
    // diagnostics never pays for them.
    let index: { definitions: Definition[]; uses: Use[]; exprs: ExprSite[] } | undefined;
    let lines: string[] | undefined;
    let resultOf: Map<Statement, StatementResult> | undefined;
    let blockResultOf: Map<Statement, BlockResult> | undefined;
    const results = () => {
      if (!resultOf || !blockResultOf) {
        resultOf = new Map();
        blockResultOf = new Map();
        for (const br of note?.blocks ?? []) {
          for (const r of br.results) resultOf.set(r.statement, r);
          for (const st of br.statements) blockResultOf.set(st, br);
        }
      }
      return { resultOf, blockResultOf };
    };
    const analysis: NoteAnalysis = {
      uri,
      version,
      text,
      get lines() {
        return (lines ??= text.split(/\r\n|\r|\n/));
      },
      blocks,
      statements,
      diagnostics,
      note,
      unitSystem,
      get definitions() {
        return (index ??= indexNames(statements)).definitions;
      },
      get uses() {
        return (index ??= indexNames(statements)).uses;
      },
      get exprs() {
        return (index ??= indexNames(statements)).exprs;
      },
      get resultOf() {
        return results().resultOf;
      },
      get blockResultOf() {
        return results().blockResultOf;
      },
      evaluationMs,
      analysisMs: 0,
      reused: note?.reused ?? 0,
    };
    analysis.analysisMs = this.now() - started;
    this.analyses.set(uri, analysis);
    return analysis;
  }
}

/** Resolves names the way the evaluator does: top to bottom, a definition visible from the next statement on. */
function indexNames(statements: Statement[][]): { definitions: Definition[]; uses: Use[]; exprs: ExprSite[] } {
  const out = { definitions: [] as Definition[], uses: [] as Use[], exprs: [] as ExprSite[] };
  const scope = new Map<string, Definition>();
  statements.forEach((list, blockIndex) => {
    for (const st of list) {
      for (const { line, expr } of statementExprs(st)) {
        out.exprs.push({ line, expr, statement: st, blockIndex });
        for (const n of nameNodes(expr)) {
          out.uses.push({ name: n.name, line, start: n.start, end: n.end, expr: n, statement: st, blockIndex, definition: scope.get(n.name) });
        }
      }
      if (st.kind === 'assign' || st.kind === 'section' || st.kind === 'beam') {
        const def: Definition = { name: st.target.name, line: st.line, start: st.target.start, end: st.target.end, blockIndex, statement: st, kind: definitionKind(st) };
        out.definitions.push(def);
        scope.set(def.name, def);
      }
    }
  });
  return out;
}

/** The block whose fenced lines contain a Markdown line, if any. */
export function blockAt(a: NoteAnalysis, line: number): number {
  for (let i = 0; i < a.blocks.length; i++) {
    const b = a.blocks[i]!;
    if (line > b.fenceLine && (line < b.endLine || (!b.closed && line <= b.endLine))) return i;
  }
  return -1;
}

/** The name written at a position: a definition or a use. */
export function nameAt(a: NoteAnalysis, line: number, character: number): { site: NameSite; definition?: Definition; use?: Use } | undefined {
  for (const d of a.definitions) {
    if (d.line === line && character >= d.start && character <= d.end) return { site: d, definition: d };
  }
  for (const u of a.uses) {
    if (u.line === line && character >= u.start && character <= u.end) return { site: u, definition: u.definition, use: u };
  }
  return undefined;
}

/** The statement written on a line (its header line, or a part or load line under it). */
export function statementAt(a: NoteAnalysis, line: number): { statement: Statement; blockIndex: number } | undefined {
  const bi = blockAt(a, line);
  if (bi < 0) return undefined;
  for (const st of a.statements[bi] ?? []) {
    if (st.line === line) return { statement: st, blockIndex: bi };
    if (st.kind === 'section' && st.parts.some((p) => p.line === line)) return { statement: st, blockIndex: bi };
    if (st.kind === 'beam' && st.items.some((p) => p.line === line)) return { statement: st, blockIndex: bi };
  }
  return undefined;
}

/** The innermost expression node at a position, with the statement it belongs to. */
export function exprAt(a: NoteAnalysis, line: number, character: number): { node: Expr; site: ExprSite } | undefined {
  for (const site of a.exprs) {
    if (site.line !== line) continue;
    const node = nodeAt(site.expr, character);
    if (node) return { node, site };
  }
  return undefined;
}

/** All occurrences (definition first) of the name defined by `def`. */
export function occurrencesOf(a: NoteAnalysis, def: Definition): NameSite[] {
  return [def, ...a.uses.filter((u) => u.definition === def)];
}

/** Definitions visible at a line: those above it, the latest of each name. */
export function definitionsVisibleAt(a: NoteAnalysis, line: number): Map<string, Definition> {
  const out = new Map<string, Definition>();
  for (const d of a.definitions) if (d.line < line) out.set(d.name, d);
  return out;
}
