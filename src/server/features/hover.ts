/**
 * Hovers. On a quantity name: its value and its formula with values substituted. On a section
 * name: its properties and a picture of the section to scale beside its tau(y) diagram. On a
 * tau / tau_max / flow call: a sparkline of the distribution and the value. On a check: the
 * utilisation as a bar, and the cautions. On a beam: V(x) and M(x).
 */
import type { Hover, MarkupContent, Position } from 'vscode-languageserver';
import { CAUTION_SHORT } from '../../core/cautions';
import { BEAM_MEMBERS, FUNCTIONS, SECTION_MEMBERS } from '../../core/evaluate';
import type { Expr } from '../../core/expression';
import type { CheckResult } from '../../core/note';
import type { Section } from '../../core/section/section';
import type { Statement } from '../../core/statements';
import { DIM, type UnitSystem } from '../../core/units';
import { quantity, type BeamValue, type SectionValue, type Value } from '../../core/values';
import { type Definition, exprAt, nameAt, type NoteAnalysis, statementAt } from '../analysis';
import { checkBadge, isLiteral, type Presenter, presenter, ratioText, substitute } from '../present';
import type { ServerSettings } from '../settings';
import { beamDiagrams, sectionWithTau, sparkline as tauSparkline } from '../../render/figures';
import type { ThemeKind } from '../settings';
import { figureColors, forHover, markdownImage, paletteFor, type Palette, ratioBar, sparkline } from './pictures';

export function hover(a: NoteAnalysis, pos: Position, settings: ServerSettings): Hover | null {
  const line = pos.line;
  const ch = pos.character;
  const st = statementAt(a, line);
  if (!st) return null;
  const pr = presenter(a, settings);
  const palette = paletteFor(settings.themeKind);
  const md = (parts: (string | undefined)[]): Hover => ({ contents: { kind: 'markdown', value: parts.filter((p) => p !== undefined && p !== '').join('\n\n') } satisfies MarkupContent });

  if (!a.note) {
    const named = nameAt(a, line, ch);
    if (!named) return null;
    return md([`**${named.site.name}**`, '_Not evaluated: this workspace is not trusted and `tauline.evaluateInRestrictedMode` is off._']);
  }

  // A name (its definition or a use).
  const named = nameAt(a, line, ch);
  if (named) {
    const def = named.definition;
    const traced = named.use ? a.resultOf.get(named.use.statement)?.trace.get(named.use.expr) : undefined;
    const value = def ? valueOfDefinition(a, def) : traced;
    if (!value) {
      if (named.use && !def) return md([`**${named.site.name}**: not defined above this line.`]);
      return null;
    }
    if (value.kind === 'section') return md(sectionHover(a, value, pr, settings.themeKind, def));
    if (value.kind === 'beam') return md(beamHover(value, pr, settings.themeKind, def));
    if (value.kind === 'quantity') return md(quantityHover(a, named.site.name, def, pr));
    return null;
  }

  // A member or a call.
  const at = exprAt(a, line, ch);
  if (at) {
    const res = a.resultOf.get(at.site.statement);
    const node = at.node;
    if (node.kind === 'call' && ch <= node.calleeEnd && res) {
      const out = callHover(node, res.trace, pr, palette, settings.themeKind);
      if (out) return md(out);
    }
    if (node.kind === 'member' && res) {
      const v = res.trace.get(node);
      const obj = res.trace.get(node.object);
      if (v && v.kind === 'beam') return md(beamHover(v, pr, settings.themeKind, undefined));
      if (v && v.kind === 'quantity') {
        const what = obj?.kind === 'section' ? SECTION_MEMBERS[node.member] : obj?.kind === 'beam' ? BEAM_MEMBERS[node.member] : undefined;
        return md([`**${a.lines[line]!.slice(node.start, node.end)}** = ${pr.q(v)}`, what ? `_${what}_` : undefined]);
      }
    }
  }

  // Anywhere else on a check line: the check.
  const res = a.resultOf.get(st.statement);
  if (st.statement.kind === 'check' && res?.check) return md(checkHover(a, st.statement, res.check, res.trace, pr, palette));
  return null;
}

function valueOfDefinition(a: NoteAnalysis, def: Definition): Value | undefined {
  return a.resultOf.get(def.statement)?.value;
}

function quantityHover(a: NoteAnalysis, name: string, def: Definition | undefined, pr: Presenter): string[] {
  if (!def || def.statement.kind !== 'assign') return [`**${name}**`];
  const res = a.resultOf.get(def.statement);
  if (!res || !res.value || res.value.kind !== 'quantity') return [`**${name}**: not evaluated (see the problem on line ${def.line + 1}).`];
  const lineText = a.lines[def.line] ?? '';
  const expr = def.statement.expr;
  const written = lineText.slice(expr.start, expr.end);
  const rows = [`${name} = ${written}`];
  const pad = ' '.repeat(name.length + 1);
  if (!isLiteral(expr)) {
    const sub = substitute(expr, res.trace, lineText, pr);
    if (sub !== written) rows.push(`${pad}= ${sub}`);
  }
  const result = res.text ?? pr.q(res.value);
  if (rows[rows.length - 1] !== `${pad}= ${result}` && written !== result) rows.push(`${pad}= ${result}`);
  return [`**${name}** = ${result}`, '```text\n' + rows.join('\n') + '\n```', `_defined on line ${def.line + 1}_`];
}

/** The largest shear force this section is used with in the note, for drawing tau(y). */
function designShearFor(a: NoteAnalysis, section: SectionValue): number | undefined {
  let best: number | undefined;
  for (const r of a.resultOf.values()) {
    for (const [e, v] of r.trace) {
      if (e.kind !== 'call' || v.kind !== 'quantity' || !['tau', 'tau_max', 'flow'].includes(e.callee)) continue;
      const s = r.trace.get(e.args[0]!);
      const V = e.args[1] ? r.trace.get(e.args[1]) : undefined;
      if (s?.kind === 'section' && s.section === section.section && V?.kind === 'quantity' && (best === undefined || Math.abs(V.si) > Math.abs(best))) best = V.si;
    }
  }
  return best;
}

function unitShear(system: UnitSystem): { si: number; text: string } {
  return system === 'US' ? { si: 4448.2216152605, text: '1 kip' } : { si: 1000, text: '1 kN' };
}

function sectionHover(a: NoteAnalysis, v: SectionValue, pr: Presenter, theme: ThemeKind, def: Definition | undefined): string[] {
  const s = v.section;
  const found = designShearFor(a, v);
  const V = found ?? unitShear(pr.system).si;
  const Vtext = found !== undefined ? pr.q(quantity(found, DIM.force)) : unitShear(pr.system).text;
  const Qna = s.firstMoment(s.centroidY).value;
  const tm = s.tauMax(V);
  const yMax = tm.locations.map((l) => l.y);
  const rows: [string, string][] = [
    ['A', pr.q(quantity(s.area, DIM.area))],
    ['yc (neutral axis above the lowest point)', pr.length(s.centroidY)],
    ['I', pr.q(quantity(s.I, DIM.quartic))],
    ['depth', pr.length(s.depth)],
    ['Q at the neutral axis', pr.q(quantity(Qna, DIM.volume))],
    ['tau_max at height', yMax.length ? yMax.map((y) => pr.length(y)).join(' and ') : '—'],
  ];
  const tauMaxText = pr.q(quantity(Math.abs(tm.value), DIM.stress));
  const svg = forHover(
    sectionWithTau(s, V, {
      colors: figureColors(theme),
      system: pr.system,
      significantFigures: pr.sig,
      maxWidth: 130,
      maxHeight: 150,
      plotWidth: 130,
      title: `Section ${v.name} to scale beside tau(y) for V = ${Vtext}`,
    }),
    theme,
  );
  const table = ['| property | value |', '|---|---|', ...rows.map(([k, val]) => `| ${k} | ${val} |`)].join('\n');
  return [
    `**section ${v.name}**${v.title ? ` — ${escapeMd(v.title)}` : ''}`,
    markdownImage(`Section ${v.name} to scale beside its shear stress distribution`, svg),
    table,
    `tau_max = ${tauMaxText} for V = ${Vtext}${found === undefined ? ' (no shear force is used with this section yet)' : ' (the largest V used with this section in the note)'}`,
    def ? `_defined on line ${def.line + 1}_` : undefined,
  ].filter((x): x is string => !!x);
}

function escapeMd(s: string): string {
  return s.replace(/[\\`*_{}\[\]()#+!|<>]/g, (c) => '\\' + c);
}

function beamHover(b: BeamValue, pr: Presenter, theme: ThemeKind, def: Definition | undefined): string[] {
  const reactions = b.beam.reactions(b.combination);
  const sum = b.beam.summary(b.combination);
  const svg = forHover(
    beamDiagrams(b.beam.result, {
      loads: b.beam.loads,
      colors: figureColors(theme),
      system: pr.system,
      significantFigures: pr.sig,
      width: 400,
      combination: b.combination,
      title: `Beam ${b.name}: shear force and bending moment diagrams`,
    }),
    theme,
  );
  const rows = [
    `| | |`,
    `|---|---|`,
    `| Vmax (largest magnitude) | ${pr.q(quantity(Math.abs(sum.Vmax), DIM.force))} |`,
    `| Mmax (sagging) | ${pr.q(quantity(sum.Mmax, DIM.moment))} |`,
    `| Mmin (hogging) | ${pr.q(quantity(sum.Mmin, DIM.moment))} |`,
    ...reactions.map((r) => `| reaction at x = ${pr.length(r.x)} | ${pr.q(quantity(r.R, DIM.force))}${r.M !== undefined ? `, ${pr.q(quantity(r.M, DIM.moment))}` : ''} |`),
  ].join('\n');
  const combos = b.beam.combinationNames;
  return [
    `**beam ${b.name}**${b.combination ? ` — combination ${b.combination}` : combos.length ? ` — envelope of ${combos.join(', ')}` : ''}`,
    markdownImage(`Shear force and bending moment diagrams of beam ${b.name}`, svg),
    rows,
    def ? `_defined on line ${def.line + 1}_` : undefined,
  ].filter((x): x is string => !!x);
}

function callHover(call: Extract<Expr, { kind: 'call' }>, trace: Map<Expr, Value>, pr: Presenter, palette: Palette, theme: ThemeKind): string[] | undefined {
  const info = Object.prototype.hasOwnProperty.call(FUNCTIONS, call.callee) ? FUNCTIONS[call.callee] : undefined;
  const value = trace.get(call);
  const head = info ? ['`' + info.signature + '`', info.doc] : [];
  if (!value || value.kind !== 'quantity') return head.length ? head : undefined;
  const out = [`**${call.callee}** = ${pr.q(value)}`, ...head];
  if (call.callee !== 'tau' && call.callee !== 'tau_max' && call.callee !== 'flow') return out;
  const s = trace.get(call.args[0]!);
  const V = call.args[1] ? trace.get(call.args[1]) : undefined;
  if (s?.kind !== 'section' || V?.kind !== 'quantity') return out;
  const section: Section = s.section;
  const isFlow = call.callee === 'flow';
  let markY: number | undefined;
  if (call.callee === 'tau_max') markY = section.tauMax(V.si).locations[0]?.y;
  else {
    const y = trace.get(call.args[2]!);
    if (y?.kind === 'quantity') markY = y.si;
  }
  let svg: string;
  if (isFlow) {
    // q(y) = V·Q(y)/I: its shape is Q's, not tau's, wherever the width changes.
    const prof = section.profile(64);
    const values = Float64Array.from(prof.tauPerV, (t, i) => t * prof.width[i]! * V.si);
    svg = sparkline(
      { title: `Shear flow over the depth of ${s.name}`, y: prof.y, value: values, mark: markY !== undefined ? { y: markY, value: value.si } : undefined, left: 'bottom', right: `top · q(y) of ${s.name}` },
      palette,
    );
  } else {
    svg = forHover(tauSparkline(section, V.si, { colors: figureColors(theme), width: 220, height: 48, mark: markY, title: `Shear stress over the depth of ${s.name}` }), theme);
  }
  out.splice(1, 0, markdownImage(`${isFlow ? 'Shear flow' : 'Shear stress'} distribution of ${s.name}`, svg));
  if (markY !== undefined) out.push(`at y = ${pr.length(markY)} above the lowest point, V = ${pr.q(V)}`);
  return out;
}

function checkHover(a: NoteAnalysis, st: Extract<Statement, { kind: 'check' }>, c: CheckResult, trace: Map<Expr, Value>, pr: Presenter, palette: Palette): string[] {
  const lineText = a.lines[st.line] ?? '';
  const svg = ratioBar({ ratio: c.ratio, pass: c.pass, label: checkBadge(c) }, palette);
  const left = substitute(st.left, trace, lineText, pr);
  const right = substitute(st.right, trace, lineText, pr);
  const rows = [`check ${c.text}`];
  const values = `${c.leftText} ${st.op} ${c.rightText}`;
  if (`${left} ${st.op} ${right}` !== values) rows.push(`      ${left} ${st.op} ${right}`);
  rows.push(`      ${values}  →  ${c.pass ? 'pass' : 'FAIL'}, utilisation ${ratioText(c.ratio)}`);
  return [
    `**check ${c.pass ? 'passes' : 'FAILS'}** — utilisation ${ratioText(c.ratio)}`,
    markdownImage(`Utilisation ${ratioText(c.ratio)} of 1.0`, svg),
    '```text\n' + rows.join('\n') + '\n```',
    `_${CAUTION_SHORT}_`,
  ];
}
