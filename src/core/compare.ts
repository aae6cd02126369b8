/**
 * What changed in the results of a set of notes between two versions: values whose numbers moved,
 * checks that changed status or utilisation, blocks and notes that came or went. Pure: it takes the
 * `tauline check --json` form of each note (JsonFile, plain data) and the renames git detected, and
 * returns plain data; reading revisions is the command line's business.
 *
 * Matching rules (stable, so a reviewer can predict them):
 * - notes by path, a renamed note by the rename it is given;
 * - blocks by title first (the n-th block titled X to the n-th titled X), then the rest in order,
 *   pairing two blocks only when they share a result name or check (a longest common subsequence),
 *   so inserting a block does not shift every block after it;
 * - values by name; section and beam values member by member (`G2.I`, `B1.Vmax`, `B1.R1` = the
 *   reaction at the leftmost support);
 * - checks by their text (the n-th identical text to the n-th).
 * Two numbers are equal when they agree to 1 part in 10⁹ (float noise is not a change).
 */
import type { JsonBlock, JsonFile, JsonValue } from './contract';
import { formatNumber } from './format';
import { DIM, type Dimension, preferredUnit, type UnitSystem } from './units';

/** One version of one note: its path, its results (noteToJson) and the unit system it shows results in. */
export interface NoteSnapshot {
  path: string;
  file: JsonFile;
  unitSystem?: UnitSystem;
}

export interface Rename {
  from: string;
  to: string;
}

export interface ValueChange {
  /** `V`, or a member of a section or beam value: `G2.I`, `B1.Vmax`, `B1.R1` (reactions numbered from the left). */
  name: string;
  /** moved: the number changed; added/removed: the value is new or gone; unit: it now measures something else. */
  kind: 'moved' | 'added' | 'removed' | 'unit';
  oldText?: string;
  newText?: string;
  /** SI values (coherent base units). */
  oldSi?: number;
  newSi?: number;
  /** (new − old) / |old| × 100; null when the old value is zero or the kinds differ. */
  percent?: number | null;
}

export interface CheckChange {
  text: string;
  /** status: pass ↔ fail; ratio: same status, utilisation moved; added/removed: the check is new or gone. */
  kind: 'status' | 'ratio' | 'added' | 'removed';
  oldPass?: boolean;
  newPass?: boolean;
  oldRatio?: number;
  newRatio?: number;
}

export interface BlockChange {
  /** The block's title (after, or before when removed); '' when untitled. */
  title: string;
  /** 1-based fence lines in each version (absent on the side where the block does not exist). */
  oldLine?: number;
  newLine?: number;
  status: 'added' | 'removed' | 'modified';
  values: ValueChange[];
  checks: CheckChange[];
  /** Lines with errors before and after, when the count changed. */
  errors?: { before: number; after: number };
}

export interface NoteChange {
  /** The path in the newer version (the older one for a removed note). */
  path: string;
  /** The path in the older version, when git saw a rename. */
  oldPath?: string;
  status: 'added' | 'removed' | 'renamed' | 'modified';
  blocks: BlockChange[];
  /** Set when a version of the note could not be read (e.g. not UTF-8): 'before' | 'after'. */
  unreadable?: 'before' | 'after';
}

export interface ResultsDiff {
  /** Only notes whose results changed (a renamed note is listed even when its results did not). */
  notes: NoteChange[];
  summary: {
    /** Notes compared (present in either version). */
    notes: number;
    changedNotes: number;
    addedNotes: number;
    removedNotes: number;
    renamedNotes: number;
    addedBlocks: number;
    removedBlocks: number;
    movedValues: number;
    /** Checks that went from pass to fail. */
    newlyFailing: number;
    /** Checks that went from fail to pass. */
    newlyPassing: number;
  };
}

const RELATIVE_TOLERANCE = 1e-9;

export function sameNumber(a: number, b: number): boolean {
  if (a === b) return true;
  return Math.abs(a - b) <= RELATIVE_TOLERANCE * Math.max(Math.abs(a), Math.abs(b));
}

/** Percentage change from old to new; null when old is zero. */
export function percentChange(oldValue: number, newValue: number): number | null {
  if (oldValue === 0 || !Number.isFinite(oldValue) || !Number.isFinite(newValue)) return null;
  return ((newValue - oldValue) / Math.abs(oldValue)) * 100;
}

/** Compares every note of two versions. Output order: the newer version's paths in the order given, then removed notes in the older order. */
export function compareVersions(before: readonly NoteSnapshot[], after: readonly NoteSnapshot[], renames: readonly Rename[] = []): ResultsDiff {
  const oldByPath = new Map(before.map((n) => [n.path, n]));
  const renamedFrom = new Map<string, string>();
  for (const r of renames) if (oldByPath.has(r.from)) renamedFrom.set(r.to, r.from);
  const consumed = new Set<string>();
  const notes: NoteChange[] = [];
  const summary: ResultsDiff['summary'] = { notes: 0, changedNotes: 0, addedNotes: 0, removedNotes: 0, renamedNotes: 0, addedBlocks: 0, removedBlocks: 0, movedValues: 0, newlyFailing: 0, newlyPassing: 0 };
  const newPaths = new Set(after.map((n) => n.path));
  for (const now of after) {
    let oldPath: string | undefined = now.path;
    let old = oldByPath.get(now.path);
    // A rename wins over a same-named file only when git says so and the old path is gone.
    const from = renamedFrom.get(now.path);
    if (from && !newPaths.has(from)) {
      oldPath = from;
      old = oldByPath.get(from);
    }
    if (!old) {
      notes.push(wholeNote(now, 'added'));
      continue;
    }
    consumed.add(oldPath);
    const change = compareNotes(old, now);
    if (oldPath !== now.path) {
      change.status = 'renamed';
      change.oldPath = oldPath;
    }
    if (change.status === 'renamed' || change.blocks.length > 0 || change.unreadable) notes.push(change);
  }
  for (const old of before) if (!consumed.has(old.path)) notes.push(wholeNote(old, 'removed'));
  summary.notes = after.length + before.length - consumed.size;
  for (const n of notes) {
    summary.changedNotes++;
    if (n.status === 'added') summary.addedNotes++;
    if (n.status === 'removed') summary.removedNotes++;
    if (n.status === 'renamed') summary.renamedNotes++;
    for (const b of n.blocks) {
      // Blocks of a whole added or removed note are counted as that note, not again as blocks.
      if (b.status === 'added' && n.status !== 'added') summary.addedBlocks++;
      if (b.status === 'removed' && n.status !== 'removed') summary.removedBlocks++;
      for (const v of b.values) if (v.kind === 'moved' || v.kind === 'unit') summary.movedValues++;
      for (const c of b.checks) {
        if (c.kind === 'status' && c.newPass === false) summary.newlyFailing++;
        if (c.kind === 'status' && c.newPass === true) summary.newlyPassing++;
      }
    }
  }
  return { notes, summary };
}

/** Compares two versions of one note; `status` is 'modified' and `blocks` lists only blocks that changed. */
export function compareNotes(before: NoteSnapshot, after: NoteSnapshot): NoteChange {
  const change: NoteChange = { path: after.path, status: 'modified', blocks: [] };
  if (before.file.error || after.file.error) {
    if (before.file.error && !after.file.error) change.unreadable = 'before';
    else if (after.file.error && !before.file.error) change.unreadable = 'after';
    else return change;
  }
  const pairs = matchBlocks(before.file.blocks, after.file.blocks);
  for (const [a, b] of pairs) {
    if (a && b) {
      const c = compareBlocks(a, b, before.unitSystem ?? 'SI', after.unitSystem ?? 'SI');
      if (c) change.blocks.push(c);
    } else if (b) change.blocks.push(wholeBlock(b, 'added', after.unitSystem ?? 'SI'));
    else if (a) change.blocks.push(wholeBlock(a, 'removed', before.unitSystem ?? 'SI'));
  }
  return change;
}

function wholeNote(n: NoteSnapshot, status: 'added' | 'removed'): NoteChange {
  return { path: n.path, status, blocks: n.file.blocks.map((b) => wholeBlock(b, status, n.unitSystem ?? 'SI')) };
}

function wholeBlock(b: JsonBlock, status: 'added' | 'removed', system: UnitSystem): BlockChange {
  const side = status === 'added' ? 'new' : 'old';
  const values: ValueChange[] = [];
  for (const [name, v] of Object.entries(b.values)) {
    for (const m of members(name, v, system)) {
      values.push({ name: m.name, kind: status, [`${side}Text`]: m.text, [`${side}Si`]: m.si });
    }
  }
  const checks: CheckChange[] = b.checks.map((c) => (status === 'added' ? { text: c.text, kind: status, newPass: c.pass, newRatio: c.ratio } : { text: c.text, kind: status, oldPass: c.pass, oldRatio: c.ratio }));
  return { title: b.title, [status === 'added' ? 'newLine' : 'oldLine']: b.line, status, values, checks };
}

// ---------------------------------------------------------------------------------------------
// Blocks

/** Pairs of matched blocks in the newer version's order, with unmatched ones as [old, undefined] / [undefined, new]. */
export function matchBlocks(before: readonly JsonBlock[], after: readonly JsonBlock[]): [JsonBlock | undefined, JsonBlock | undefined][] {
  const matchOfNew = new Array<number>(after.length).fill(-1);
  const usedOld = new Array<boolean>(before.length).fill(false);
  // 1. by title: the n-th block with a title to the n-th with the same title
  const oldByTitle = new Map<string, number[]>();
  before.forEach((b, i) => {
    if (!b.title) return;
    const list = oldByTitle.get(b.title) ?? [];
    list.push(i);
    oldByTitle.set(b.title, list);
  });
  after.forEach((b, j) => {
    if (!b.title) return;
    const list = oldByTitle.get(b.title);
    const i = list?.shift();
    if (i !== undefined) {
      matchOfNew[j] = i;
      usedOld[i] = true;
    }
  });
  // 2. the rest in order: a longest common subsequence of blocks that share a name or a check
  const restOld = before.map((_, i) => i).filter((i) => !usedOld[i]);
  const restNew = after.map((_, j) => j).filter((j) => matchOfNew[j] === -1);
  const keys = (b: JsonBlock) => new Set([...Object.keys(b.values), ...b.checks.map((c) => `check ${c.text}`)]);
  const oldKeys = restOld.map((i) => keys(before[i]!));
  const newKeys = restNew.map((j) => keys(after[j]!));
  const related = (x: Set<string>, y: Set<string>) => {
    if (x.size === 0 && y.size === 0) return true;
    for (const k of x) if (y.has(k)) return true;
    return false;
  };
  const n = restOld.length;
  const m = restNew.length;
  const table = Array.from({ length: n + 1 }, () => new Array<number>(m + 1).fill(0));
  for (let i = n - 1; i >= 0; i--) {
    for (let j = m - 1; j >= 0; j--) {
      table[i]![j] = related(oldKeys[i]!, newKeys[j]!) ? table[i + 1]![j + 1]! + 1 : Math.max(table[i + 1]![j]!, table[i]![j + 1]!);
    }
  }
  for (let i = 0, j = 0; i < n && j < m; ) {
    if (related(oldKeys[i]!, newKeys[j]!) && table[i]![j] === table[i + 1]![j + 1]! + 1) {
      matchOfNew[restNew[j]!] = restOld[i]!;
      usedOld[restOld[i]!] = true;
      i++;
      j++;
    } else if (table[i + 1]![j]! >= table[i]![j + 1]!) i++;
    else j++;
  }
  // Output: walk the newer version; a removed old block is placed before the first new block matched to an old block after it.
  const pairs: [JsonBlock | undefined, JsonBlock | undefined][] = [];
  let nextOld = 0;
  const flushOldUpTo = (limit: number) => {
    for (; nextOld < limit; nextOld++) if (!usedOld[nextOld]) pairs.push([before[nextOld], undefined]);
  };
  after.forEach((b, j) => {
    const i = matchOfNew[j]!;
    if (i >= 0) {
      if (i >= nextOld) flushOldUpTo(i);
      pairs.push([before[i], b]);
    } else pairs.push([undefined, b]);
  });
  flushOldUpTo(before.length);
  return pairs;
}

function compareBlocks(a: JsonBlock, b: JsonBlock, oldSystem: UnitSystem, newSystem: UnitSystem): BlockChange | undefined {
  const values: ValueChange[] = [];
  const oldMembers = new Map<string, Member>();
  for (const [name, v] of Object.entries(a.values)) for (const m of members(name, v, oldSystem)) oldMembers.set(m.name, m);
  const seen = new Set<string>();
  for (const [name, v] of Object.entries(b.values)) {
    for (const m of members(name, v, newSystem)) {
      seen.add(m.name);
      const o = oldMembers.get(m.name);
      if (!o) values.push({ name: m.name, kind: 'added', newText: m.text, newSi: m.si });
      else if (o.unit !== m.unit) values.push({ name: m.name, kind: 'unit', oldText: o.text, newText: m.text, oldSi: o.si, newSi: m.si, percent: null });
      else if (!sameNumber(o.si, m.si)) values.push({ name: m.name, kind: 'moved', oldText: o.text, newText: m.text, oldSi: o.si, newSi: m.si, percent: percentChange(o.si, m.si) });
    }
  }
  for (const [name, o] of oldMembers) if (!seen.has(name)) values.push({ name, kind: 'removed', oldText: o.text, oldSi: o.si });

  const checks: CheckChange[] = [];
  const oldChecks = new Map<string, JsonBlock['checks']>();
  for (const c of a.checks) oldChecks.set(c.text, [...(oldChecks.get(c.text) ?? []), c]);
  for (const c of b.checks) {
    const o = oldChecks.get(c.text)?.shift();
    if (!o) checks.push({ text: c.text, kind: 'added', newPass: c.pass, newRatio: c.ratio });
    else if (o.pass !== c.pass) checks.push({ text: c.text, kind: 'status', oldPass: o.pass, newPass: c.pass, oldRatio: o.ratio, newRatio: c.ratio });
    else if (!sameNumber(o.ratio, c.ratio)) checks.push({ text: c.text, kind: 'ratio', oldPass: o.pass, newPass: c.pass, oldRatio: o.ratio, newRatio: c.ratio });
  }
  for (const rest of oldChecks.values()) for (const o of rest) checks.push({ text: o.text, kind: 'removed', oldPass: o.pass, oldRatio: o.ratio });

  const errorsOf = (x: JsonBlock) => new Set(x.diagnostics.filter((d) => d.severity === 'error').map((d) => d.line)).size;
  const errors = { before: errorsOf(a), after: errorsOf(b) };
  if (values.length === 0 && checks.length === 0 && errors.before === errors.after) return undefined;
  const change: BlockChange = { title: b.title || a.title, oldLine: a.line, newLine: b.line, status: 'modified', values, checks };
  if (errors.before !== errors.after) change.errors = errors;
  return change;
}

// ---------------------------------------------------------------------------------------------
// Values as comparable members

interface Member {
  name: string;
  si: number;
  /** The coherent SI unit, so a value that now measures something else shows as such. */
  unit: string;
  text: string;
}

function members(name: string, v: JsonValue, system: UnitSystem): Member[] {
  if (!('kind' in v)) return [{ name, si: v.si, unit: v.unit, text: v.text }];
  const m = (member: string, si: number, dim: Dimension, unit: string): Member => ({ name: `${name}.${member}`, si, unit, text: shown(si, dim, system) });
  if (v.kind === 'section') {
    return [m('A', v.A, DIM.area, 'm^2'), m('I', v.I, DIM.quartic, 'm^4'), m('yc', v.yc, DIM.length, 'm'), m('depth', v.depth, DIM.length, 'm')];
  }
  const out = [m('Vmax', v.Vmax, DIM.force, 'N'), m('Mmax', v.Mmax, DIM.moment, 'N*m'), m('Mmin', v.Mmin, DIM.moment, 'N*m')];
  // Reactions by support order (R1 the leftmost), so a changed span moves numbers rather than renaming them.
  [...v.reactions].sort((p, q) => p.x - q.x).forEach((r, i) => {
    const at = position(r.x, system);
    out.push({ name: `${name}.R${i + 1}`, si: r.R, unit: 'N', text: `${shown(r.R, DIM.force, system)} at ${at}` });
    if (r.M !== undefined) out.push({ name: `${name}.M${i + 1}`, si: r.M, unit: 'N*m', text: `${shown(r.M, DIM.moment, system)} at ${at}` });
  });
  return out;
}

/** A position along a beam: metres (feet in US notes), as spans are written. */
function position(x: number, system: UnitSystem): string {
  return system === 'US' ? `${formatNumber(x / 0.3048)} ft` : `${formatNumber(x)} m`;
}

function shown(si: number, dim: Dimension, system: UnitSystem): string {
  const unit = preferredUnit(dim, si, system);
  const n = formatNumber(unit ? si / unit.factor : si);
  return unit?.text ? `${n} ${unit.text}` : n;
}
