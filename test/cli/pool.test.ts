/**
 * Notes evaluated on worker threads give the same output, in the same order, as on one thread; a
 * worker that dies leaves its notes to the main thread. The notes are invented.
 */
import { mkdtempSync, readFileSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { NoteTask } from '../../src/cli/note-task';
import { runNoteTasks } from '../../src/cli/pool';
import { ensureBuilt, REPO, tauline } from './built';

let dir: string;
const noteText = (i: number) => `# Note ${i}\n\n\`\`\`shear Part ${i}\nV = ${(i % 17) + 1} kN\nA = ${40 + (i % 5) * 10} mm * 10 mm\nt = 1.5 * V / A\ncheck t <= ${i % 3 === 0 ? 5 : 50} MPa\n${i % 7 === 0 ? 'bad = 1 kN + 1 mm\n' : ''}\`\`\`\n`;

beforeAll(() => {
  ensureBuilt();
  dir = mkdtempSync(join(tmpdir(), 'tauline-pool-'));
  for (let i = 0; i < 40; i++) writeFileSync(join(dir, `note-${String(i).padStart(2, '0')}.md`), noteText(i));
}, 300_000);
afterAll(() => rmSync(dir, { recursive: true, force: true }));

describe('the worker pool', () => {
  it('gives the same JSON on one thread and on all threads, in path order', () => {
    const one = tauline(['check', '--json', '.'], dir, { TAULINE_JOBS: '1' });
    const all = tauline(['check', '--json', '.'], dir, { TAULINE_JOBS: '4' });
    expect(one.code).toBe(1);
    expect(all.code).toBe(1);
    expect(all.stdout).toBe(one.stdout);
    const paths = JSON.parse(all.stdout).files.map((f: { path: string }) => f.path);
    expect(paths).toEqual([...paths].sort());
    expect(tauline(['check', '.'], dir, { TAULINE_JOBS: '4' }).stdout).toBe(tauline(['check', '.'], dir, { TAULINE_JOBS: '1' }).stdout);
  });

  it('stamps on worker threads exactly as on one thread', () => {
    const copy = (suffix: string) => {
      const d = mkdtempSync(join(tmpdir(), `tauline-pool-${suffix}-`));
      for (let i = 0; i < 20; i++) writeFileSync(join(d, `n${i}.md`), noteText(i));
      return d;
    };
    const [a, b] = [copy('one'), copy('all')];
    try {
      expect(tauline(['stamp', '.'], a, { TAULINE_JOBS: '1' }).stdout).toBe(tauline(['stamp', '.'], b, { TAULINE_JOBS: '4' }).stdout);
      for (let i = 0; i < 20; i++) expect(readFileSync(join(b, `n${i}.md`), 'utf8')).toBe(readFileSync(join(a, `n${i}.md`), 'utf8'));
      expect(readFileSync(join(b, 'n3.md'), 'utf8')).toContain('<!-- /tauline-results -->');
    } finally {
      rmSync(a, { recursive: true, force: true });
      rmSync(b, { recursive: true, force: true });
    }
  });

  it('returns outcomes in task order from the bundled worker', async () => {
    const tasks: NoteTask[] = Array.from({ length: 30 }, (_, i) => ({ path: `n${i}.md`, text: noteText(i), mode: 'check' }));
    const threaded = await runNoteTasks(tasks, { jobs: 3, workerPath: join(REPO, 'dist', 'worker.js') });
    const inline = await runNoteTasks(tasks, { jobs: 1 });
    expect(threaded.map((o) => o.path)).toEqual(tasks.map((t) => t.path));
    expect(threaded).toEqual(inline);
  });

  it('finishes on the main thread when workers die', async () => {
    const dying = join(dir, 'dying-worker.js');
    writeFileSync(dying, 'process.exit(3);\n');
    const tasks: NoteTask[] = Array.from({ length: 12 }, (_, i) => ({ path: `n${i}.md`, text: noteText(i), mode: 'check' }));
    const outcomes = await runNoteTasks(tasks, { jobs: 2, workerPath: dying });
    expect(outcomes).toEqual(await runNoteTasks(tasks, { jobs: 1 }));
  });
});
