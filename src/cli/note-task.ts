/**
 * One note's work for the command line, the same on the main thread and on a worker thread: read
 * (or take) the text, evaluate it, and return plain data that crosses a thread boundary unchanged
 * (structured clone): the JSON contract form, stale stamps and, when stamping, the stamped text.
 */
import { readFileSync } from 'node:fs';
import { type JsonFile, noteToJson } from '../core/contract';
import { evaluateNote } from '../core/note';
import { findStaleStamps, readStamps, type StampProblem, stampText } from '../core/stamp';
import type { UnitSystem } from '../core/units';

export interface NoteTask {
  /** The path as shown to the user (and in JSON). */
  path: string;
  /** Where to read the note; absent when `text` is given. */
  absPath?: string;
  text?: string;
  /** check: results and stale stamps; stamp: also the stamped text. */
  mode: 'check' | 'stamp';
}

/** A stamp that does not match the note as it computes now (JSON: the `stale` list of a file). Lines 1-based. */
export interface JsonStale {
  /** The block's opening fence line, or the damaged marker's line. */
  line: number;
  title: string;
  /** changed: numbers moved; missing: the note is stamped but this block is not; damaged: its markers are broken. */
  reason: 'changed' | 'missing' | 'damaged';
  /** The start marker's line, when there is one. */
  stampLine?: number;
  message: string;
  changes: { name: string; old?: string; new?: string }[];
}

export interface NoteOutcome {
  path: string;
  file: JsonFile;
  unitSystem: UnitSystem;
  stale: JsonStale[];
  /** A plain-words reason the file could not be read; `file.error` is set too. */
  readError?: string;
  stamp?: {
    /** The text as read; the writer checks the file still holds it before replacing it. */
    original: string;
    text: string;
    changed: boolean;
    blocks: number;
    problems: StampProblem[];
    /** The file is not valid UTF-8, so it cannot be rewritten without changing bytes outside the stamps. */
    notUtf8: boolean;
  };
}

export function runNoteTask(task: NoteTask): NoteOutcome {
  let text: string;
  let notUtf8 = false;
  if (task.text !== undefined) text = task.text;
  else {
    try {
      const bytes = readFileSync(task.absPath ?? task.path);
      text = bytes.toString('utf8');
      notUtf8 = !Buffer.from(text, 'utf8').equals(bytes);
    } catch (e) {
      const readError = describeFsError(e);
      return { path: task.path, file: { path: task.path, blocks: [], error: 'unreadable' }, unitSystem: 'SI', stale: [], readError };
    }
  }
  const note = evaluateNote(text);
  const outcome: NoteOutcome = { path: task.path, file: noteToJson(task.path, note), unitSystem: note.unitSystem, stale: staleOf(text, note) };
  if (task.mode === 'stamp') {
    const s = stampText(text, note);
    outcome.stamp = { original: text, text: s.text, changed: s.changed, blocks: s.blocks, problems: s.problems, notUtf8 };
  }
  return outcome;
}

function staleOf(text: string, note: ReturnType<typeof evaluateNote>): JsonStale[] {
  const stale: JsonStale[] = [];
  // Most notes carry no stamp at all; skip the marker scan for them.
  if (!/tauline-results/.test(text)) return stale;
  const titleOf = (index: number | undefined) => (index === undefined ? '' : (note.blocks[index]?.block.title ?? ''));
  for (const p of readStamps(text, note.blocks.map((b) => b.block)).problems) {
    if (p.code === 'stamp.note-mismatch') continue;
    stale.push({ line: p.line + 1, title: titleOf(p.blockIndex), reason: 'damaged', message: p.message, changes: [] });
  }
  for (const s of findStaleStamps(text, note)) {
    const where = `block at line ${s.fenceLine + 1}${s.title ? ` "${s.title}"` : ''}`;
    const changes = s.changes.map((c) => {
      const out: JsonStale['changes'][number] = { name: c.name };
      if (c.oldText !== undefined) out.old = c.oldText;
      if (c.newText !== undefined) out.new = c.newText;
      return out;
    });
    const entry: JsonStale = {
      line: s.fenceLine + 1,
      title: s.title,
      reason: s.reason,
      message: s.reason === 'missing' ? `The ${where} has no results stamp while the note's other blocks do; run tauline stamp.` : `The results stamp after the ${where} is stale: ${describeChanges(changes)}; run tauline stamp.`,
      changes,
    };
    if (s.stampLine !== undefined) entry.stampLine = s.stampLine + 1;
    stale.push(entry);
  }
  return stale.sort((a, b) => a.line - b.line);
}

/** "V 66.6 kN -> 70.1 kN, t_max new 51.2 MPa", for one line of output. */
export function describeChanges(changes: JsonStale['changes'], limit = 6): string {
  const parts = changes.slice(0, limit).map((c) => {
    if (c.old !== undefined && c.new !== undefined) return `${c.name} ${c.old} -> ${c.new}`;
    if (c.new !== undefined) return `${c.name} new${c.new ? ` ${c.new}` : ''}`;
    return `${c.name} removed`;
  });
  if (changes.length > limit) parts.push(`and ${changes.length - limit} more`);
  return parts.join(', ') || 'the table was edited';
}

export function describeFsError(e: unknown): string {
  const code = (e as NodeJS.ErrnoException)?.code;
  switch (code) {
    case 'ENOENT':
      return 'no such file (it may have been moved or deleted)';
    case 'EACCES':
    case 'EPERM':
      return 'permission denied';
    case 'EISDIR':
      return 'is a folder';
    case 'EROFS':
      return 'the file system is read-only';
    case 'ENOSPC':
      return 'no space left on the device';
    default:
      return code ?? (e instanceof Error ? e.message : String(e));
  }
}
