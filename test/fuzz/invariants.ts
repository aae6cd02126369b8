/**
 * What must hold for every note, however broken: the oracles the fuzz and hostile suites share.
 * Each function returns the violations it found (empty when all is well), worded so that a failing
 * property says what went wrong without a debugger.
 */
import { splitLines } from '../../src/core/blocks';
import { noteToJson } from '../../src/core/contract';
import type { Diagnostic } from '../../src/core/diagnostic';
import type { NoteResult } from '../../src/core/note';
import type { Section } from '../../src/core/section';
import type { Value } from '../../src/core/values';

/**
 * Codes that mean an exception escaped a component and was caught by a safety net further out:
 * the net kept the promise "never throws", but the exception itself is a bug.
 */
export function isInternalFault(d: { code: string; message: string }): boolean {
  if (d.code === 'internal' || d.code === 'syntax.error' || d.code === 'beam.internal') return true;
  if (d.code === 'section.check-incomplete' && d.message.includes('could not be built:')) return true;
  return false;
}

/** Words a result may only show when the note itself wrote them. */
const NON_FINITE_WORDS = ['NaN', 'Infinity', '∞', 'not a number', 'undefined', '[object Object]'];

function leaked(shown: string, source: string): string | undefined {
  return NON_FINITE_WORDS.find((w) => shown.includes(w) && !source.includes(w));
}

function describe(v: unknown): string {
  const s = typeof v === 'string' ? v : JSON.stringify(v);
  return s === undefined ? String(v) : s.length > 200 ? `${s.slice(0, 200)}…` : s;
}

export function checkDiagnostic(d: Diagnostic, lineCount: number, source: string, where: string, out: string[]): void {
  if (isInternalFault(d)) out.push(`${where}: internal fault surfaced as ${d.code}: ${d.message}`);
  if (typeof d.code !== 'string' || !/^[a-z]+(\.[a-z0-9-]+)*$/.test(d.code)) out.push(`${where}: bad code ${describe(d.code)}`);
  if (d.severity !== 'error' && d.severity !== 'warning' && d.severity !== 'info') out.push(`${where}: bad severity ${describe(d.severity)}`);
  if (typeof d.message !== 'string' || d.message.trim() === '') out.push(`${where}: empty message for ${d.code}`);
  else {
    const w = leaked(d.message, source);
    if (w) out.push(`${where}: message of ${d.code} shows "${w}": ${d.message}`);
  }
  if (!Number.isInteger(d.line) || d.line < 0 || d.line >= lineCount) out.push(`${where}: ${d.code} on line ${d.line} of a ${lineCount}-line note`);
  if (!Number.isInteger(d.column) || !Number.isInteger(d.endColumn) || d.column < 0 || d.endColumn < d.column) out.push(`${where}: ${d.code} has columns ${d.column}..${d.endColumn}`);
}

function checkSection(s: Section, where: string, out: string[]): void {
  const fields: [string, number][] = [['area', s.area], ['centroidX', s.centroidX], ['centroidY', s.centroidY], ['I', s.I], ['Iy', s.Iy], ['Ixy', s.Ixy], ['depth', s.depth], ['width', s.width], ['bottom', s.bottom], ['left', s.left]];
  for (const [k, v] of fields) if (!Number.isFinite(v)) out.push(`${where}: section ${k} is ${v}`);
  if (!(s.area > 0)) out.push(`${where}: section area ${s.area} is not positive`);
  if (!(s.I > 0)) out.push(`${where}: section I ${s.I} is not positive`);
}

function checkValue(v: Value | undefined, where: string, out: string[]): void {
  if (!v) return;
  if (v.kind === 'quantity') {
    if (!Number.isFinite(v.si)) out.push(`${where}: quantity ${v.si}`);
    if (v.dim.some((e) => !Number.isFinite(e))) out.push(`${where}: dimension ${describe(v.dim)}`);
  } else if (v.kind === 'section') {
    checkSection(v.section, where, out);
  } else if (v.kind === 'beam') {
    const names = [undefined, ...v.beam.combinationNames, ...v.beam.groupNames];
    for (const n of names) {
      const s = v.beam.summary(n);
      for (const [k, x] of Object.entries(s)) if (!Number.isFinite(x)) out.push(`${where}: beam ${n ?? 'envelope'} ${k} = ${x}`);
      for (const r of v.beam.reactions(n)) if (!Number.isFinite(r.x) || !Number.isFinite(r.R) || (r.M !== undefined && !Number.isFinite(r.M))) out.push(`${where}: reaction ${describe(r)}`);
    }
  }
}

/** Walks a JSON value and reports every number that is not finite (JSON.stringify would turn it into null). */
export function nonFiniteNumbers(v: unknown, path = '$', out: string[] = [], seen = new Set<unknown>()): string[] {
  if (typeof v === 'number') {
    if (!Number.isFinite(v)) out.push(`${path} = ${v}`);
  } else if (v && typeof v === 'object') {
    if (seen.has(v)) return out;
    seen.add(v);
    for (const [k, x] of Object.entries(v)) nonFiniteNumbers(x, `${path}.${k}`, out, seen);
  }
  return out;
}

/**
 * Violations caused by bugs already pinned with `it.fails` in regressions.test.ts (owners are
 * fixing them), so a long run keeps looking for new ones. Remove an entry when its fix lands: the
 * pinned test then fails and says so.
 */
const KNOWN_BUGS: { name: string; pattern: RegExp }[] = [
  { name: 'beam-tiny-span', pattern: /beam\.internal: The solved forces do not balance/ },
  { name: 'section-sliver-part', pattern: /^part summary .*"(centroidY|firstMoment)":null/ },
];

/** A problem from an engine's internal-fault net that a pinned bug explains. */
export function isKnownFault(p: { code: string; message: string }): boolean {
  return withoutKnownBugs([`internal fault surfaced as ${p.code}: ${p.message}`]).length === 0;
}

export function withoutKnownBugs(violations: string[]): string[] {
  return violations.filter((v) => !KNOWN_BUGS.some((k) => k.pattern.test(v)));
}

/** Everything a NoteResult and its JSON contract must satisfy. */
export function checkNote(text: string, note: NoteResult, options: { includeKnownBugs?: boolean } = {}): string[] {
  const out: string[] = [];
  const src = text.charCodeAt(0) === 0xfeff ? text.slice(1) : text;
  const lineCount = splitLines(src).length;
  for (const b of note.blocks) {
    for (const d of b.diagnostics) checkDiagnostic(d, lineCount, text, `block ${b.block.index}`, out);
    for (const r of b.results) {
      const where = `line ${r.statement.line}`;
      if (r.text !== undefined) {
        const w = leaked(r.text, text);
        if (w) out.push(`${where}: result text shows "${w}": ${r.text}`);
      }
      checkValue(r.value, where, out);
      for (const [, v] of r.trace) checkValue(v, `${where} (trace)`, out);
    }
    for (const c of b.checks) {
      if (!Number.isFinite(c.ratio)) out.push(`check on line ${c.line}: ratio ${c.ratio}`);
      if (!Number.isFinite(c.left.si) || !Number.isFinite(c.right.si)) out.push(`check on line ${c.line}: sides ${c.left.si}, ${c.right.si}`);
      for (const s of [c.leftText, c.rightText]) {
        const w = leaked(s, text);
        if (w) out.push(`check on line ${c.line}: shows "${w}": ${s}`);
      }
    }
  }
  let json: unknown;
  try {
    json = noteToJson('note.md', note);
  } catch (e) {
    out.push(`noteToJson threw: ${e instanceof Error ? e.stack : String(e)}`);
    return out;
  }
  for (const p of nonFiniteNumbers(json)) out.push(`JSON contract: ${p}`);
  const round = JSON.parse(JSON.stringify(json)) as unknown;
  if (JSON.stringify(round) !== JSON.stringify(json)) out.push('JSON contract does not survive a round trip');
  return options.includeKnownBugs ? out : withoutKnownBugs(out);
}

/**
 * Checks rendered HTML for markup a note could have injected: script elements, event-handler or
 * unknown-scheme attributes, and raw text that should have been escaped. `html` is markdown-it
 * output with raw HTML off, so any such markup came from our plugin.
 */
export function checkHtml(html: string, source: string, options: { includeKnownBugs?: boolean } = {}): string[] {
  const out: string[] = [];
  for (const m of html.matchAll(/<\/?([a-zA-Z][a-zA-Z0-9:-]*)((?:\s+[^\s=>/"']+(?:\s*=\s*(?:"[^"]*"|'[^']*'|[^\s>"']+))?)*)\s*\/?>/g)) {
    const tag = m[1]!.toLowerCase();
    if (tag === 'script' || tag === 'iframe' || tag === 'object' || tag === 'embed' || tag === 'foreignobject' || tag === 'base' || tag === 'meta' || tag === 'link' || tag === 'form') out.push(`<${tag}> element in the output`);
    for (const a of (m[2] ?? '').matchAll(/\s+([^\s=>/"']+)(?:\s*=\s*("[^"]*"|'[^']*'|[^\s>"']+))?/g)) {
      const name = a[1]!.toLowerCase();
      const value = (a[2] ?? '').replace(/^["']|["']$/g, '').replace(/&#x?[0-9a-f]+;?|&[a-z]+;/gi, '').replace(/[\s\0]/g, '').toLowerCase();
      if (name.startsWith('on')) out.push(`event attribute ${name} on <${tag}>`);
      if ((name === 'href' || name === 'src' || name === 'xlink:href' || name === 'action' || name === 'formaction') && /^(javascript|vbscript|data:text)/.test(value)) out.push(`${name}=${value.slice(0, 40)} on <${tag}>`);
      if (name === 'style' && /expression\(|url\(\s*['"]?\s*javascript/i.test(value)) out.push(`script in a style attribute on <${tag}>`);
    }
  }
  // A `<` from the note must arrive as &lt;: a raw `<` followed by a letter in text is markup we did not write.
  const stripped = html.replace(/<\/?[a-zA-Z][^>]*>/g, '').replace(/<!--[\s\S]*?-->/g, '');
  if (/<[a-zA-Z!/?]/.test(stripped)) out.push(`unescaped "<" in text: ${stripped.slice(stripped.search(/<[a-zA-Z!/?]/), stripped.search(/<[a-zA-Z!/?]/) + 60)}`);
  const text = html.replace(/<[^>]*>/g, ' ').replace(/&lt;/g, '<').replace(/&gt;/g, '>').replace(/&quot;/g, '"').replace(/&#39;/g, "'").replace(/&amp;/g, '&');
  const w = NON_FINITE_WORDS.filter((x) => x !== 'undefined').find((x) => text.includes(x) && !source.includes(x));
  if (w) out.push(`rendered text shows "${w}"`);
  // KaTeX sets each letter apart, so look for a function's source text with the spaces taken out.
  if (/\[nativecode\]/.test(text.replace(/\s+/g, '')) && !source.includes('native')) out.push('rendered text shows a function\'s source ([native code]): a prototype member was read as a symbol');
  return options.includeKnownBugs ? out : withoutKnownBugs(out);
}

/** Object.prototype and friends as they are now, to compare after running hostile input. */
export function prototypeSnapshot(): string {
  const describeObject = (o: object) =>
    Object.getOwnPropertyNames(o)
      .sort()
      .map((k) => {
        const d = Object.getOwnPropertyDescriptor(o, k)!;
        return `${k}:${typeof d.value}:${typeof d.get}:${typeof d.set}:${d.writable}:${d.enumerable}:${d.configurable}`;
      })
      .join(',');
  return [Object.prototype, Function.prototype, Array.prototype, String.prototype, Number.prototype, Map.prototype, Object].map((o) => describeObject(o as object)).join('\n');
}
