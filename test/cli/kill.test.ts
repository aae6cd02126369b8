/**
 * A crash during `tauline stamp` never leaves a half-written note: the process is killed with
 * SIGKILL (no cleanup runs) at the worst moment (after the new content is flushed to the temporary
 * file, before the rename) and at random moments over many runs on a large note, and the note is
 * always byte for byte either the old version or the new one.
 */
import { spawn } from 'node:child_process';
import { mkdtempSync, readdirSync, readFileSync, rmSync, statSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { BIN, ensureBuilt, tauline } from './built';

/** A large invented note: many blocks and a lot of prose, so writing it takes a while. */
function largeNote(blocks: number): string {
  const prose = 'Invented demo text for the crash test; the numbers mean nothing. '.repeat(40);
  let text = '# Large note\n\n';
  for (let i = 0; i < blocks; i++) {
    text += `${prose}\n\n\`\`\`shear Block ${i}\nV${i} = ${i + 1} kN\nA${i} = 100 mm * 10 mm\nt${i} = 1.5 * V${i} / A${i}\ncheck t${i} <= 4000 MPa\n\`\`\`\n\n`;
  }
  return text;
}

let dir: string;
let oldBytes: Buffer;
let newBytes: Buffer;
let fullRunMs: number;

function spawnStamp(env: Record<string, string> = {}) {
  return spawn(process.execPath, [BIN, 'stamp', 'big.md'], { cwd: dir, env: { ...process.env, TAULINE_JOBS: '1', ...env }, stdio: 'ignore' });
}

beforeAll(() => {
  ensureBuilt();
  dir = mkdtempSync(join(tmpdir(), 'tauline-kill-'));
  oldBytes = Buffer.from(largeNote(1500));
  writeFileSync(join(dir, 'big.md'), oldBytes);
  const started = Date.now();
  const r = tauline(['stamp', 'big.md'], dir, { TAULINE_JOBS: '1' });
  fullRunMs = Date.now() - started;
  expect(r.code).toBe(0);
  newBytes = readFileSync(join(dir, 'big.md'));
  expect(newBytes.equals(oldBytes)).toBe(false);
}, 300_000);

afterAll(() => rmSync(dir, { recursive: true, force: true }));

function reset() {
  writeFileSync(join(dir, 'big.md'), oldBytes);
  for (const f of readdirSync(dir)) if (f.endsWith('.tmp')) rmSync(join(dir, f));
}

function outcome(): 'old' | 'new' | 'mixed' {
  const now = readFileSync(join(dir, 'big.md'));
  return now.equals(oldBytes) ? 'old' : now.equals(newBytes) ? 'new' : 'mixed';
}

describe('killing tauline stamp mid-write', () => {
  it('between the flushed temporary file and the rename: the note is the old version', async () => {
    reset();
    const child = spawnStamp({ TAULINE_TEST_PAUSE_BEFORE_RENAME_MS: '30000' });
    // Wait until the temporary file holds the complete new content, then kill.
    const deadline = Date.now() + 120_000;
    let temp: string | undefined;
    while (Date.now() < deadline) {
      temp = readdirSync(dir).find((f) => f.startsWith('.big.md.tauline-') && f.endsWith('.tmp'));
      if (temp && statSync(join(dir, temp)).size === newBytes.length) break;
      await new Promise((r) => setTimeout(r, 20));
    }
    expect(temp).toBeDefined();
    const exited = new Promise((r) => child.once('exit', r));
    child.kill('SIGKILL');
    await exited;
    expect(outcome()).toBe('old');
    // The leftover temporary file is not a note: check and stamp ignore it, and a rerun completes.
    expect(tauline(['stamp', '.'], dir, { TAULINE_JOBS: '1' }).code).toBe(0);
    expect(outcome()).toBe('new');
  }, 300_000);

  it('at random moments over many runs: always the old or the new version, never a mix', async () => {
    const seen: Record<string, number> = { old: 0, new: 0, mixed: 0 };
    const runs = 12;
    for (let i = 0; i < runs; i++) {
      reset();
      const child = spawnStamp();
      const exited = new Promise((r) => child.once('exit', r));
      // Kill anywhere from start-up to a little past a full run's time.
      const delay = Math.round(((i + Math.random()) / runs) * fullRunMs * 1.1);
      const timer = setTimeout(() => child.kill('SIGKILL'), delay);
      await exited;
      clearTimeout(timer);
      seen[outcome()]!++;
    }
    console.log(`kill test: ${runs} runs, full run ${fullRunMs} ms, outcomes`, seen);
    expect(seen.mixed).toBe(0);
    expect(seen.old + seen.new).toBe(runs);
  }, 600_000);
});
