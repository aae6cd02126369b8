/**
 * `tauline stamp [PATHS…] [--dry-run] [--remove]`: writes each block's results table into the note
 * (see src/core/stamp.ts), replacing each file atomically. Every file is attempted even when one
 * fails. Exit codes as for check: 0 all stamped, every check passes, no block error; 1 a check
 * fails, a block has an error or a stamp's markers are damaged; 2 a bad command line, or a file
 * that cannot be read or written (read-only, vanished, not UTF-8).
 */
import { readFileSync } from 'node:fs';
import { parseArgs } from 'node:util';
import { stripStamps } from '../core/stamp';
import { AtomicWriteError, writeFileAtomic } from './atomic';
import { displayPath, findNotes } from './files';
import type { CommandIO } from './io';
import { describeFsError, type NoteOutcome } from './note-task';
import { runNoteTasks } from './pool';

const USAGE = 'usage: tauline stamp [PATHS...] [--dry-run] [--remove]';

export async function runStamp(args: string[], io: CommandIO): Promise<number> {
  let values: { 'dry-run'?: boolean; remove?: boolean; help?: boolean };
  let positionals: string[];
  try {
    ({ values, positionals } = parseArgs({ args, allowPositionals: true, options: { 'dry-run': { type: 'boolean' }, remove: { type: 'boolean' }, help: { type: 'boolean', short: 'h' } } }));
  } catch (e) {
    io.err(`tauline stamp: ${e instanceof Error ? e.message : String(e)}\n${USAGE}\n`);
    return 2;
  }
  if (values.help) {
    io.out(`${USAGE}\n\nWrites a results table after every shear block, between <!-- tauline-results --> markers.\n  --dry-run  say which notes would change, write nothing\n  --remove   take the stamps out again\n`);
    return 0;
  }
  const dryRun = !!values['dry-run'];
  const { files, missing } = findNotes(positionals, io.cwd);
  let cannot = missing.length > 0;
  for (const m of missing) io.err(`tauline stamp: cannot read ${m}: no such file or folder\n`);

  if (values.remove) return removeStamps(files, io, dryRun, cannot);

  const outcomes: NoteOutcome[] = await runNoteTasks(files.map((abs) => ({ path: displayPath(abs, io.cwd), absPath: abs, mode: 'stamp' as const })));
  let stamped = 0;
  let unchanged = 0;
  let failed = 0;
  let errors = 0;
  let damaged = 0;
  outcomes.forEach((r, i) => {
    const abs = files[i]!;
    if (r.readError || !r.stamp) {
      cannot = true;
      io.err(`tauline stamp: cannot read ${r.path}: ${r.readError ?? 'unknown error'}\n`);
      return;
    }
    for (const b of r.file.blocks) {
      failed += b.checks.filter((c) => !c.pass).length;
      errors += b.diagnostics.filter((d) => d.severity === 'error').length;
    }
    for (const p of r.stamp.problems) {
      if (p.severity === 'error') damaged++;
      io.err(`${r.path}:${p.line + 1}: ${p.severity}: ${p.message} (${p.code})\n`);
    }
    if (!r.stamp.changed) {
      unchanged++;
      return;
    }
    if (r.stamp.notUtf8) {
      cannot = true;
      io.err(`tauline stamp: cannot stamp ${r.path}: it is not valid UTF-8 text, so rewriting it would change bytes outside the stamps\n`);
      return;
    }
    if (dryRun) {
      stamped++;
      io.out(`would stamp ${r.path} (${plural(r.stamp.blocks, 'block')})\n`);
      return;
    }
    try {
      writeFileAtomic(abs, r.stamp.text, { expected: r.stamp.original });
      stamped++;
      io.out(`stamped ${r.path} (${plural(r.stamp.blocks, 'block')})\n`);
    } catch (e) {
      cannot = true;
      io.err(`tauline stamp: cannot write ${r.path}: ${e instanceof AtomicWriteError ? e.message : describeFsError(e)}\n`);
    }
  });
  const verb = dryRun ? 'would be stamped' : 'stamped';
  io.out(`${plural(outcomes.length, 'note')}: ${stamped} ${verb}, ${unchanged} unchanged; ${plural(failed, 'failing check')}, ${plural(errors, 'error')}${damaged ? `, ${plural(damaged, 'damaged stamp')}` : ''}\n`);
  if (cannot) return 2;
  return failed > 0 || errors > 0 || damaged > 0 ? 1 : 0;
}

function removeStamps(files: string[], io: CommandIO, dryRun: boolean, cannotBefore: boolean): number {
  let cannot = cannotBefore;
  let damaged = 0;
  let removed = 0;
  for (const abs of files) {
    const path = displayPath(abs, io.cwd);
    let bytes: Buffer;
    try {
      bytes = readFileSync(abs);
    } catch (e) {
      cannot = true;
      io.err(`tauline stamp: cannot read ${path}: ${describeFsError(e)}\n`);
      continue;
    }
    const text = bytes.toString('utf8');
    const out = stripStamps(text);
    for (const p of out.problems) {
      damaged++;
      io.err(`${path}:${p.line + 1}: ${p.severity}: ${p.message} (${p.code})\n`);
    }
    if (!out.changed) continue;
    if (!Buffer.from(text, 'utf8').equals(bytes)) {
      cannot = true;
      io.err(`tauline stamp: cannot change ${path}: it is not valid UTF-8 text\n`);
      continue;
    }
    removed++;
    if (dryRun) {
      io.out(`would remove ${plural(out.blocks, 'stamp')} from ${path}\n`);
      continue;
    }
    try {
      writeFileAtomic(abs, out.text, { expected: text });
      io.out(`removed ${plural(out.blocks, 'stamp')} from ${path}\n`);
    } catch (e) {
      cannot = true;
      io.err(`tauline stamp: cannot write ${path}: ${e instanceof AtomicWriteError ? e.message : describeFsError(e)}\n`);
    }
  }
  io.out(`${plural(files.length, 'note')}: ${removed} ${dryRun ? 'would change' : 'changed'}\n`);
  if (cannot) return 2;
  return damaged > 0 ? 1 : 0;
}

function plural(n: number, w: string): string {
  return `${n} ${w}${n === 1 ? '' : 's'}`;
}
