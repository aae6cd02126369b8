/**
 * The result card of one `shear` block: each statement as formula, values substituted and result,
 * sections with their properties and figure, beams with their diagrams, checks with utilisation and
 * a verdict, and every diagnostic under the line it belongs to. Output is an HTML fragment in which
 * every string that came from the note is escaped.
 */
import type { BeamDiagram, BeamResult } from '../core/beam';
import { SIGN_CONVENTION } from '../core/beam';
import { CAUTION_SHORT } from '../core/cautions';
import type { Diagnostic } from '../core/diagnostic';
import { formatNumber } from '../core/format';
import { type BlockResult, formatQuantity, type StatementResult } from '../core/note';
import type { Statement } from '../core/statements';
import { DIM, lookupUnit, type UnitSystem } from '../core/units';
import { type BeamValue, quantity, type SectionValue } from '../core/values';
import { escapeHtml } from './escape';
import { beamDiagrams, type FigureColors, type HeightMark, sectionWithTau, sparkline } from './figures';
import { type FormulaContext, handCalc, stressCalls, type StressCall } from './formula';
import { renderFormula } from './math';

export interface CardOptions {
  system: UnitSystem;
  significantFigures?: number;
  /** Colours of the figures; pages restyle them with CSS in any case. */
  figureColors?: FigureColors;
  /** Put `code-line` on each row so an editor can sync scrolling to the statement's line. */
  lineAnchors?: boolean;
  /** Shared across the cards of one render: formulas left before the rest are shown as plain text. */
  budget?: RenderBudget;
}

/** Bounds per render, so a pathological note costs a bounded amount of typesetting. */
export interface RenderBudget {
  formulas: number;
  figures: number;
}

export function defaultBudget(): RenderBudget {
  return { formulas: 10000, figures: 1000 };
}

/** Rows beyond this many in one block are summarised instead of rendered. */
export const MAX_ROWS_PER_BLOCK = 400;

export interface BlockSummary {
  checks: number;
  failed: number;
  errors: number;
  warnings: number;
}

export function summarizeBlock(r: BlockResult): BlockSummary {
  return {
    checks: r.checks.length,
    failed: r.checks.filter((c) => !c.pass).length,
    errors: r.diagnostics.filter((d) => d.severity === 'error').length,
    warnings: r.diagnostics.filter((d) => d.severity === 'warning' && d.code !== 'check.fails').length,
  };
}

/** "2 checks pass", "1 of 3 checks fails · 1 error": the card's status line. */
export function statusText(s: BlockSummary): { text: string; tone: 'pass' | 'fail' | 'error' | 'none' } {
  const parts: string[] = [];
  if (s.checks) parts.push(s.failed ? `${s.failed} of ${s.checks} check${s.checks === 1 ? '' : 's'} fail${s.failed === 1 ? 's' : ''}` : `${s.checks === 1 ? 'check passes' : `all ${s.checks} checks pass`}`);
  if (s.errors) parts.push(`${s.errors} error${s.errors === 1 ? '' : 's'}`);
  if (s.warnings) parts.push(`${s.warnings} warning${s.warnings === 1 ? '' : 's'}`);
  const tone = s.errors ? 'error' : s.failed ? 'fail' : s.checks ? 'pass' : 'none';
  return { text: parts.join(' · ') || 'no checks', tone };
}

interface Row {
  line: number;
  lastLine: number;
  html: string;
}

/** The source text of a Markdown line inside the block, and the column its text starts at. */
function lineSource(r: BlockResult, line: number): { text: string; column: number } {
  const l = r.block.lines.find((x) => x.line === line);
  return l ? { text: l.text, column: l.column } : { text: '', column: 0 };
}

function trailingComment(text: string): string {
  const i = text.indexOf('#');
  return i < 0 ? '' : text.slice(i + 1).trim();
}

function codeOf(text: string): string {
  const i = text.indexOf('#');
  return (i < 0 ? text : text.slice(0, i)).trim();
}

function lastLineOf(st: Statement): number {
  if (st.kind === 'section') return Math.max(st.line, ...st.parts.map((p) => p.line));
  if (st.kind === 'beam') return Math.max(st.line, ...st.items.map((i) => i.line));
  return st.line;
}

function rowAttrs(line: number, kind: string, o: CardOptions, extra = ''): string {
  return `class="tl-row tl-row-${kind}${o.lineAnchors ? ' code-line' : ''}${extra}" data-line="${line}"`;
}

function diagnosticHtml(d: Diagnostic, o: CardOptions): string {
  const label = d.severity === 'error' ? 'Error' : d.severity === 'warning' ? 'Warning' : 'Note';
  return (
    `<div ${rowAttrs(d.line, 'diagnostic', o, ` tl-${d.severity}`)} role="${d.severity === 'error' ? 'alert' : 'note'}">` +
    `<span class="tl-diag-label">${label}</span> <span class="tl-diag-message">${escapeHtml(d.message)}</span>` +
    ` <span class="tl-diag-where">line ${d.line + 1}, column ${d.column + 1} · ${escapeHtml(d.code)}</span></div>`
  );
}

function formula(latex: string, plain: string, o: CardOptions): string {
  if (o.budget) {
    if (o.budget.formulas <= 0) return `<code class="tl-plain-formula">${escapeHtml(plain)}</code>`;
    o.budget.formulas--;
  }
  return renderFormula(latex, plain);
}

function figure(make: () => string, o: CardOptions): string {
  if (o.budget) {
    if (o.budget.figures <= 0) return '';
    o.budget.figures--;
  }
  try {
    return make();
  } catch {
    return '';
  }
}

/** The rendered body of a block: its rows, in source order, with diagnostics in place. */
export function renderBlockBody(r: BlockResult, o: CardOptions): string {
  const sig = o.significantFigures;
  const isUnit = (name: string) => !r.defines.has(name) && !r.reads.get(name) && lookupUnit(name) !== undefined;
  const ctxFor = (line: number): FormulaContext => {
    const src = lineSource(r, line);
    return {
      system: r.unitSystem,
      sig,
      isUnit,
      source: (e) => src.text.slice(Math.max(0, e.start - src.column), Math.max(0, e.end - src.column)),
    };
  };
  const statementRanges = r.statements.map((st) => ({ first: st.line, last: lastLineOf(st) }));
  const diagnosticsFor = new Map<number, Diagnostic[]>();
  const loose: Diagnostic[] = [];
  for (const d of r.diagnostics) {
    if (d.code === 'check.fails') continue;
    const k = statementRanges.findIndex((s) => d.line >= s.first && d.line <= s.last);
    if (k < 0) loose.push(d);
    else diagnosticsFor.set(k, [...(diagnosticsFor.get(k) ?? []), d]);
  }
  const figuresShown = new Set<string>();
  const groups = stressGroups(r, ctxFor);
  const rows: Row[] = [];
  r.statements.forEach((st, k) => {
    const res = r.results.find((x) => x.statement === st);
    let html = res ? statementHtml(res, r, o, ctxFor(st.line), groups, figuresShown) : '';
    for (const d of diagnosticsFor.get(k) ?? []) html += diagnosticHtml(d, o);
    rows.push({ line: st.line, lastLine: statementRanges[k]!.last, html });
  });
  for (const d of loose) rows.push({ line: d.line, lastLine: d.line, html: diagnosticHtml(d, o) });
  // Whole-line comments read as the engineer's prose between statements.
  for (const l of r.block.lines) {
    const m = /^\s*#\s?(.*)$/.exec(l.text);
    if (!m || !m[1]!.trim()) continue;
    if (statementRanges.some((s) => l.line > s.first && l.line <= s.last)) continue;
    rows.push({ line: l.line, lastLine: l.line, html: `<div ${rowAttrs(l.line, 'comment', o)}>${escapeHtml(m[1]!.trim())}</div>` });
  }
  rows.sort((a, b) => a.line - b.line);
  let out = '';
  const shown = rows.slice(0, MAX_ROWS_PER_BLOCK);
  for (const row of shown) out += row.html;
  if (rows.length > shown.length) {
    out += `<div class="tl-row tl-row-more">${rows.length - shown.length} more lines of this block are not shown here; split the block to see them.</div>`;
  }
  if (!rows.length) out += `<div class="tl-row tl-row-empty">This block has no statements yet.</div>`;
  return out;
}

/** Stress calls in the block grouped by section and force: the first of each group gets the full figure. */
function stressGroups(r: BlockResult, ctxFor: (line: number) => FormulaContext): Map<string, { call: StressCall; line: number }[]> {
  const groups = new Map<string, { call: StressCall; line: number }[]>();
  for (const res of r.results) {
    const st = res.statement;
    const exprs = st.kind === 'assign' ? [st.expr] : st.kind === 'check' ? [st.left, st.right] : [];
    for (const e of exprs) {
      for (const call of stressCalls(e, res.trace, ctxFor(st.line).source)) {
        const key = groupKey(call);
        groups.set(key, [...(groups.get(key) ?? []), { call, line: st.line }]);
      }
    }
  }
  return groups;
}

function groupKey(call: StressCall): string {
  return `${call.section.name}|${call.V}`;
}

function statementHtml(
  res: StatementResult,
  r: BlockResult,
  o: CardOptions,
  c: FormulaContext,
  groups: Map<string, { call: StressCall; line: number }[]>,
  figuresShown: Set<string>,
): string {
  const st = res.statement;
  const src = lineSource(r, st.line);
  const comment = trailingComment(src.text);
  const commentHtml = comment ? `<div class="tl-comment">${escapeHtml(comment)}</div>` : '';
  switch (st.kind) {
    case 'units':
      return `<div ${rowAttrs(st.line, 'units', o)}><span class="tl-units">Results shown in ${st.system === 'US' ? 'US customary units (kip, ksi, in)' : 'SI units (kN, MPa, mm)'}</span>${commentHtml}</div>`;
    case 'section':
      return sectionHtml(res, r, o, commentHtml);
    case 'beam':
      return beamHtml(res, r, o, commentHtml);
    case 'assign':
    case 'check': {
      const calc = handCalc(res, c);
      let body = '';
      if (calc) {
        const relation = st.kind === 'check';
        body += `<div class="tl-calc${relation ? ' tl-calc-check' : ''}">`;
        calc.steps.forEach((s, i) => {
          const joiner = i === 0 ? '' : relation ? '<span class="tl-then" aria-hidden="true">→</span>' : '';
          const eq = !relation && i > 0 ? '=\\;' : '';
          body += `<span class="tl-step">${joiner}${formula(eq + s.latex, (i > 0 && !relation ? '= ' : '') + s.plain, o)}</span>`;
        });
        body += '</div>';
        for (const n of calc.notes) body += `<div class="tl-note">${escapeHtml(n)}</div>`;
      } else {
        body += `<code class="tl-plain-formula">${escapeHtml(codeOf(src.text))}</code>`;
      }
      if (st.kind === 'check' && res.check) body += verdictHtml(res, o);
      const figureHtml = st.kind === 'assign' ? stressFigureHtml(res, o, c, groups, figuresShown) : '';
      const tone = st.kind === 'check' && res.check ? (res.check.pass ? ' tl-pass' : ' tl-fail') : res.failed ? ' tl-failed' : '';
      return `<div ${rowAttrs(st.line, st.kind, o, tone)}><div class="tl-row-main">${body}${commentHtml}</div>${figureHtml}</div>`;
    }
  }
}

function verdictHtml(res: StatementResult, o: CardOptions): string {
  const check = res.check!;
  const ratio = formatNumber(check.ratio, { significantFigures: Math.max(2, o.significantFigures ?? 3) });
  const fill = Math.max(0, Math.min(1, Number.isFinite(check.ratio) ? check.ratio : 1));
  return (
    `<div class="tl-verdict ${check.pass ? 'tl-pass' : 'tl-fail'}">` +
    `<span class="tl-verdict-word">${check.pass ? 'Pass' : 'Fail'}</span>` +
    `<span class="tl-util" aria-hidden="true"><span class="tl-util-bar" style="width:${(fill * 100).toFixed(1)}%"></span></span>` +
    `<span class="tl-ratio">utilisation ${escapeHtml(ratio)}</span></div>`
  );
}

function stressFigureHtml(
  res: StatementResult,
  o: CardOptions,
  c: FormulaContext,
  groups: Map<string, { call: StressCall; line: number }[]>,
  shown: Set<string>,
): string {
  const st = res.statement;
  // A line with an error draws no figure: its numbers may be the very ones that failed.
  if (st.kind !== 'assign' || res.failed) return '';
  const calls = stressCalls(st.expr, res.trace, c.source);
  if (!calls.length) return '';
  const call = calls[0]!;
  const peak = call.section.section.tauMax(call.V);
  if (peak.problem || !Number.isFinite(peak.value)) return '';
  const key = groupKey(call);
  const section = call.section.section;
  const options = { colors: o.figureColors ?? 'currentColor', system: c.system, significantFigures: o.significantFigures } as const;
  if (!shown.has(key)) {
    shown.add(key);
    const marks: HeightMark[] = [];
    for (const g of groups.get(key) ?? []) {
      if (g.call.y !== undefined && !marks.some((m) => Math.abs(m.y - g.call.y!) <= 1e-12)) marks.push({ y: g.call.y, label: g.call.yText ?? 'y' });
    }
    const V = formatQuantity(quantity(Math.abs(call.V), DIM.force), c.system, o.significantFigures);
    const svg = figure(() => sectionWithTau(section, call.V, { ...options, marks, title: `Section ${call.section.name} and shear stress for V = ${V}` }), o);
    if (!svg) return '';
    return `<figure class="tl-figure tl-figure-stress">${svg}<figcaption>Section ${escapeHtml(call.section.name)} to scale and τ(y) for V = ${escapeHtml(V)}</figcaption></figure>`;
  }
  const svg = figure(() => sparkline(section, call.V, { ...options, mark: call.callee === 'tau_max' ? section.tauMax(1).locations[0]?.y : call.y, title: `τ(y) of ${call.section.name}` }), o);
  return svg ? `<div class="tl-spark">${svg}</div>` : '';
}

function partsListHtml(lines: number[], r: BlockResult): string {
  if (!lines.length) return '';
  let out = '<ul class="tl-parts">';
  for (const line of lines) {
    const text = lineSource(r, line).text;
    const comment = trailingComment(text);
    out += `<li class="tl-part" data-line="${line}"><code>${escapeHtml(codeOf(text))}</code>${comment ? ` <span class="tl-part-note">${escapeHtml(comment)}</span>` : ''}</li>`;
  }
  return out + '</ul>';
}

function propsTable(rows: [string, string][]): string {
  let out = '<table class="tl-props"><tbody>';
  for (const [k, v] of rows) out += `<tr><th scope="row">${k}</th><td>${escapeHtml(v)}</td></tr>`;
  return out + '</tbody></table>';
}

function sectionHtml(res: StatementResult, r: BlockResult, o: CardOptions, commentHtml: string): string {
  const st = res.statement as Extract<Statement, { kind: 'section' }>;
  const head = `<div class="tl-object-head"><span class="tl-kind">Section</span> <span class="tl-object-name">${escapeHtml(st.target.name)}</span>${st.title ? ` <span class="tl-object-title">${escapeHtml(st.title)}</span>` : ''}</div>`;
  const parts = partsListHtml(st.parts.map((p) => p.line), r);
  const value = res.value?.kind === 'section' ? (res.value as SectionValue) : undefined;
  if (!value) return `<div ${rowAttrs(st.line, 'section', o, ' tl-failed')}>${head}${commentHtml}${parts}</div>`;
  const s = value.section;
  const f = (si: number, dim: typeof DIM.area) => formatQuantity(quantity(si, dim), r.unitSystem, o.significantFigures);
  const max = s.tauMax(1);
  const rows: [string, string][] = [
    ['Area <var>A</var>', f(s.area, DIM.area)],
    ['Centroid height <var>ȳ</var>', f(s.centroidY, DIM.length)],
    ['Second moment <var>I</var>', f(s.I, DIM.quartic)],
    ['Depth <var>h</var>', f(s.depth, DIM.length)],
    ['Second moment <var>I<sub>y</sub></var>', f(s.Iy, DIM.quartic)],
  ];
  if (!max.problem && max.locations.length) {
    rows.push(['Peak shear stress', `τmax = ${formatNumber(max.perV * s.area, { significantFigures: o.significantFigures })} V/A at y = ${f(max.locations[0]!.y, DIM.length)}`]);
  }
  const svg = figure(() => sectionWithTau(s, undefined, { colors: o.figureColors ?? 'currentColor', system: r.unitSystem, significantFigures: o.significantFigures, title: `Section ${value.name} to scale and the shape of τ(y)` }), o);
  const fig = svg ? `<figure class="tl-figure tl-figure-section">${svg}<figcaption>${escapeHtml(value.name)} to scale; τ(y) in multiples of V/A</figcaption></figure>` : '';
  const warnings = s.problems.map((p) => `<div class="tl-note">${escapeHtml(p.message)}</div>`).join('');
  return `<div ${rowAttrs(st.line, 'section', o)}><div class="tl-row-main">${head}${commentHtml}${parts}${propsTable(rows)}${warnings}</div>${fig}</div>`;
}

/** The solved beam behind a beam value: the combination it names, else the whole result (envelope). */
export function beamResultOf(value: BeamValue): BeamResult | BeamDiagram | undefined {
  const result = value.beam.result;
  if (!result) return undefined;
  return value.combination ? result.combination(value.combination) ?? result : result;
}

function beamHtml(res: StatementResult, r: BlockResult, o: CardOptions, commentHtml: string): string {
  const st = res.statement as Extract<Statement, { kind: 'beam' }>;
  const value = res.value?.kind === 'beam' ? (res.value as BeamValue) : undefined;
  const f = (si: number, dim: typeof DIM.force) => formatQuantity(quantity(si, dim), r.unitSystem, o.significantFigures);
  // Positions along a beam read in one unit (m or ft), whatever their size.
  const along = (si: number) => formatQuantity(quantity(si, DIM.length, r.unitSystem === 'US' ? { text: 'ft', factor: 0.3048 } : { text: 'm', factor: 1 }), r.unitSystem, o.significantFigures);
  const span = value ? ` <span class="tl-object-title">span ${escapeHtml(along(value.beam.span))}</span>` : '';
  const head = `<div class="tl-object-head"><span class="tl-kind">Beam</span> <span class="tl-object-name">${escapeHtml(st.target.name)}</span>${span}</div>`;
  const items = partsListHtml(st.items.map((i) => i.line), r);
  if (!value) return `<div ${rowAttrs(st.line, 'beam', o, ' tl-failed')}>${head}${commentHtml}${items}</div>`;
  const beam = value.beam;
  const combos = beam.combinationNames;
  let table = '<table class="tl-reactions"><thead><tr><th scope="col">Support at x</th>';
  const columns = combos.length > 1 && combos.length <= 4 ? combos : [];
  for (const c of columns) table += `<th scope="col">${escapeHtml(c)}</th>`;
  table += `<th scope="col">${columns.length ? 'Design (largest)' : 'Reaction R'}</th></tr></thead><tbody>`;
  const design = beam.reactions();
  const per = columns.map((c) => beam.reactions(c));
  design.forEach((rx, i) => {
    table += `<tr><td>${escapeHtml(along(rx.x))}</td>`;
    for (const list of per) table += `<td>${escapeHtml(list[i] ? f(list[i]!.R, DIM.force) : '')}</td>`;
    table += `<td>${escapeHtml(f(rx.R, DIM.force))}${rx.M ? `, M ${escapeHtml(f(rx.M, DIM.moment))}` : ''}</td></tr>`;
  });
  table += '</tbody></table>';
  const summary = beam.summary();
  const props = propsTable([
    ['Largest shear <var>V</var><sub>max</sub>', f(summary.Vmax, DIM.force)],
    ['Largest sagging moment <var>M</var><sub>max</sub>', f(summary.Mmax, DIM.moment)],
    ['Largest hogging moment <var>M</var><sub>min</sub>', f(summary.Mmin, DIM.moment)],
  ]);
  const solved = beamResultOf(value);
  const svg = solved ? figure(() => beamDiagrams(solved, { loads: value.beam.loads, colors: o.figureColors ?? 'currentColor', system: r.unitSystem, significantFigures: o.significantFigures, title: `Beam ${value.name}: shear force and bending moment` }), o) : '';
  const fig = svg ? `<figure class="tl-figure tl-figure-beam">${svg}<figcaption>V(x) and M(x) of ${escapeHtml(value.name)}${combos.length > 1 ? `, envelope of ${combos.length} combinations` : ''}</figcaption></figure>` : '';
  const convention = `<div class="tl-note tl-sign">Signs: ${escapeHtml(SIGN_CONVENTION)}</div>`;
  return `<div ${rowAttrs(st.line, 'beam', o, ' tl-row-wide')}><div class="tl-row-main">${head}${commentHtml}${items}${props}${table}</div>${fig}${convention}</div>`;
}

/** The caution carried by the last card of a page in the preview. */
export function cautionHtml(): string {
  return `<div class="tl-caution">${escapeHtml(CAUTION_SHORT)}</div>`;
}
