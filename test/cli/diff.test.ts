/**
 * `tauline diff` on a real temporary git repository with several commits, a renamed, a deleted and
 * a new note, and uncommitted work. Numbers are invented; the percentages asserted are plain
 * arithmetic, (new − old) / old.
 */
import { execFileSync } from 'node:child_process';
import { mkdirSync, mkdtempSync, readFileSync, rmSync, statSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { ensureBuilt, tauline } from './built';

const ENV = { GIT_AUTHOR_NAME: 'Test', GIT_AUTHOR_EMAIL: 'test@example.invalid', GIT_COMMITTER_NAME: 'Test', GIT_COMMITTER_EMAIL: 'test@example.invalid', GIT_CONFIG_NOSYSTEM: '1', HOME: tmpdir() };
function git(cwd: string, ...args: string[]): string {
  return execFileSync('git', args, { cwd, env: { ...process.env, ...ENV }, encoding: 'utf8' });
}

const girder = (v: string, limit: string, extra = '') => `# Girder\n\nInvented demo.\n\n\`\`\`shear Loads\nV = ${v}\n\`\`\`\n\n\`\`\`shear Web\nA = 100 mm * 10 mm\nt = 1.5 * V / A\ncheck t <= ${limit}\n\`\`\`\n${extra}`;
const simple = (name: string, value: string) => `# ${name}\n\n\`\`\`shear\n${name} = ${value}\n\`\`\`\n`;
const longNote = (value: string) => `# Bracket\n\n${'Words that stay the same so git sees a rename. '.repeat(20)}\n\n\`\`\`shear Bracket\nP = ${value}\n\`\`\`\n`;

let repo: string;
let commits: string[] = [];
function write(path: string, text: string) {
  mkdirSync(join(repo, path, '..'), { recursive: true });
  writeFileSync(join(repo, path), text);
}
function commit(message: string): string {
  git(repo, 'add', '-A');
  git(repo, 'commit', '-q', '-m', message);
  return git(repo, 'rev-parse', 'HEAD').trim();
}
function diffJson(args: string[], cwd = repo) {
  const r = tauline(['diff', '--format', 'json', ...args], cwd);
  if (r.code !== 0) throw new Error(`exit ${r.code}: ${r.stderr}`);
  return JSON.parse(r.stdout);
}

beforeAll(() => {
  ensureBuilt();
  repo = mkdtempSync(join(tmpdir(), 'tauline-diff-'));
  git(repo, 'init', '-q', '-b', 'main');
  write('notes/girder.md', girder('12 kN', '20 MPa'));
  write('notes/bracket.md', longNote('5 kN'));
  write('notes/gone.md', `${simple('G', '1 kN')}\n${'A note about something else entirely, to be deleted. '.repeat(8)}\n`);
  write('README.md', '# Readme without blocks\n');
  write('node_modules/pkg/notes.md', simple('X', '1 kN'));
  commits.push(commit('first'));
  git(repo, 'checkout', '-q', '-b', 'feature');
  // second: V grows 12 -> 15 kN (t 18 -> 22.5 MPa, the check now fails), a new block, a note renamed with an edit, one deleted, one added
  write('notes/girder.md', girder('15 kN', '20 MPa', '\n```shear Welds\nq = 2 kN/m\n```\n'));
  git(repo, 'mv', 'notes/bracket.md', 'notes/bracket-b.md');
  write('notes/bracket-b.md', longNote('6 kN'));
  git(repo, 'rm', '-q', 'notes/gone.md');
  write('notes/new.md', `${simple('N', '3 kN')}\n${'Fresh text that has nothing in common with any older note. '.repeat(8)}\n`);
  commits.push(commit('second'));
  // third: the limit is raised so the check passes again
  write('notes/girder.md', girder('15 kN', '25 MPa', '\n```shear Welds\nq = 2 kN/m\n```\n'));
  commits.push(commit('third'));
  // uncommitted work: V back to 14 kN
  write('notes/girder.md', girder('14 kN', '25 MPa', '\n```shear Welds\nq = 2 kN/m\n```\n'));
}, 300_000);

afterAll(() => rmSync(repo, { recursive: true, force: true }));

describe('tauline diff between revisions', () => {
  it('compares two commits: moved values with percent, a check that changed status, new, removed and renamed notes', () => {
    const d = diffJson([commits[0]!, commits[1]!]);
    expect(d.from.commit).toBe(commits[0]);
    expect(d.to.commit).toBe(commits[1]);
    const byPath = Object.fromEntries(d.notes.map((n: { path: string }) => [n.path, n]));
    expect(Object.keys(byPath).sort()).toEqual(['notes/bracket-b.md', 'notes/girder.md', 'notes/gone.md', 'notes/new.md']);

    const g = byPath['notes/girder.md'];
    expect(g.status).toBe('modified');
    const loads = g.blocks.find((b: { title: string }) => b.title === 'Loads');
    expect(loads.values).toEqual([{ name: 'V', kind: 'moved', oldText: '12.0 kN', newText: '15.0 kN', oldSi: 12000, newSi: 15000, percent: 25 }]);
    const web = g.blocks.find((b: { title: string }) => b.title === 'Web');
    const t = web.values.find((v: { name: string }) => v.name === 't');
    expect(t.percent).toBeCloseTo(25, 9);
    expect(web.checks).toEqual([{ text: 't <= 20 MPa', kind: 'status', oldPass: true, newPass: false, oldRatio: expect.closeTo(0.9, 12), newRatio: expect.closeTo(1.125, 12) }]);
    const welds = g.blocks.find((b: { title: string }) => b.title === 'Welds');
    expect(welds).toMatchObject({ status: 'added', values: [{ name: 'q', kind: 'added', newText: expect.any(String) }] });

    expect(byPath['notes/bracket-b.md']).toMatchObject({ status: 'renamed', oldPath: 'notes/bracket.md' });
    expect(byPath['notes/bracket-b.md'].blocks[0].values[0]).toMatchObject({ name: 'P', kind: 'moved', percent: 20 });
    expect(byPath['notes/gone.md'].status).toBe('removed');
    expect(byPath['notes/new.md'].status).toBe('added');
    expect(d.summary).toMatchObject({ addedNotes: 1, removedNotes: 1, renamedNotes: 1, addedBlocks: 1, newlyFailing: 1, newlyPassing: 0 });
  });

  it('defaults to the merge base with the default branch and the working tree', () => {
    const d = diffJson([]);
    expect(d.from.commit).toBe(commits[0]);
    expect(d.from.label).toContain('merge base with main');
    expect(d.to).toMatchObject({ commit: null, label: 'the working tree' });
    const g = d.notes.find((n: { path: string }) => n.path === 'notes/girder.md');
    const loads = g.blocks.find((b: { title: string }) => b.title === 'Loads');
    expect(loads.values[0]).toMatchObject({ oldText: '12.0 kN', newText: '14.0 kN' });
    expect(loads.values[0].percent).toBeCloseTo(100 / 6, 9);
    // with the limit raised, the check passes in both versions; only its utilisation moved
    const web = g.blocks.find((b: { title: string }) => b.title === 'Web');
    expect(web.checks).toEqual([
      { text: 't <= 25 MPa', kind: 'added', newPass: true, newRatio: expect.closeTo(0.84, 12) },
      { text: 't <= 20 MPa', kind: 'removed', oldPass: true, oldRatio: expect.closeTo(0.9, 12) },
    ]);
  });

  it('one revision compares it with the working tree; paths limit the notes', () => {
    const d = diffJson([commits[2]!, '--', 'notes/girder.md']);
    expect(d.notes.map((n: { path: string }) => n.path)).toEqual(['notes/girder.md']);
    expect(d.notes[0].blocks[0].values[0]).toMatchObject({ name: 'V', oldText: '15.0 kN', newText: '14.0 kN' });
    const fromSub = diffJson([commits[2]!, 'girder.md'], join(repo, 'notes'));
    expect(fromSub.notes.map((n: { path: string }) => n.path)).toEqual(['notes/girder.md']);
  });

  it('reports nothing when nothing changed, and ignores node_modules and notes without blocks', () => {
    const d = diffJson([commits[2]!, commits[2]!]);
    expect(d.notes).toEqual([]);
    expect(d.summary.notes).toBe(4);
    expect(tauline(['diff', commits[2]!, commits[2]!], repo).stdout).toContain('No results changed.');
  });

  it('prints text and Markdown for a pull-request comment', () => {
    const text = tauline(['diff', commits[0]!, commits[1]!], repo);
    expect(text.code).toBe(0);
    expect(text.stdout).toContain('V: 12.0 kN -> 15.0 kN (+25.0 %)');
    expect(text.stdout).toContain('check t <= 20 MPa: pass -> FAILS');
    expect(text.stdout).toContain('notes/bracket.md -> notes/bracket-b.md (renamed)');
    const md = tauline(['diff', commits[0]!, commits[1]!, '--format', 'markdown'], repo);
    expect(md.stdout).toContain('| Block | Result | Before | After | Change |');
    expect(md.stdout).toContain('| Loads | `V` | 12.0 kN | 15.0 kN | +25.0 % |');
    expect(md.stdout).toContain('| Web | check `t <= 20 MPa` | pass (0.900) | **fails** (1.13) | **now fails** |');
    expect(md.stdout).toContain('#### `notes/gone.md` (removed note)');
    expect(md.stdout).toContain('- New block **Welds**');
    expect(md.stdout).toMatch(/<sub>.*licensed engineer.*<\/sub>/);
  });

  it('never touches the working tree, the index or HEAD', () => {
    const status = git(repo, 'status', '--porcelain=v1', '-uall');
    const head = git(repo, 'rev-parse', 'HEAD');
    const indexTime = statSync(join(repo, '.git', 'index')).mtimeMs;
    const before = readFileSync(join(repo, 'notes/girder.md'), 'utf8');
    diffJson([commits[0]!, commits[1]!]);
    diffJson([]);
    expect(git(repo, 'status', '--porcelain=v1', '-uall')).toBe(status);
    expect(git(repo, 'rev-parse', 'HEAD')).toBe(head);
    expect(statSync(join(repo, '.git', 'index')).mtimeMs).toBe(indexTime);
    expect(readFileSync(join(repo, 'notes/girder.md'), 'utf8')).toBe(before);
  });

  it('a clone uses origin/HEAD for the default base', () => {
    const clone = mkdtempSync(join(tmpdir(), 'tauline-clone-'));
    try {
      git(tmpdir(), 'clone', '-q', '--branch', 'main', repo, clone);
      // The remote's HEAD names its checked-out branch (feature); point origin/HEAD at main as a host would.
      git(clone, 'remote', 'set-head', 'origin', 'main');
      git(clone, 'checkout', '-q', '-b', 'work');
      writeFileSync(join(clone, 'notes/gone.md'), simple('G', '2 kN'));
      const d = diffJson([], clone);
      expect(d.from.label).toContain('merge base with origin/main');
      expect(d.notes[0]).toMatchObject({ path: 'notes/gone.md', blocks: [{ values: [{ name: 'G', percent: 100 }] }] });
    } finally {
      rmSync(clone, { recursive: true, force: true });
    }
  });

  it('exit 2 for an argument that is neither a revision nor a path, or a path outside the repository', () => {
    const r = tauline(['diff', 'no-such-rev'], repo);
    expect(r.code).toBe(2);
    expect(r.stderr).toContain('"no-such-rev" is neither a revision nor a path');
    expect(tauline(['diff', commits[0]!, '--', '../elsewhere'], repo).code).toBe(2);
  });
});
