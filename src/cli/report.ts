/**
 * `tauline report [PATHS…] [-o DIR] [--date YYYY-MM-DD] [--scheme auto|light|dark]`: writes one
 * self-contained HTML calculation sheet per note (styles and fonts inlined, no script, nothing
 * fetched) and an index page listing the notes with their check status.
 *
 * Exit codes follow `tauline check`: 0 every check passes and no block has an error; 1 a check
 * fails or a block has an error (the sheets are written all the same); 2 bad command line or an
 * unreadable file.
 */
import { execFileSync } from 'node:child_process';
import { existsSync, mkdirSync, readFileSync, writeFileSync } from 'node:fs';
import { basename, dirname, isAbsolute, join, relative, resolve } from 'node:path';
import { parseArgs } from 'node:util';
import { buildIndexPage, buildPage, EXPORT_CSP, inlineKatexFonts, type NoteSummary, renderNote, summaryText } from '../render/page';
import { displayPath, findNotes } from './files';
import type { CommandIO } from './io';

const USAGE = 'usage: tauline report [PATHS...] [-o DIR] [--date YYYY-MM-DD] [--scheme auto|light|dark]';

export async function runReport(args: string[], io: CommandIO): Promise<number> {
  let values: { output?: string; date?: string; scheme?: string; help?: boolean };
  let positionals: string[];
  try {
    ({ values, positionals } = parseArgs({
      args,
      allowPositionals: true,
      options: { output: { type: 'string', short: 'o' }, date: { type: 'string' }, scheme: { type: 'string' }, help: { type: 'boolean', short: 'h' } },
    }));
  } catch (e) {
    io.err(`tauline report: ${e instanceof Error ? e.message : String(e)}\n${USAGE}\n`);
    return 2;
  }
  if (values.help) {
    io.out(`${USAGE}\n\nWrites one HTML calculation sheet per note and an index.html into DIR (default: reports).\n`);
    return 0;
  }
  const scheme = values.scheme ?? 'auto';
  if (scheme !== 'auto' && scheme !== 'light' && scheme !== 'dark') {
    io.err(`tauline report: --scheme is auto, light or dark\n`);
    return 2;
  }
  if (values.date !== undefined && !/^\d{4}-\d{2}-\d{2}$/.test(values.date)) {
    io.err(`tauline report: --date is written YYYY-MM-DD\n`);
    return 2;
  }
  const date = values.date ?? reportDate();
  const outDir = resolve(io.cwd, values.output ?? 'reports');
  const { files, missing } = findNotes(positionals, io.cwd);
  let unreadable = missing.length > 0;
  for (const m of missing) io.err(`tauline report: cannot read ${m}: no such file or folder\n`);
  const notes = files.filter((f) => !isInside(f, outDir));

  let css: string;
  try {
    css = sheetStyles();
  } catch (e) {
    io.err(`tauline report: cannot read the sheet's styles: ${e instanceof Error ? e.message : String(e)}\n`);
    return 2;
  }
  const entries: { href: string; source: string; title: string; summary: NoteSummary }[] = [];
  const used = new Set<string>();
  let failing = false;
  for (const abs of notes) {
    const source = displayPath(abs, io.cwd);
    let text: string;
    try {
      text = readFileSync(abs, 'utf8');
    } catch (e) {
      unreadable = true;
      io.err(`tauline report: cannot read ${source}: ${e instanceof Error ? e.message : String(e)}\n`);
      continue;
    }
    const rendered = renderNote(text, basename(abs).replace(/\.(md|markdown)$/i, ''));
    const page = buildPage({
      kind: 'export',
      header: { title: rendered.title, project: rendered.project, date, revision: gitRevision(abs), source },
      summary: rendered.summary,
      body: rendered.html,
      csp: EXPORT_CSP,
      css,
      colorScheme: scheme,
    });
    const href = uniqueHref(sheetPath(source), used);
    const target = join(outDir, ...href.split('/'));
    try {
      mkdirSync(dirname(target), { recursive: true });
      writeFileSync(target, page);
    } catch (e) {
      io.err(`tauline report: cannot write ${displayPath(target, io.cwd)}: ${e instanceof Error ? e.message : String(e)}\n`);
      return 2;
    }
    if (rendered.summary.failed || rendered.summary.errors) failing = true;
    entries.push({ href, source, title: rendered.title, summary: rendered.summary });
    io.out(`wrote ${displayPath(target, io.cwd)}  (${summaryText(rendered.summary)})\n`);
  }
  const index = join(outDir, 'index.html');
  try {
    mkdirSync(outDir, { recursive: true });
    writeFileSync(index, buildIndexPage(entries.map((e) => ({ ...e, href: encodeHref(e.href) })), { date, revision: gitRevision(io.cwd) }, indexStyles()));
  } catch (e) {
    io.err(`tauline report: cannot write ${displayPath(index, io.cwd)}: ${e instanceof Error ? e.message : String(e)}\n`);
    return 2;
  }
  io.out(`wrote ${displayPath(index, io.cwd)}  (${entries.length} note${entries.length === 1 ? '' : 's'})\n`);
  return unreadable ? 2 : failing ? 1 : 0;
}

function isInside(file: string, dir: string): boolean {
  const r = relative(dir, file);
  return r !== '' && !r.startsWith('..') && !isAbsolute(r);
}

/** The sheet's path inside the output folder: the note's path with .html; notes outside the working folder go to the top. */
function sheetPath(source: string): string {
  const rel = isAbsolute(source) ? basename(source) : source;
  const parts = rel.split(/[\\/]+/).filter((p) => p && p !== '.' && p !== '..');
  const last = (parts.pop() ?? 'note').replace(/\.(md|markdown)$/i, '');
  return [...parts, `${last}.html`].join('/');
}

function uniqueHref(href: string, used: Set<string>): string {
  let candidate = href;
  for (let n = 2; used.has(candidate.toLowerCase()) || candidate.toLowerCase() === 'index.html'; n++) candidate = href.replace(/\.html$/, `-${n}.html`);
  used.add(candidate.toLowerCase());
  return candidate;
}

function encodeHref(href: string): string {
  return href.split('/').map(encodeURIComponent).join('/');
}

/** Today, or the day of SOURCE_DATE_EPOCH for reproducible builds. */
function reportDate(): string {
  const epoch = Number(process.env.SOURCE_DATE_EPOCH);
  const d = Number.isFinite(epoch) && process.env.SOURCE_DATE_EPOCH ? new Date(epoch * 1000) : new Date();
  return d.toISOString().slice(0, 10);
}

const revisions = new Map<string, string | undefined>();

/** The short commit of the repository holding a file, with "(modified)" when the file differs from it; undefined outside git. */
export function gitRevision(path: string): string | undefined {
  const dir = existsSync(path) && !path.endsWith('.md') && !path.endsWith('.markdown') ? path : dirname(path);
  let head = revisions.get(dir);
  if (!revisions.has(dir)) {
    head = git(['rev-parse', '--short', 'HEAD'], dir);
    revisions.set(dir, head);
  }
  if (!head) return undefined;
  if (dir === path) return head;
  const status = git(['status', '--porcelain', '--', basename(path)], dir);
  return status ? `${head} (modified)` : head;
}

function git(args: string[], cwd: string): string | undefined {
  try {
    const out = execFileSync('git', args, { cwd, encoding: 'utf8', stdio: ['ignore', 'pipe', 'ignore'], timeout: 5000 });
    return out.trim() || undefined;
  } catch {
    return undefined;
  }
}

/** The package folder (where media/ and node_modules/ live), found from the running script or the working folder. */
export function packageRoot(): string {
  const starts = [typeof __dirname === 'string' ? __dirname : undefined, process.argv[1] ? dirname(process.argv[1]) : undefined, process.cwd()];
  for (const start of starts) {
    if (!start) continue;
    let dir = resolve(start);
    for (;;) {
      const pkg = join(dir, 'package.json');
      if (existsSync(pkg)) {
        try {
          if ((JSON.parse(readFileSync(pkg, 'utf8')) as { name?: string }).name === 'tauline') return dir;
        } catch {
          /* not ours */
        }
      }
      const up = dirname(dir);
      if (up === dir) break;
      dir = up;
    }
  }
  throw new Error('cannot find the tauline package folder (media/preview.css)');
}

let stylesCache: string | undefined;

/** The index has no formulas: our stylesheet alone. */
export function indexStyles(root = packageRoot()): string {
  return readFileSync(join(root, 'media', 'preview.css'), 'utf8');
}

/** preview.css and KaTeX's stylesheet with its fonts inlined: everything an exported sheet needs. */
export function sheetStyles(root = packageRoot()): string {
  if (stylesCache !== undefined) return stylesCache;
  const preview = readFileSync(join(root, 'media', 'preview.css'), 'utf8');
  const copied = join(root, 'media', 'katex');
  const katexDir = existsSync(join(copied, 'katex.min.css')) ? copied : join(root, 'node_modules', 'katex', 'dist');
  const katexCss = readFileSync(join(katexDir, 'katex.min.css'), 'utf8');
  const inlined = inlineKatexFonts(katexCss, (file) => {
    try {
      return readFileSync(join(katexDir, 'fonts', file));
    } catch {
      return undefined;
    }
  });
  stylesCache = `${inlined}\n${preview}`;
  return stylesCache;
}
