// `tauline check` over many generated notes (invented demo-style content, bench/generate.mjs), run
// as a user runs it: `node bin/tauline.js check DIR --json` after `npm run build`. Prints, measured
// in this one run on this machine (ratios, never timed assertions):
//   - 1,000 notes on one thread (TAULINE_JOBS=1) and on all worker threads: the speed-up;
//   - the time as the number of notes grows 10x (100 -> 1,000 and 1,000 -> 10,000, all threads):
//     the growth factor (10 = linear), raw and with the fixed start-up cost (a run over one note)
//     taken out. The second pair is the meaningful one: start-up dominates 100 notes.
import { spawnSync } from 'node:child_process';
import { mkdirSync, mkdtempSync, rmSync, writeFileSync } from 'node:fs';
import { availableParallelism, tmpdir } from 'node:os';
import { join } from 'node:path';
import { generatedNote } from './generate.mjs';

const BIN = join(import.meta.dirname ?? new URL('.', import.meta.url).pathname, '..', 'bin', 'tauline.js');
const BLOCKS_PER_NOTE = 4;
const root = mkdtempSync(join(tmpdir(), 'tauline-check-bench-'));

function makeNotes(count) {
  const dir = join(root, `notes-${count}`);
  mkdirSync(dir);
  for (let i = 0; i < count; i++) {
    // Spread over folders as a real repository would be.
    const sub = join(dir, `part-${String(i % 20).padStart(2, '0')}`);
    mkdirSync(sub, { recursive: true });
    writeFileSync(join(sub, `note-${String(i).padStart(4, '0')}.md`), generatedNote(BLOCKS_PER_NOTE, { seed: i + 1 }));
  }
  return dir;
}

function timeCheck(dir, jobs, repeats = 3) {
  let best = Infinity;
  for (let r = 0; r < repeats; r++) {
    const started = process.hrtime.bigint();
    const run = spawnSync(process.execPath, [BIN, 'check', '--json', dir], { env: { ...process.env, TAULINE_JOBS: String(jobs) }, maxBuffer: 1 << 30, encoding: 'utf8' });
    const ms = Number(process.hrtime.bigint() - started) / 1e6;
    if (run.status !== 0 && run.status !== 1) throw new Error(`tauline check exited ${run.status}: ${run.stderr}`);
    const summary = JSON.parse(run.stdout).summary;
    if (summary.files === 0) throw new Error('no notes checked');
    best = Math.min(best, ms);
  }
  return best;
}

try {
  const cores = availableParallelism();
  const one = makeNotes(1);
  const hundred = makeNotes(100);
  const thousand = makeNotes(1000);
  const tenThousand = makeNotes(10000);
  timeCheck(hundred, cores, 1); // warm the file cache and the bundle

  const startup = timeCheck(one, 1, 3);
  const t1000single = timeCheck(thousand, 1);
  const t1000all = timeCheck(thousand, cores);
  const t100all = timeCheck(hundred, cores);
  const t10000all = timeCheck(tenThousand, cores, 1);

  const fmt = (ms) => `${(ms / 1000).toFixed(2)} s`;
  console.log(`notes of ${BLOCKS_PER_NOTE} blocks each; ${cores} cores`);
  console.log(`start-up (1 note):                 ${fmt(startup)}`);
  console.log(`1,000 notes, 1 thread:             ${fmt(t1000single)}  (${(t1000single / 1000).toFixed(2)} ms a note)`);
  console.log(`1,000 notes, ${cores} worker threads:      ${fmt(t1000all)}  (${(t1000all / 1000).toFixed(2)} ms a note)`);
  console.log(`speed-up from worker threads:      ${(t1000single / t1000all).toFixed(2)}x on ${cores} cores`);
  console.log(`100 notes, ${cores} worker threads:        ${fmt(t100all)}`);
  console.log(`10,000 notes, ${cores} worker threads:     ${fmt(t10000all)}  (${(t10000all / 10000).toFixed(2)} ms a note)`);
  const growth = (small, large) => {
    const net = small - startup > 0.05 * small ? `${((large - startup) / (small - startup)).toFixed(2)}x without start-up` : 'start-up dominates the smaller run';
    return `${(large / small).toFixed(2)}x raw, ${net} (10 = linear)`;
  };
  console.log(`growth 100 -> 1,000 notes:         ${growth(t100all, t1000all)}`);
  console.log(`growth 1,000 -> 10,000 notes:      ${growth(t1000all, t10000all)}`);
} finally {
  rmSync(root, { recursive: true, force: true });
}
