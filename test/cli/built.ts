/**
 * The built command line for end-to-end tests: runs `node scripts/build.mjs` once when dist/ is
 * older than the sources (a lock folder keeps parallel test files from building at the same time),
 * and runs `node bin/tauline.js …` as a child process.
 */
import { spawnSync, type SpawnSyncReturns } from 'node:child_process';
import { existsSync, mkdirSync, readdirSync, rmdirSync, statSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';

export const REPO = join(__dirname, '..', '..');
export const BIN = join(REPO, 'bin', 'tauline.js');

function newestSource(dir: string): number {
  let newest = 0;
  for (const name of readdirSync(dir)) {
    const full = join(dir, name);
    const st = statSync(full);
    newest = Math.max(newest, st.isDirectory() ? newestSource(full) : st.mtimeMs);
  }
  return newest;
}

function fresh(): boolean {
  const outputs = ['dist/cli.js', 'dist/worker.js'].map((p) => join(REPO, p));
  if (!outputs.every(existsSync)) return false;
  const built = Math.min(...outputs.map((p) => statSync(p).mtimeMs));
  return built >= newestSource(join(REPO, 'src'));
}

export function ensureBuilt(): void {
  if (fresh()) return;
  const lock = join(tmpdir(), `tauline-build-lock-${Buffer.from(REPO).toString('hex').slice(-24)}`);
  const deadline = Date.now() + 120_000;
  for (;;) {
    try {
      mkdirSync(lock);
      break;
    } catch {
      if (Date.now() > deadline) throw new Error(`build lock ${lock} held too long`);
      Atomics.wait(new Int32Array(new SharedArrayBuffer(4)), 0, 0, 200);
    }
  }
  try {
    if (!fresh()) {
      const r = spawnSync(process.execPath, ['scripts/build.mjs'], { cwd: REPO, encoding: 'utf8' });
      if (r.status !== 0) throw new Error(`build failed:\n${r.stdout}\n${r.stderr}`);
    }
  } finally {
    rmdirSync(lock);
  }
}

export function tauline(args: string[], cwd: string, env: Record<string, string> = {}): SpawnSyncReturns<string> & { code: number } {
  const r = spawnSync(process.execPath, [BIN, ...args], { cwd, encoding: 'utf8', env: { ...process.env, ...env }, timeout: 120_000 });
  return Object.assign(r, { code: r.status ?? -1 });
}
