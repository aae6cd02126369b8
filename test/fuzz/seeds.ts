/**
 * The seed corpus the mutating fuzzers start from: the demo notes in examples/ and the block-language
 * lines written in the test files (string literals that look like statements, parts or loads). Read
 * once per worker from the working tree, so a new test line or demo note feeds the fuzzer with no
 * further work.
 */
import { readdirSync, readFileSync, statSync } from 'node:fs';
import { join, resolve } from 'node:path';

export const ROOT = resolve(__dirname, '..', '..');

function filesUnder(dir: string, ending: string): string[] {
  const out: string[] = [];
  for (const e of readdirSync(dir, { withFileTypes: true })) {
    const p = join(dir, e.name);
    if (e.isDirectory()) out.push(...filesUnder(p, ending));
    else if (e.name.endsWith(ending)) out.push(p);
  }
  return out.sort();
}

/** The demo notes, whole. */
export const EXAMPLE_NOTES: readonly string[] = filesUnder(join(ROOT, 'examples'), '.md').map((f) => readFileSync(f, 'utf8'));

const LANGUAGE_HINT = /(^\s*(section|beam|check|units|plate|circle|tube|box|isection|tee|channel|angle|polygon|hole|pin|roller|fixed|point|udl|ramp|moment|combine)\b)|(^\s*[A-Za-z_]\w*\s*=\s*\S)|(^\s*[A-Za-z_]\w*:\s*(udl|point|ramp|moment)\b)/;

function unescapeLiteral(body: string, quote: string): string {
  return body.replace(/\\(u\{[0-9a-fA-F]+\}|u[0-9a-fA-F]{4}|x[0-9a-fA-F]{2}|.)/g, (_m, e: string) => {
    if (e.startsWith('u{')) return String.fromCodePoint(parseInt(e.slice(2, -1), 16));
    if (e.length === 5 && e[0] === 'u') return String.fromCharCode(parseInt(e.slice(1), 16));
    if (e.length === 3 && e[0] === 'x') return String.fromCharCode(parseInt(e.slice(1), 16));
    return e === 'n' ? '\n' : e === 't' ? '\t' : e === 'r' ? '\r' : e === '0' ? '\0' : e === quote ? quote : e;
  });
}

/** Block-language lines found in string literals of the test files (never this folder's own, which would feed back on itself). */
export const TEST_LINES: readonly string[] = (() => {
  const seen = new Set<string>();
  const files = filesUnder(join(ROOT, 'test'), '.ts').filter((f) => !f.includes(`${join('test', 'fuzz')}`) && statSync(f).size < 2_000_000);
  for (const f of files) {
    const src = readFileSync(f, 'utf8');
    for (const m of src.matchAll(/'((?:[^'\\\n]|\\.)*)'|"((?:[^"\\\n]|\\.)*)"|`((?:[^`\\$]|\\.)*)`/g)) {
      const raw = m[1] ?? m[2] ?? m[3] ?? '';
      const quote = m[1] !== undefined ? "'" : m[2] !== undefined ? '"' : '`';
      for (const line of unescapeLiteral(raw, quote).split(/\r\n|\r|\n/)) {
        if (line.length > 0 && line.length < 300 && !line.startsWith('```') && LANGUAGE_HINT.test(line)) seen.add(line);
      }
    }
  }
  return [...seen].sort();
})();

/** Lines of the demo notes' blocks, for splicing into other notes. */
export const EXAMPLE_LINES: readonly string[] = (() => {
  const out = new Set<string>();
  for (const n of EXAMPLE_NOTES) {
    let inside = false;
    for (const l of n.split('\n')) {
      if (/^\s*(```|~~~)/.test(l)) {
        inside = !inside && /shear/.test(l);
        continue;
      }
      if (inside && l.trim()) out.add(l);
    }
  }
  return [...out].sort();
})();

/** Seed notes: the demo notes, plus small notes made of runs of test lines. */
export const SEED_NOTES: readonly string[] = (() => {
  const notes = [...EXAMPLE_NOTES];
  const lines = TEST_LINES;
  for (let i = 0; i < lines.length; i += 12) {
    notes.push(['# Test lines', '', '```shear', ...lines.slice(i, i + 12), '```', ''].join('\n'));
  }
  return notes;
})();
