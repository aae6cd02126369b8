import { readdirSync, statSync } from 'node:fs';
import { join, relative } from 'node:path';

const SKIP = new Set(['node_modules', '.git', 'dist', 'out', 'coverage']);

/** Markdown files named on the command line, folders searched recursively, in a stable order. */
export function findNotes(paths: string[], cwd: string): { files: string[]; missing: string[] } {
  const files: string[] = [];
  const missing: string[] = [];
  const seen = new Set<string>();
  const add = (p: string) => {
    if (!seen.has(p)) {
      seen.add(p);
      files.push(p);
    }
  };
  const walk = (dir: string) => {
    let entries: string[];
    try {
      entries = readdirSync(dir).sort();
    } catch {
      missing.push(dir);
      return;
    }
    for (const name of entries) {
      if (name.startsWith('.') || SKIP.has(name)) continue;
      const full = join(dir, name);
      let st;
      try {
        st = statSync(full);
      } catch {
        continue;
      }
      if (st.isDirectory()) walk(full);
      else if (/\.(md|markdown)$/i.test(name)) add(full);
    }
  };
  for (const p of paths.length ? paths : ['.']) {
    const full = join(cwd, p);
    let st;
    try {
      st = statSync(p.startsWith('/') ? p : full);
    } catch {
      missing.push(p);
      continue;
    }
    const abs = p.startsWith('/') ? p : full;
    if (st.isDirectory()) walk(abs);
    else add(abs);
  }
  return { files, missing: missing.map((m) => (m.startsWith('/') ? relative(cwd, m) || m : m)) };
}

export function displayPath(abs: string, cwd: string): string {
  const r = relative(cwd, abs);
  return r && !r.startsWith('..') ? r.split('\\').join('/') : abs;
}
