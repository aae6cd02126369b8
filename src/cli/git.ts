/**
 * The git plumbing `tauline diff` needs, always through git itself and read-only: revisions are read
 * from the object store (`git ls-tree`, `git cat-file --batch`, the same blobs `git show REV:path`
 * prints), never checked out over the user's files; the index is not touched (optional locks off).
 * Arguments go to git as an argument vector (no shell), pathspecs are literal, and a revision
 * is resolved with --end-of-options, so nothing a user or a note names is read as an option.
 */
import { execFileSync, spawnSync } from 'node:child_process';

export class GitError extends Error {}

const ENV = { ...process.env, GIT_OPTIONAL_LOCKS: '0', GIT_TERMINAL_PROMPT: '0', LC_ALL: 'C' };
// A repository's config could start programs on working-tree commands (fsmonitor); we need none.
const SAFE = ['-c', 'core.fsmonitor=false', '-c', 'core.quotepath=off', '--literal-pathspecs'];

function git(cwd: string, args: string[], input?: string): string {
  const r = spawnSync('git', [...SAFE, ...args], { cwd, env: ENV, encoding: 'utf8', input, maxBuffer: 1 << 30 });
  if (r.error) throw new GitError(`cannot run git: ${r.error.message}`);
  if (r.status !== 0) throw new GitError((r.stderr || `git ${args[0]} failed`).trim());
  return r.stdout;
}

function gitOk(cwd: string, args: string[]): string | undefined {
  const r = spawnSync('git', [...SAFE, ...args], { cwd, env: ENV, encoding: 'utf8', maxBuffer: 1 << 30 });
  return r.status === 0 ? r.stdout : undefined;
}

export function repositoryRoot(cwd: string): string {
  const out = gitOk(cwd, ['rev-parse', '--show-toplevel']);
  if (out === undefined) throw new GitError('not inside a git repository');
  return out.trim();
}

/** The full commit id a revision names, or undefined when it names none. */
export function resolveCommit(root: string, rev: string): string | undefined {
  return gitOk(root, ['rev-parse', '--verify', '--quiet', '--end-of-options', `${rev}^{commit}`])?.trim() || undefined;
}

/**
 * The default older revision: the merge base of HEAD with the default branch (origin/HEAD, else
 * main, master, origin/main, origin/master). On the default branch itself that is HEAD.
 */
export function defaultBase(root: string): { commit: string; label: string } {
  if (!resolveCommit(root, 'HEAD')) throw new GitError('the repository has no commits yet, so there is no revision to compare with');
  const candidates: string[] = [];
  const originHead = gitOk(root, ['symbolic-ref', '-q', 'refs/remotes/origin/HEAD'])?.trim();
  if (originHead) candidates.push(originHead.replace(/^refs\/remotes\//, ''));
  candidates.push('main', 'master', 'origin/main', 'origin/master');
  for (const branch of candidates) {
    if (!resolveCommit(root, branch)) continue;
    const base = gitOk(root, ['merge-base', 'HEAD', branch])?.trim();
    if (base) return { commit: base, label: `merge base with ${branch}` };
  }
  const head = resolveCommit(root, 'HEAD')!;
  return { commit: head, label: 'HEAD (no default branch found)' };
}

/** Files under the pathspecs at a commit, repository-relative, in git's order. */
export function filesAtCommit(root: string, commit: string, pathspecs: string[]): string[] {
  const out = git(root, ['ls-tree', '-r', '-z', '--name-only', '--full-tree', commit, '--', ...pathspecs]);
  return out.split('\0').filter(Boolean);
}

/** Files in the working tree under the pathspecs: tracked and untracked-but-not-ignored, deleted ones left out. */
export function filesInWorkingTree(root: string, pathspecs: string[]): string[] {
  const listed = git(root, ['ls-files', '-z', '--cached', '--others', '--exclude-standard', '--', ...pathspecs]).split('\0').filter(Boolean);
  const deleted = new Set(git(root, ['ls-files', '-z', '--deleted', '--', ...pathspecs]).split('\0').filter(Boolean));
  return [...new Set(listed)].filter((p) => !deleted.has(p)).sort();
}

/** Blob contents at a commit, read in one `git cat-file --batch` process. */
export function readAtCommit(root: string, commit: string, paths: string[]): Map<string, Buffer> {
  const result = new Map<string, Buffer>();
  const batchable = paths.filter((p) => !/[\n\r]/.test(p));
  if (batchable.length > 0) {
    const input = batchable.map((p) => `${commit}:${p}\n`).join('');
    const out = execFileSync('git', [...SAFE, 'cat-file', '--batch'], { cwd: root, env: ENV, input, maxBuffer: 1 << 30 });
    let at = 0;
    for (const p of batchable) {
      const nl = out.indexOf(10, at);
      const header = out.subarray(at, nl).toString('utf8');
      at = nl + 1;
      const m = /^[0-9a-f]+ (\w+) (\d+)$/.exec(header);
      if (!m) continue;
      const size = Number(m[2]);
      if (m[1] === 'blob') result.set(p, out.subarray(at, at + size));
      at += size + 1;
    }
  }
  for (const p of paths) {
    if (result.has(p) || batchable.includes(p)) continue;
    const r = spawnSync('git', [...SAFE, 'show', `${commit}:${p}`], { cwd: root, env: ENV, maxBuffer: 1 << 30 });
    if (r.status === 0) result.set(p, r.stdout);
  }
  return result;
}

/** Renames git detects between a commit and another commit or (to = undefined) the working tree. */
export function detectRenames(root: string, from: string, to: string | undefined, pathspecs: string[]): { from: string; to: string }[] {
  const args = ['diff', '--name-status', '-M', '-z', '--no-ext-diff', from];
  if (to) args.push(to);
  const parts = git(root, [...args, '--', ...pathspecs]).split('\0');
  const renames: { from: string; to: string }[] = [];
  for (let i = 0; i < parts.length; ) {
    const status = parts[i]!;
    if (!status) {
      i++;
      continue;
    }
    if (status.startsWith('R') || status.startsWith('C')) {
      if (status.startsWith('R')) renames.push({ from: parts[i + 1]!, to: parts[i + 2]! });
      i += 3;
    } else i += 2;
  }
  return renames;
}

export function shortCommit(root: string, commit: string): string {
  return gitOk(root, ['rev-parse', '--short', commit])?.trim() || commit.slice(0, 12);
}
