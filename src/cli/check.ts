import { readFileSync } from 'node:fs';
import { CAUTION_SHORT } from '../core/cautions';
import { type JsonFile, noteToJson, summarize } from '../core/contract';
import { evaluateNote } from '../core/note';
import { displayPath, findNotes } from './files';

export interface CheckOptions {
  paths: string[];
  cwd: string;
  format: 'text' | 'json' | 'github';
  frozen: boolean;
  out: (s: string) => void;
  err: (s: string) => void;
}

export async function runCheck(o: CheckOptions): Promise<number> {
  const { files, missing } = findNotes(o.paths, o.cwd);
  const results: JsonFile[] = [];
  let unreadable = missing.length > 0;
  for (const m of missing) o.err(`tauline: cannot read ${m}: no such file or folder\n`);
  for (const abs of files) {
    const path = displayPath(abs, o.cwd);
    let text: string;
    try {
      text = readFileSync(abs, 'utf8');
    } catch (e) {
      unreadable = true;
      o.err(`tauline: cannot read ${path}: ${(e as NodeJS.ErrnoException).code ?? String(e)}\n`);
      results.push({ path, blocks: [], error: 'unreadable' });
      continue;
    }
    results.push(noteToJson(path, evaluateNote(text)));
  }
  const summary = summarize(results);
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
    }
    o.out(summaryLine(summary) + '\n');
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
    }
    o.out(`\n${summaryLine(summary)}\n${CAUTION_SHORT}\n`);
  }
  if (unreadable) return 2;
  return summary.failed > 0 || summary.errors > 0 ? 1 : 0;
}

function summaryLine(s: ReturnType<typeof summarize>): string {
  const plural = (n: number, w: string) => `${n} ${w}${n === 1 ? '' : 's'}`;
  return `${plural(s.files, 'note')}, ${plural(s.blocks, 'block')}, ${plural(s.checks, 'check')}: ${s.checks - s.failed} pass, ${s.failed} fail; ${plural(s.errors, 'error')}`;
}

function escapeData(s: string): string {
  return s.replace(/%/g, '%25').replace(/\r/g, '%0D').replace(/\n/g, '%0A');
}
function escapeProperty(s: string): string {
  return escapeData(s).replace(/:/g, '%3A').replace(/,/g, '%2C');
}
