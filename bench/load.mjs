// Bundles a TypeScript module of the project with esbuild into a temporary file and imports it, so
// each bench measures the same code the CLI ships without a separate compile step.
import { build } from 'esbuild';
import { mkdtempSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join, resolve } from 'node:path';
import { pathToFileURL } from 'node:url';

const dir = mkdtempSync(join(tmpdir(), 'tauline-bench-'));
let n = 0;

export async function loadTs(path) {
  const outfile = join(dir, `m${n++}.cjs`);
  await build({ entryPoints: [resolve(path)], outfile, bundle: true, platform: 'node', format: 'cjs', target: 'node20', logLevel: 'error' });
  return import(pathToFileURL(outfile).href);
}

/** Median of `runs` timings of fn, in milliseconds, after `warm` untimed runs (steady state, as an editor sees it). */
export function time(fn, runs = 5, warm = 3) {
  for (let i = 0; i < warm; i++) fn();
  const t = [];
  for (let i = 0; i < runs; i++) {
    const s = process.hrtime.bigint();
    fn();
    t.push(Number(process.hrtime.bigint() - s) / 1e6);
  }
  t.sort((a, b) => a - b);
  return t[Math.floor(t.length / 2)];
}

export function ratio(a, b) {
  return (a / b).toFixed(3);
}
