/**
 * Results stamps: a compact Markdown table of a block's results written into the note itself, right
 * after the block's closing fence, between two HTML comments of our own. A code host renders the
 * table (the comments vanish), and a pull-request diff shows exactly which numbers moved.
 *
 * A stamped block looks like this (the blank lines keep every CommonMark/GFM renderer from running
 * the table into the end marker, and keep Markdown formatters from reflowing it):
 *
 *     ```shear Design shear
 *     V = B1.Vmax
 *     ```
 *
 *     <!-- tauline-results: written by `tauline stamp`; edits inside are replaced -->
 *
 *     | Result | Value | Check |
 *     | --- | --- | --- |
 *     | `V` | 66.6 kN | |
 *
 *     <!-- /tauline-results -->
 *
 * Contracts every function here keeps:
 * - Nothing outside a stamp changes: stamping inserts text at the end of a closing-fence line (before
 *   its line ending) and rewrites only what lies between the two markers; stripping removes exactly
 *   what stamping inserted. BOMs, CRLF/LF/CR, trailing spaces and a missing final newline survive.
 * - A stamp's content depends only on results, never on line numbers, so editing prose above a
 *   block never makes its stamp stale; a block whose results did not change keeps its stamp byte
 *   for byte (tables are compared cell by cell, so a formatter's column padding is not a change).
 * - Damaged markers (an end marker missing, nested markers, a stamp not after a block, an end
 *   marker without a start) are reported as problems and that stamp is left untouched: never guessed.
 * - Markers inside code (fenced or indented) are text, not markers, so a note can show an example.
 * - Pure: no file system; bad input comes back as problems, never as an exception.
 */
import MarkdownIt from 'markdown-it';
import { type Block, BLOCK_LANGUAGE, extractBlocks } from './blocks';
import { formatNumber } from './format';
import type { BlockResult, NoteResult, StatementResult } from './note';
import { DIM, preferredUnit, siUnitText, type Dimension, type UnitSystem } from './units';

/** The start marker as stamping writes it; any HTML comment line starting `<!-- tauline-results` (not `/`) is read as a start marker. */
export const STAMP_BEGIN = '<!-- tauline-results: written by `tauline stamp`; edits inside are replaced -->';
/** The end marker as stamping writes it; a line starting `<!-- /tauline-results` is read as an end marker. */
export const STAMP_END = '<!-- /tauline-results -->';

export const STAMP_HEADER = ['Result', 'Value', 'Check'] as const;

export type StampProblemCode =
  /** A start marker whose end marker is missing before the next `shear` block or the end of the file. */
  | 'stamp.missing-end'
  /** A start marker inside another stamp. */
  | 'stamp.nested'
  /** A stamp that does not follow a closed `shear` block (only blank lines may sit between them). */
  | 'stamp.not-after-block'
  /** An end marker with no start marker before it. */
  | 'stamp.stray-end'
  /** A block whose fence is never closed cannot carry a stamp: it would land inside the block. */
  | 'stamp.unclosed-block'
  /** The NoteResult passed in was not evaluated from this text (blocks sit on other lines). */
  | 'stamp.note-mismatch';

export interface StampProblem {
  code: StampProblemCode;
  /** 'error' for damaged markers (the file needs a person's eye); 'warning' for a block that cannot be stamped. */
  severity: 'error' | 'warning';
  message: string;
  /** 0-based line of the marker (or the block's fence) the problem is about. */
  line: number;
  /** The block the problem belongs to, when there is one. */
  blockIndex?: number;
}

/** A stamp found in a note, attached to the block it follows. Lines are 0-based. */
export interface FoundStamp {
  blockIndex: number;
  beginLine: number;
  endLine: number;
}

/** One result whose stamped text differs from what the note computes now. Texts are as a reader sees them (no Markdown escapes). */
export interface StampChange {
  /** The result's name (`V`, `G2`) or, for a check, its text (`t_max <= tau_allow`). */
  name: string;
  /** The text in the stamp; absent when the result is new. */
  oldText?: string;
  /** The text the note computes now; absent when the result is gone. */
  newText?: string;
}

export interface StaleStamp {
  blockIndex: number;
  title: string;
  /** 0-based line of the block's opening fence. */
  fenceLine: number;
  /** 'changed': the stamp differs from the results; 'missing': other blocks of the note are stamped but this one is not. */
  reason: 'changed' | 'missing';
  /** 0-based lines of the start and end markers (absent when missing). */
  stampLine?: number;
  stampEndLine?: number;
  changes: StampChange[];
}

/** A replacement in the input text, UTF-16 offsets [start, end): an editor can apply these as text edits. */
export interface StampEdit {
  start: number;
  end: number;
  newText: string;
}

export interface StampOutcome {
  /** The new text (the input itself when nothing changed). */
  text: string;
  changed: boolean;
  problems: StampProblem[];
  /** The edits that turn the input into `text`, in order, not overlapping. */
  edits: StampEdit[];
  /** How many blocks got a new or rewritten stamp (stampText) or lost one (stripStamps). */
  blocks: number;
}

export interface StampOptions {
  /** Stamp only these blocks (by BlockResult.block.index); all blocks when absent. */
  blocks?: readonly number[];
  /** Significant figures for the texts this module formats itself (section and beam summaries, ratios); 3 by default. Quantity texts come from the note as evaluated. */
  significantFigures?: number;
}

/**
 * Writes or refreshes the stamp after every closed `shear` block. `note` must be the evaluation of
 * this very `text` (evaluateNote(text)); if its blocks do not sit where the text has them, nothing
 * is written and a `stamp.note-mismatch` problem comes back.
 */
export function stampText(text: string, note: NoteResult, options: StampOptions = {}): StampOutcome {
  const scan = scanNote(text, note.blocks.map((b) => b.block));
  if (scan.mismatch) return unchanged(text, scan.problems);
  const problems = [...scan.problems];
  const edits: StampEdit[] = [];
  const only = options.blocks ? new Set(options.blocks) : undefined;
  for (const result of note.blocks) {
    const block = result.block;
    if (only && !only.has(block.index)) continue;
    if (!block.closed) {
      problems.push({ code: 'stamp.unclosed-block', severity: 'warning', line: block.fenceLine, blockIndex: block.index, message: `The block at line ${block.fenceLine + 1} has no closing fence, so it gets no results stamp; close it with a fence line.` });
      continue;
    }
    if (scan.damaged.has(block.index)) continue;
    const table = resultTable(result, note.unitSystem, options.significantFigures);
    const existing = scan.stamps.get(block.index);
    if (existing) {
      if (sameRows(existing.rows, table)) continue;
      const prefix = scan.lines[existing.beginLine]!.prefix;
      edits.push({ start: scan.lines[existing.beginLine]!.contentEnd, end: scan.lines[existing.endLine]!.start, newText: stampInterior(table, prefix, scan.eol) });
    } else {
      const fence = scan.lines[block.endLine]!;
      edits.push({ start: fence.contentEnd, end: fence.contentEnd, newText: scan.eol + blankLine(fence.prefix) + scan.eol + fence.prefix + STAMP_BEGIN + stampInterior(table, fence.prefix, scan.eol) + fence.prefix + STAMP_END });
    }
  }
  return applyEdits(text, edits, problems);
}

/**
 * The blocks whose stamp differs from what `note` (the evaluation of this `text`) computes now, with
 * the results that changed. A block without a stamp counts as stale ('missing') only when some
 * other block of the note is stamped: a note nobody stamps is not stale. Damaged markers are not
 * stale stamps; readStamps and stampText report them.
 */
export function findStaleStamps(text: string, note: NoteResult, options: Pick<StampOptions, 'significantFigures'> = {}): StaleStamp[] {
  const scan = scanNote(text, note.blocks.map((b) => b.block));
  if (scan.mismatch) return [];
  const anyStamp = scan.stamps.size > 0 || scan.damaged.size > 0;
  const stale: StaleStamp[] = [];
  for (const result of note.blocks) {
    const block = result.block;
    if (!block.closed || scan.damaged.has(block.index)) continue;
    const existing = scan.stamps.get(block.index);
    const table = resultTable(result, note.unitSystem, options.significantFigures);
    if (!existing) {
      if (anyStamp) stale.push({ blockIndex: block.index, title: block.title, fenceLine: block.fenceLine, reason: 'missing', changes: rowChanges([], table) });
      continue;
    }
    if (sameRows(existing.rows, table)) continue;
    stale.push({ blockIndex: block.index, title: block.title, fenceLine: block.fenceLine, reason: 'changed', stampLine: existing.beginLine, stampEndLine: existing.endLine, changes: rowChanges(existing.rows, table) });
  }
  return stale;
}

/** Removes every intact stamp, giving back the note exactly as it was before stamping. Damaged stamps stay, reported as problems. */
export function stripStamps(text: string): StampOutcome {
  const scan = scanNote(text, safeBlocks(text));
  const edits: StampEdit[] = [];
  for (const s of scan.stamps.values()) {
    edits.push({ start: scan.lines[s.fenceEndLine]!.contentEnd, end: scan.lines[s.endLine]!.contentEnd, newText: '' });
  }
  edits.sort((a, b) => a.start - b.start);
  return applyEdits(text, edits, scan.problems);
}

/** The intact stamps of a note and the problems with damaged ones, for an editor's diagnostics. `blocks` defaults to extractBlocks(text). */
export function readStamps(text: string, blocks?: readonly Block[]): { stamps: FoundStamp[]; problems: StampProblem[] } {
  const scan = scanNote(text, blocks ?? safeBlocks(text));
  return { stamps: [...scan.stamps.values()].map((s) => ({ blockIndex: s.blockIndex, beginLine: s.beginLine, endLine: s.endLine })), problems: scan.problems };
}

/** The rows a block's stamp shows, as cells ([name, value, check]), header first. Exposed so a preview or hover can show the same thing. */
export function resultTable(result: BlockResult, system: UnitSystem, significantFigures?: number): string[][] {
  const sig = significantFigures ?? 3;
  const rows: string[][] = [[...STAMP_HEADER]];
  let errors = 0;
  for (const d of result.diagnostics) if (d.severity === 'error') errors++;
  for (const r of result.results) {
    const row = resultRow(r, system, sig);
    if (row) rows.push(row);
  }
  if (errors > 0) rows.push(['_errors_', `${errors} ${errors === 1 ? 'line has an error' : 'lines have errors'}`, '']);
  if (rows.length === 1) rows.push(['_no results_', '', '']);
  return rows.map((cells) => cells.map((c, i) => (i === 0 ? c.replace(/[\r\n]+/g, ' ').trim() : escapeCell(c).trim())));
}

// ---------------------------------------------------------------------------------------------
// Rows

const NOT_EVALUATED = 'not evaluated (error)';

function resultRow(r: StatementResult, system: UnitSystem, sig: number): string[] | undefined {
  const st = r.statement;
  if (st.kind === 'check') {
    const name = codeSpan(st.text);
    const c = r.check;
    if (!c || r.failed) return [name, NOT_EVALUATED, ''];
    const op = c.op === '<=' ? '≤' : c.op === '>=' ? '≥' : c.op;
    return [name, `${c.leftText} ${op} ${c.rightText}`, `ratio ${finite(c.ratio, sig)}, ${c.pass ? 'pass' : '**fails**'}`];
  }
  if (st.kind === 'units') return undefined;
  const name = r.name ?? st.target.name;
  if (r.failed || !r.value) return [codeSpan(name), NOT_EVALUATED, ''];
  const v = r.value;
  if (v.kind === 'quantity') return [codeSpan(name), r.text ?? quantityText(v.si, v.dim, system, sig), ''];
  if (v.kind === 'section') {
    const s = v.section;
    return [codeSpan(name), `A = ${quantityText(s.area, DIM.area, system, sig)}, I = ${quantityText(s.I, DIM.quartic, system, sig)}, yc = ${quantityText(s.centroidY, DIM.length, system, sig)}, depth = ${quantityText(s.depth, DIM.length, system, sig)}`, ''];
  }
  if (v.kind === 'beam') {
    const sum = v.beam.summary(v.combination);
    const parts = [`Vmax = ${quantityText(sum.Vmax, DIM.force, system, sig)}`, `Mmax = ${quantityText(sum.Mmax, DIM.moment, system, sig)}`];
    if (sum.Mmin < 0) parts.push(`Mmin = ${quantityText(sum.Mmin, DIM.moment, system, sig)}`);
    return [codeSpan(name), parts.join(', '), ''];
  }
  // A name whose line failed quietly (an unavailable value) shows as not evaluated.
  return [codeSpan(name), NOT_EVALUATED, ''];
}

function quantityText(si: number, dim: Dimension, system: UnitSystem, sig: number): string {
  const unit = preferredUnit(dim, si, system);
  if (unit) {
    const n = finite(si / unit.factor, sig);
    return unit.text ? `${n} ${unit.text}` : n;
  }
  const u = siUnitText(dim);
  return `${finite(si, sig)}${u ? ' ' + u : ''}`;
}

function finite(x: number, sig: number): string {
  return Number.isFinite(x) ? formatNumber(x, { significantFigures: sig }) : 'not a number';
}

/** A code span that survives any backticks inside it; pipes are escaped for GFM tables. */
function codeSpan(s: string): string {
  const flat = s.replace(/[\r\n]+/g, ' ');
  let longest = 0;
  for (const m of flat.matchAll(/`+/g)) longest = Math.max(longest, m[0].length);
  const fence = '`'.repeat(longest + 1);
  const pad = flat.startsWith('`') || flat.endsWith('`') ? ' ' : '';
  return fence + pad + flat.replace(/\|/g, '\\|') + pad + fence;
}

/** Plain cell text: Markdown punctuation escaped, HTML characters as entities, one line. */
function escapeCell(s: string): string {
  return s
    .replace(/[\r\n]+/g, ' ')
    .replace(/&/g, '&amp;')
    .replace(/</g, '&lt;')
    .replace(/>/g, '&gt;')
    .replace(/(\*\*fails\*\*)|([\\`*_[\]|])/g, (m, bold: string | undefined) => (bold ? m : '\\' + m));
}

function tableLines(rows: string[][]): string[] {
  const line = (cells: string[]) => '|' + cells.map((c) => (c === '' ? ' ' : ` ${c} `)).join('|') + '|';
  const [header, ...body] = rows;
  return [line(header!), line(header!.map(() => '---')), ...body.map(line)];
}

function blankLine(prefix: string): string {
  return prefix.trimEnd();
}

/** Everything from the end of the start-marker line to the start of the end-marker line. */
function stampInterior(rows: string[][], prefix: string, eol: string): string {
  return eol + blankLine(prefix) + eol + tableLines(rows).map((l) => prefix + l + eol).join('') + blankLine(prefix) + eol;
}

function sameRows(a: string[][], b: string[][]): boolean {
  if (a.length !== b.length) return false;
  for (let i = 0; i < a.length; i++) {
    const x = a[i]!;
    const y = b[i]!;
    if (x.length !== y.length) return false;
    for (let j = 0; j < x.length; j++) if (x[j] !== y[j]) return false;
  }
  return true;
}

/** Differences between stamped rows and fresh rows, matched by name (the n-th row of a repeated name to the n-th). */
function rowChanges(oldRows: string[][], newRows: string[][]): StampChange[] {
  const keyed = (rows: string[][]) => {
    const out = new Map<string, string[]>();
    const seen = new Map<string, number>();
    for (const cells of rows.slice(1)) {
      const name = cells[0] ?? '';
      const n = seen.get(name) ?? 0;
      seen.set(name, n + 1);
      out.set(`${name}\u0000${n}`, cells);
    }
    return out;
  };
  const before = keyed(oldRows);
  const after = keyed(newRows);
  const changes: StampChange[] = [];
  const headerBefore = oldRows[0];
  if (headerBefore && newRows[0] && !sameRows([headerBefore], [newRows[0]])) {
    changes.push({ name: 'table header', oldText: readable(headerBefore.join(' | ')), newText: readable(newRows[0].join(' | ')) });
  }
  for (const [key, cells] of after) {
    const old = before.get(key);
    const newText = readable(cells.slice(1).filter((c) => c !== '').join('; '));
    if (!old) changes.push({ name: readable(cells[0] ?? ''), newText });
    else if (!sameRows([old], [cells])) changes.push({ name: readable(cells[0] ?? ''), oldText: readable(old.slice(1).filter((c) => c !== '').join('; ')), newText });
  }
  for (const [key, cells] of before) {
    if (!after.has(key)) changes.push({ name: readable(cells[0] ?? ''), oldText: readable(cells.slice(1).filter((c) => c !== '').join('; ')) });
  }
  return changes;
}

/** A cell as a reader sees it: code-span backticks, escapes and entities removed. */
function readable(s: string): string {
  let t = s.trim();
  const code = /^(`+) ?(.*?) ?\1$/.exec(t);
  if (code) return code[2]!.replace(/\\\|/g, '|');
  t = t.replace(/\*\*fails\*\*/g, 'fails').replace(/^_(.*)_$/, '$1');
  return t.replace(/\\([\\`*_[\]|])/g, '$1').replace(/&lt;/g, '<').replace(/&gt;/g, '>').replace(/&amp;/g, '&');
}

// ---------------------------------------------------------------------------------------------
// Reading a note's lines and markers

interface Line {
  /** Offset of the first character of the line. */
  start: number;
  /** Offset just past the last character before the line ending. */
  contentEnd: number;
  /** The line's text without its ending (a BOM on line 0 removed). */
  text: string;
  /** Container prefix: blanks and block-quote markers before the content. */
  prefix: string;
  /** The content after the prefix, trailing blanks removed. */
  content: string;
}

interface ScannedStamp {
  blockIndex: number;
  /** The closing fence line of the block the stamp follows. */
  fenceEndLine: number;
  beginLine: number;
  endLine: number;
  /** Header and rows as trimmed cells; lines that are not table rows are one-cell rows, so any edit inside shows. */
  rows: string[][];
}

interface Scan {
  lines: Line[];
  eol: string;
  stamps: Map<number, ScannedStamp>;
  /** Blocks whose stamp is damaged: left alone, reported in problems. */
  damaged: Set<number>;
  problems: StampProblem[];
  mismatch: boolean;
}

const parser = new MarkdownIt('commonmark');

function splitWithOffsets(text: string): Line[] {
  const lines: Line[] = [];
  const re = /\r\n|\r|\n/g;
  let start = 0;
  const push = (contentEnd: number) => {
    let raw = text.slice(start, contentEnd);
    if (start === 0 && raw.charCodeAt(0) === 0xfeff) raw = raw.slice(1);
    const prefix = /^[ \t>]*/.exec(raw)![0];
    lines.push({ start, contentEnd, text: raw, prefix, content: raw.slice(prefix.length).trimEnd() });
  };
  for (let m = re.exec(text); m; m = re.exec(text)) {
    push(m.index);
    start = m.index + m[0].length;
  }
  push(text.length);
  return lines;
}

/** The line ending the file mostly uses (LF when it has none). */
export function dominantLineEnding(text: string): '\n' | '\r\n' | '\r' {
  let crlf = 0;
  let lf = 0;
  let cr = 0;
  for (let i = 0; i < text.length; i++) {
    const c = text.charCodeAt(i);
    if (c === 13) {
      if (text.charCodeAt(i + 1) === 10) {
        crlf++;
        i++;
      } else cr++;
    } else if (c === 10) lf++;
  }
  if (crlf > lf && crlf >= cr) return '\r\n';
  if (cr > lf && cr > crlf) return '\r';
  return '\n';
}

function isBegin(content: string): boolean {
  return /^<!--\s*tauline-results\b/.test(content) && content.includes('-->');
}
function isEnd(content: string): boolean {
  return /^<!--\s*\/\s*tauline-results\b/.test(content) && content.includes('-->');
}
function isBlank(l: Line): boolean {
  return l.content === '';
}

function safeBlocks(text: string): Block[] {
  try {
    return extractBlocks(text);
  } catch {
    return [];
  }
}

/** Lines inside code (fenced or indented), where a marker is text, and the opening lines of `shear` fences. */
function codeLines(text: string, lineCount: number): { inCode: Uint8Array; shearFences: { start: number; endExclusive: number }[] } {
  const inCode = new Uint8Array(lineCount);
  const shearFences: { start: number; endExclusive: number }[] = [];
  const src = text.charCodeAt(0) === 0xfeff ? text.slice(1) : text;
  let tokens: ReturnType<typeof parser.parse>;
  try {
    tokens = parser.parse(src, {});
  } catch {
    return { inCode, shearFences };
  }
  for (const tok of tokens) {
    if ((tok.type !== 'fence' && tok.type !== 'code_block') || !tok.map) continue;
    for (let l = tok.map[0]; l < tok.map[1] && l < lineCount; l++) inCode[l] = 1;
    if (tok.type === 'fence') {
      const m = /^(\S+)/.exec(tok.info.trim());
      if (m && m[1]!.toLowerCase() === BLOCK_LANGUAGE) shearFences.push({ start: tok.map[0], endExclusive: tok.map[1] });
    }
  }
  return { inCode, shearFences };
}

function scanNote(text: string, blocks: readonly Block[]): Scan {
  const lines = splitWithOffsets(text);
  const eol = dominantLineEnding(text);
  const stamps = new Map<number, ScannedStamp>();
  const damaged = new Set<number>();
  const problems: StampProblem[] = [];
  const { inCode, shearFences } = codeLines(text, lines.length);
  const scan: Scan = { lines, eol, stamps, damaged, problems, mismatch: false };

  const fenceLines = blocks.map((b) => b.fenceLine);
  // Results from another text (or a cache that kept a block whose closing fence has since gone)
  // would put a stamp in the wrong place: every block must sit exactly where this text has it.
  const misplaced = (b: Block, i: number) => {
    const f = shearFences[i];
    if (!f || f.start !== b.fenceLine) return true;
    if (!b.closed) return false;
    return b.endLine !== f.endExclusive - 1 || b.endLine >= lines.length || !/^(`{3,}|~{3,})$/.test(lines[b.endLine]!.content);
  };
  if (fenceLines.length !== shearFences.length || blocks.some(misplaced)) {
    scan.mismatch = true;
    problems.push({ code: 'stamp.note-mismatch', severity: 'error', line: 0, message: 'The results passed in were not computed from this text, so no stamp was written; evaluate the note again.' });
    return scan;
  }

  const markerAt = (l: number): 'begin' | 'end' | undefined => {
    if (inCode[l]) return undefined;
    const c = lines[l]!.content;
    return isBegin(c) ? 'begin' : isEnd(c) ? 'end' : undefined;
  };
  const used = new Uint8Array(lines.length);
  const nextFence = (after: number) => {
    for (const f of fenceLines) if (f > after) return f;
    return lines.length;
  };

  for (const block of blocks) {
    if (!block.closed) continue;
    let l = block.endLine + 1;
    while (l < lines.length && !inCode[l] && isBlank(lines[l]!)) l++;
    if (l >= lines.length || markerAt(l) !== 'begin') continue;
    const begin = l;
    used[begin] = 1;
    const limit = nextFence(block.endLine);
    let end = -1;
    let nested = -1;
    for (let k = begin + 1; k < limit; k++) {
      const m = markerAt(k);
      if (m === 'end') {
        end = k;
        break;
      }
      if (m === 'begin') {
        nested = k;
        break;
      }
    }
    const where = `after the block at line ${block.fenceLine + 1}${block.title ? ` "${block.title}"` : ''}`;
    if (nested >= 0) {
      damaged.add(block.index);
      used[nested] = 1;
      for (let k = nested + 1; k < limit; k++) {
        if (markerAt(k) === 'end') {
          used[k] = 1;
          break;
        }
      }
      problems.push({ code: 'stamp.nested', severity: 'error', line: nested, blockIndex: block.index, message: `The results stamp ${where} holds another start marker (line ${nested + 1}); remove the damaged stamp by hand and stamp again.` });
      continue;
    }
    if (end < 0) {
      damaged.add(block.index);
      problems.push({ code: 'stamp.missing-end', severity: 'error', line: begin, blockIndex: block.index, message: `The results stamp ${where} has no end marker; restore the line "${STAMP_END}" or remove the stamp by hand, then stamp again.` });
      continue;
    }
    used[end] = 1;
    const rows: string[][] = [];
    for (let k = begin + 1; k < end; k++) {
      const c = lines[k]!.content;
      if (c === '') continue;
      if (c.startsWith('|')) {
        const cells = splitCells(c);
        if (cells.every((x) => /^:?-+:?$/.test(x))) continue;
        rows.push(cells);
      } else rows.push([c]);
    }
    stamps.set(block.index, { blockIndex: block.index, fenceEndLine: block.endLine, beginLine: begin, endLine: end, rows });
  }

  for (let l = 0; l < lines.length; l++) {
    if (used[l]) continue;
    const m = markerAt(l);
    if (m === 'begin') {
      problems.push({ code: 'stamp.not-after-block', severity: 'error', line: l, message: `The results stamp at line ${l + 1} does not follow a shear block (only blank lines may sit between a block's closing fence and its stamp); move or delete it.` });
      for (let k = l + 1; k < lines.length; k++) {
        const n = markerAt(k);
        if (n === 'begin') break;
        if (n === 'end') {
          used[k] = 1;
          break;
        }
      }
    } else if (m === 'end') {
      problems.push({ code: 'stamp.stray-end', severity: 'error', line: l, message: `The end marker at line ${l + 1} has no start marker before it; restore the start marker or delete this line.` });
    }
  }
  problems.sort((a, b) => a.line - b.line);
  return scan;
}

/** Table cells split on unescaped pipes, outer pipes dropped, each trimmed. */
function splitCells(row: string): string[] {
  const cells: string[] = [];
  let cur = '';
  for (let i = 0; i < row.length; i++) {
    const ch = row[i]!;
    if (ch === '\\' && i + 1 < row.length) {
      cur += ch + row[i + 1];
      i++;
    } else if (ch === '|') {
      cells.push(cur);
      cur = '';
    } else cur += ch;
  }
  cells.push(cur);
  if (row.startsWith('|')) cells.shift();
  if (cells.length > 0 && cells[cells.length - 1]!.trim() === '' && /\|\s*$/.test(row) && !/\\\|\s*$/.test(row)) cells.pop();
  return cells.map((c) => c.trim());
}

function applyEdits(text: string, edits: StampEdit[], problems: StampProblem[]): StampOutcome {
  if (edits.length === 0) return unchanged(text, problems);
  let out = '';
  let at = 0;
  for (const e of edits) {
    out += text.slice(at, e.start) + e.newText;
    at = e.end;
  }
  out += text.slice(at);
  return { text: out, changed: out !== text, problems, edits, blocks: edits.length };
}

function unchanged(text: string, problems: StampProblem[]): StampOutcome {
  return { text, changed: false, problems, edits: [], blocks: 0 };
}
