/**
 * `tauline diff [REV_A] [REV_B] [PATHS…] [--format text|markdown|json]`: evaluates the notes at two
 * versions and prints how their results changed. REV_A defaults to the merge base of HEAD with the
 * default branch, REV_B to the working tree; one revision given compares it with the working tree.
 * Leading arguments that name commits are revisions, the rest paths; `--` ends the revisions.
 * Paths are shown relative to the repository root (as a code host shows them).
 * Exit codes: 0 compared (whether or not anything changed); 2 bad command line or a git failure.
 */
import { existsSync } from 'node:fs';
import { isAbsolute, relative, resolve } from 'node:path';
import { parseArgs } from 'node:util';
import { CAUTION_SHORT } from '../core/cautions';
import { type BlockChange, type CheckChange, compareVersions, percentChange, type NoteChange, type NoteSnapshot, type ResultsDiff, type ValueChange } from '../core/compare';
import { formatNumber } from '../core/format';
import { defaultBase, detectRenames, filesAtCommit, filesInWorkingTree, GitError, readAtCommit, repositoryRoot, resolveCommit, shortCommit } from './git';
import type { CommandIO } from './io';
import type { NoteTask } from './note-task';
import { runNoteTasks } from './pool';

const USAGE = 'usage: tauline diff [REV_A] [REV_B] [PATHS...] [--format text|markdown|json]';

export interface RevisionInfo {
  /** As the user named it ('' for the default), the commit id, and a label for output. */
  rev: string;
  commit: string | null;
  label: string;
}

/** The JSON output: the comparison plus what was compared. */
export interface DiffReport extends ResultsDiff {
  from: RevisionInfo;
  to: RevisionInfo;
}

const SKIP = new Set(['node_modules', 'dist', 'out', 'coverage']);

function isNote(path: string): boolean {
  if (!/\.(md|markdown)$/i.test(path)) return false;
  return path.split('/').every((part, i, all) => i === all.length - 1 || (!part.startsWith('.') && !SKIP.has(part)));
}

export async function runDiff(args: string[], io: CommandIO): Promise<number> {
  let format: string;
  let revs: string[] = [];
  let paths: string[] = [];
  try {
    const parsed = parseArgs({ args, allowPositionals: true, tokens: true, options: { format: { type: 'string' }, help: { type: 'boolean', short: 'h' } } });
    if (parsed.values.help) {
      io.out(`${USAGE}\n\nCompares the results of the notes between two git revisions (default: the merge base with the\ndefault branch, and the working tree).\n`);
      return 0;
    }
    format = parsed.values.format ?? 'text';
    if (!['text', 'markdown', 'json'].includes(format)) throw new Error(`unknown --format ${format} (text, markdown or json)`);
    const terminator = parsed.tokens.findIndex((t) => t.kind === 'option-terminator');
    const before = parsed.tokens.filter((t, i) => t.kind === 'positional' && (terminator < 0 || i < terminator)).map((t) => (t as { value: string }).value);
    const after = terminator < 0 ? [] : parsed.tokens.filter((t, i) => t.kind === 'positional' && i > terminator).map((t) => (t as { value: string }).value);
    ({ revs, paths } = { revs: before, paths: after });
  } catch (e) {
    io.err(`tauline diff: ${e instanceof Error ? e.message : String(e)}\n${USAGE}\n`);
    return 2;
  }

  try {
    const root = repositoryRoot(io.cwd);
    // Leading arguments that name commits (and not files) are revisions.
    const candidates = revs;
    revs = [];
    const rest: string[] = [];
    for (const arg of candidates) {
      const commit = rest.length === 0 && revs.length < 2 ? resolveCommit(root, arg) : undefined;
      if (commit) {
        if (existsAsPath(io.cwd, arg)) throw new UsageError(`"${arg}" names both a revision and a file; put -- between revisions and paths`);
        revs.push(arg);
      } else rest.push(arg);
    }
    // As git does: before --, an argument that is neither a commit nor an existing path is a mistake
    // (a mistyped revision would otherwise compare nothing, silently); after --, any path goes.
    for (const p of rest) if (!existsAsPath(io.cwd, p)) throw new UsageError(`"${p}" is neither a revision nor a path in the working tree; put paths of deleted notes after --`);
    paths = [...rest, ...paths];

    const pathspecs = (paths.length ? paths : ['.']).map((p) => {
      const rel = relative(root, resolve(io.cwd, p)).split('\\').join('/');
      if (rel.startsWith('..') || isAbsolute(rel)) throw new UsageError(`${p} is outside the repository`);
      return rel === '' ? '.' : rel;
    });

    const base = revs[0] ? { commit: resolveCommit(root, revs[0])!, label: revs[0] } : defaultBase(root);
    const from: RevisionInfo = { rev: revs[0] ?? '', commit: base.commit, label: `${shortCommit(root, base.commit)}${revs[0] ? '' : ` (${base.label})`}` };
    const toCommit = revs[1] ? resolveCommit(root, revs[1])! : null;
    const to: RevisionInfo = { rev: revs[1] ?? '', commit: toCommit, label: toCommit ? shortCommit(root, toCommit) : 'the working tree' };

    const older = await snapshotsAtCommit(root, base.commit, pathspecs);
    const newer = toCommit ? await snapshotsAtCommit(root, toCommit, pathspecs) : await snapshotsInWorkingTree(root, pathspecs);
    const renames = detectRenames(root, base.commit, toCommit ?? undefined, pathspecs);
    const report: DiffReport = { from, to, ...compareVersions(older, newer, renames) };

    if (format === 'json') io.out(JSON.stringify(report, null, 2) + '\n');
    else if (format === 'markdown') io.out(diffToMarkdown(report));
    else io.out(diffToText(report));
    return 0;
  } catch (e) {
    if (e instanceof UsageError) {
      io.err(`tauline diff: ${e.message}\n${USAGE}\n`);
      return 2;
    }
    if (e instanceof GitError) {
      io.err(`tauline diff: ${e.message}\n`);
      return 2;
    }
    throw e;
  }
}

class UsageError extends Error {}

function existsAsPath(cwd: string, p: string): boolean {
  return existsSync(resolve(cwd, p));
}

async function snapshotsAtCommit(root: string, commit: string, pathspecs: string[]): Promise<NoteSnapshot[]> {
  const paths = filesAtCommit(root, commit, pathspecs).filter(isNote);
  const blobs = readAtCommit(root, commit, paths);
  return evaluate(paths.map((path) => ({ path, text: blobs.get(path)?.toString('utf8'), mode: 'check' as const })));
}

async function snapshotsInWorkingTree(root: string, pathspecs: string[]): Promise<NoteSnapshot[]> {
  const paths = filesInWorkingTree(root, pathspecs).filter(isNote);
  return evaluate(paths.map((path) => ({ path, absPath: resolve(root, path), mode: 'check' as const })));
}

async function evaluate(tasks: NoteTask[]): Promise<NoteSnapshot[]> {
  const outcomes = await runNoteTasks(tasks.map((t) => (t.text === undefined && !t.absPath ? { ...t, text: '' } : t)));
  return outcomes.map((o) => ({ path: o.path, file: o.file, unitSystem: o.unitSystem }));
}

// ---------------------------------------------------------------------------------------------
// Output

function percentText(p: number | null | undefined): string {
  if (p === null || p === undefined) return '';
  const sign = p > 0 ? '+' : p < 0 ? '−' : '±';
  return `${sign}${formatNumber(Math.abs(p), { significantFigures: 3 })} %`;
}

function ratioText(r: number | undefined): string {
  return r === undefined ? '' : formatNumber(r, { significantFigures: 3 });
}

function statusText(pass: boolean | undefined): string {
  return pass === undefined ? '' : pass ? 'pass' : 'FAILS';
}

function blockName(b: BlockChange): string {
  return b.title ? `"${b.title}"` : `at line ${b.newLine ?? b.oldLine}`;
}

function summaryText(d: ResultsDiff): string {
  const s = d.summary;
  const parts: string[] = [];
  const plural = (n: number, w: string, ws = w + 's') => `${n} ${n === 1 ? w : ws}`;
  parts.push(`${plural(s.changedNotes, 'note')} of ${s.notes} changed`);
  if (s.movedValues) parts.push(`${plural(s.movedValues, 'value')} moved`);
  if (s.newlyFailing) parts.push(`${plural(s.newlyFailing, 'check')} now ${s.newlyFailing === 1 ? 'fails' : 'fail'}`);
  if (s.newlyPassing) parts.push(`${plural(s.newlyPassing, 'check')} now ${s.newlyPassing === 1 ? 'passes' : 'pass'}`);
  if (s.addedBlocks) parts.push(`${plural(s.addedBlocks, 'block')} added`);
  if (s.removedBlocks) parts.push(`${plural(s.removedBlocks, 'block')} removed`);
  if (s.addedNotes) parts.push(`${plural(s.addedNotes, 'note')} added`);
  if (s.removedNotes) parts.push(`${plural(s.removedNotes, 'note')} removed`);
  if (s.renamedNotes) parts.push(`${plural(s.renamedNotes, 'note')} renamed`);
  return parts.join(', ');
}

function valueLine(v: ValueChange): string {
  switch (v.kind) {
    case 'moved':
      return `${v.name}: ${v.oldText} -> ${v.newText}${v.percent != null ? ` (${percentText(v.percent)})` : ''}`;
    case 'unit':
      return `${v.name}: ${v.oldText} -> ${v.newText} (now a different kind of quantity)`;
    case 'added':
      return `${v.name}: new, ${v.newText}`;
    case 'removed':
      return `${v.name}: removed (was ${v.oldText})`;
  }
}

function checkLine(c: CheckChange): string {
  switch (c.kind) {
    case 'status':
      return `check ${c.text}: ${statusText(c.oldPass)} -> ${statusText(c.newPass)} (utilisation ${ratioText(c.oldRatio)} -> ${ratioText(c.newRatio)})`;
    case 'ratio':
      return `check ${c.text}: utilisation ${ratioText(c.oldRatio)} -> ${ratioText(c.newRatio)}, ${statusText(c.newPass)}`;
    case 'added':
      return `check ${c.text}: new, ${statusText(c.newPass)} (utilisation ${ratioText(c.newRatio)})`;
    case 'removed':
      return `check ${c.text}: removed (was ${statusText(c.oldPass)}, utilisation ${ratioText(c.oldRatio)})`;
  }
}

function noteHeading(n: NoteChange): string {
  if (n.status === 'renamed') return `${n.oldPath} -> ${n.path} (renamed)`;
  if (n.status === 'added') return `${n.path} (new note)`;
  if (n.status === 'removed') return `${n.path} (removed note)`;
  return n.path;
}

export function diffToText(d: DiffReport): string {
  let out = `Results from ${d.from.label} to ${d.to.label}: ${summaryText(d)}\n`;
  for (const n of d.notes) {
    out += `\n${noteHeading(n)}\n`;
    if (n.unreadable) out += `  could not be read ${n.unreadable === 'before' ? 'in the older' : 'in the newer'} version\n`;
    if (n.status === 'added' || n.status === 'removed') {
      for (const b of n.blocks) out += `  block ${blockName(b)}: ${b.values.length} values, ${b.checks.length} checks${failingCount(b, n.status)}\n`;
      continue;
    }
    for (const b of n.blocks) {
      const head = b.status === 'added' ? `new block ${blockName(b)}` : b.status === 'removed' ? `removed block ${blockName(b)}` : `block ${blockName(b)}`;
      out += `  ${head}${b.newLine && b.status !== 'removed' ? ` (line ${b.newLine})` : ''}\n`;
      for (const v of b.values) if (b.status === 'modified') out += `    ${valueLine(v)}\n`;
      for (const c of b.checks) if (b.status === 'modified' || !(c.newPass ?? true)) out += `    ${checkLine(c)}\n`;
      if (b.status !== 'modified') out += `    ${b.values.length} values, ${b.checks.length} checks\n`;
      if (b.errors) out += `    lines with errors: ${b.errors.before} -> ${b.errors.after}\n`;
    }
  }
  if (d.notes.length === 0) out += 'No results changed.\n';
  return out;
}

function failingCount(b: BlockChange, status: 'added' | 'removed'): string {
  const failing = b.checks.filter((c) => (status === 'added' ? c.newPass === false : c.oldPass === false)).length;
  return failing ? ` (${failing} failing)` : '';
}

/** Markdown for a pull-request comment: one table per note, cells escaped. */
export function diffToMarkdown(d: DiffReport): string {
  // Titles come from the note (untrusted): no links, emphasis or HTML can be smuggled into the comment.
  const cell = (s: string) => s.replace(/[\r\n]+/g, ' ').replace(/&/g, '&amp;').replace(/</g, '&lt;').replace(/>/g, '&gt;').replace(/[\\`*_[\]|!#~]/g, '\\$&');
  const code = (s: string) => {
    const flat = s.replace(/[\r\n]+/g, ' ').replace(/\|/g, '\\|');
    const longest = Math.max(0, ...[...flat.matchAll(/`+/g)].map((m) => m[0].length));
    const fence = '`'.repeat(longest + 1);
    return fence + (/^`|`$/.test(flat) ? ` ${flat} ` : flat) + fence;
  };
  const title = (b: BlockChange) => (b.title ? cell(b.title) : `line ${b.newLine ?? b.oldLine}`);
  let out = `### Calculation results: ${code(d.from.label)} → ${d.to.commit ? code(d.to.label) : d.to.label}\n\n${summaryText(d)}.\n`;
  for (const n of d.notes) {
    const heading = n.status === 'renamed' ? `${code(n.oldPath!)} → ${code(n.path)} (renamed)` : n.status === 'added' ? `${code(n.path)} (new note)` : n.status === 'removed' ? `${code(n.path)} (removed note)` : code(n.path);
    out += `\n#### ${heading}\n\n`;
    if (n.unreadable) out += `Could not be read in the ${n.unreadable === 'before' ? 'older' : 'newer'} version.\n\n`;
    const rows: string[] = [];
    const listed: string[] = [];
    for (const b of n.blocks) {
      if (b.status !== 'modified') {
        const failing = b.checks.filter((c) => (b.status === 'added' ? c.newPass === false : c.oldPass === false)).length;
        listed.push(`- ${b.status === 'added' ? 'New' : 'Removed'} block **${title(b)}**: ${b.values.length} values, ${b.checks.length} checks${failing ? `, ${failing} failing` : ''}`);
        continue;
      }
      for (const v of b.values) {
        const change = v.kind === 'moved' ? percentText(v.percent) : v.kind === 'unit' ? 'other kind' : v.kind === 'added' ? 'new' : 'removed';
        rows.push(`| ${title(b)} | ${code(v.name)} | ${cell(v.oldText ?? '—')} | ${cell(v.newText ?? '—')} | ${change} |`);
      }
      for (const c of b.checks) {
        const st = (pass: boolean | undefined, ratio: number | undefined) => (pass === undefined ? '—' : `${pass ? 'pass' : '**fails**'} (${ratioText(ratio)})`);
        const change = c.kind === 'status' ? (c.newPass ? 'now passes' : '**now fails**') : c.kind === 'ratio' ? percentText(percentChange(c.oldRatio!, c.newRatio!)) : c.kind === 'added' ? 'new' : 'removed';
        rows.push(`| ${title(b)} | check ${code(c.text)} | ${st(c.oldPass, c.oldRatio)} | ${st(c.newPass, c.newRatio)} | ${change} |`);
      }
      if (b.errors) rows.push(`| ${title(b)} | lines with errors | ${b.errors.before} | ${b.errors.after} | |`);
    }
    if (rows.length) out += `| Block | Result | Before | After | Change |\n| --- | --- | ---: | ---: | ---: |\n${rows.join('\n')}\n`;
    if (listed.length) out += `${rows.length ? '\n' : ''}${listed.join('\n')}\n`;
    if (!rows.length && !listed.length && !n.unreadable) out += 'Results unchanged.\n';
  }
  if (d.notes.length === 0) out += '\nNo results changed.\n';
  out += `\n<sub>${cell(CAUTION_SHORT)}</sub>\n`;
  return out;
}
