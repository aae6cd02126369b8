/**
 * `tauline check`: evaluates every note and reports. Exit codes (a contract): 0 every check passes
 * and no block has an error; 1 a check fails, a block has an error, or with --frozen a results
 * stamp is stale, missing or damaged; 2 an unreadable file. The JSON output is the contract of
 * PRODUCT.md, extended with `stale` per file and `summary.stale` (stale stamps are listed with or
 * without --frozen; only --frozen makes them fail).
 */
import { CAUTION_SHORT } from '../core/cautions';
import { type JsonFile, type JsonReport, summarize } from '../core/contract';
import { displayPath, findNotes } from './files';
import { describeChanges, type JsonStale, type NoteOutcome } from './note-task';
import { runNoteTasks } from './pool';

export interface CheckOptions {
  paths: string[];
  cwd: string;
  format: 'text' | 'json' | 'github';
  frozen: boolean;
  out: (s: string) => void;
  err: (s: string) => void;
  /** Threads for evaluating notes (default: TAULINE_JOBS, else the number of cores). */
  jobs?: number;
}

/** A file of the JSON report: the contract's file plus the stamps that do not match the results. */
export type CheckedFile = JsonFile & { stale: JsonStale[] };

export async function runCheck(o: CheckOptions): Promise<number> {
  const { files, missing } = findNotes(o.paths, o.cwd);
  let unreadable = missing.length > 0;
  for (const m of missing) o.err(`tauline: cannot read ${m}: no such file or folder\n`);
  const outcomes: NoteOutcome[] = await runNoteTasks(
    files.map((abs) => ({ path: displayPath(abs, o.cwd), absPath: abs, mode: 'check' as const })),
    { jobs: o.jobs },
  );
  const results: CheckedFile[] = [];
  for (const r of outcomes) {
    if (r.readError) {
      unreadable = true;
      o.err(`tauline: cannot read ${r.path}: ${r.readError}\n`);
    }
    results.push({ ...r.file, stale: r.stale });
  }
  const summary: JsonReport['summary'] = { ...summarize(results), stale: results.reduce((n, f) => n + f.stale.length, 0) };

  if (o.format === 'json') {
    o.out(JSON.stringify({ files: results, summary }, null, 2) + '\n');
  } else if (o.format === 'github') {
    for (const f of results) {
      for (const b of f.blocks) {
        for (const d of b.diagnostics) {
          if (d.severity === 'error') o.out(`::error file=${escapeProperty(f.path)},line=${d.line},col=${d.column},title=tauline ${d.code}::${escapeData(d.message)}\n`);
        }
        for (const c of b.checks) {
          if (!c.pass) o.out(`::error file=${escapeProperty(f.path)},line=${c.line},title=tauline check fails::${escapeData(`${c.text} (utilisation ${c.ratio.toFixed(2)})`)}\n`);
        }
      }
      if (o.frozen) {
        for (const s of f.stale) {
          o.out(`::error file=${escapeProperty(f.path)},line=${s.stampLine ?? s.line},title=tauline stale stamp::${escapeData(s.message)}\n`);
        }
      }
    }
    o.out(summaryLine(summary, o.frozen) + '\n');
  } else {
    for (const f of results) {
      if (f.error) continue;
      o.out(`${f.path}\n`);
      if (f.blocks.length === 0) o.out('  no shear blocks\n');
      for (const b of f.blocks) {
        o.out(`  block at line ${b.line}${b.title ? ` "${b.title}"` : ''}: ${Object.keys(b.values).length} values, ${b.checks.length} checks\n`);
        for (const c of b.checks) {
          o.out(`    ${c.pass ? 'pass' : 'FAIL'}  line ${c.line}  ${c.text}  (utilisation ${c.ratio.toFixed(2)})\n`);
        }
        for (const d of b.diagnostics) {
          if (d.code === 'check.fails') continue;
          o.out(`    ${d.severity}  ${f.path}:${d.line}:${d.column}  ${d.message}\n`);
        }
      }
      if (o.frozen) {
        for (const s of f.stale) {
          o.out(`  STALE  ${f.path}:${s.stampLine ?? s.line}  ${s.reason === 'changed' ? `stamp of block "${s.title || `at line ${s.line}`}": ${describeChanges(s.changes)}` : s.message}\n`);
        }
      }
    }
    o.out(`\n${summaryLine(summary, o.frozen)}\n`);
    if (!o.frozen && summary.stale) o.out(`${summary.stale} results ${summary.stale === 1 ? 'stamp does' : 'stamps do'} not match the results; run tauline stamp (tauline check --frozen fails on this).\n`);
    o.out(`${CAUTION_SHORT}\n`);
  }
  if (unreadable) return 2;
  if (summary.failed > 0 || summary.errors > 0) return 1;
  return o.frozen && (summary.stale ?? 0) > 0 ? 1 : 0;
}

function summaryLine(s: JsonReport['summary'], frozen: boolean): string {
  const plural = (n: number, w: string) => `${n} ${w}${n === 1 ? '' : 's'}`;
  const base = `${plural(s.files, 'note')}, ${plural(s.blocks, 'block')}, ${plural(s.checks, 'check')}: ${s.checks - s.failed} pass, ${s.failed} fail; ${plural(s.errors, 'error')}`;
  return frozen ? `${base}; ${plural(s.stale ?? 0, 'stale stamp')}` : base;
}

function escapeData(s: string): string {
  return s.replace(/%/g, '%25').replace(/\r/g, '%0D').replace(/\n/g, '%0A');
}
function escapeProperty(s: string): string {
  return escapeData(s).replace(/:/g, '%3A').replace(/,/g, '%2C');
}
