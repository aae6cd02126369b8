/**
 * End-to-end tests of the built command line (`node bin/tauline.js`): exit codes, the JSON contract
 * of PRODUCT.md, --frozen, GitHub annotations, and `tauline stamp` on real files. The notes are
 * invented; no engineering value is asserted here (the core's tests do that against references).
 */
import { chmodSync, lstatSync, mkdirSync, mkdtempSync, readFileSync, readlinkSync, rmSync, statSync, symlinkSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterEach, beforeAll, describe, expect, it } from 'vitest';
import { STAMP_BEGIN, STAMP_END } from '../../src/core/stamp';
import { ensureBuilt, tauline } from './built';

const note = (limit: string, extra = '') => `# Bracket\n\nInvented demo.\n\n\`\`\`shear Web\nV = 12 kN\nA = 100 mm * 10 mm\nt = 1.5 * V / A\ncheck t <= ${limit}\n${extra}\`\`\`\n\nClosing words.\n`;
const PASSING = note('20 MPa');
const FAILING = note('10 MPa');
const BROKEN = note('20 MPa', 'x = 5 kN + 3 mm\n');

let dir: string;
function folder(files: Record<string, string | Buffer>): string {
  dir = mkdtempSync(join(tmpdir(), 'tauline-cli-'));
  for (const [name, content] of Object.entries(files)) {
    mkdirSync(join(dir, name, '..'), { recursive: true });
    writeFileSync(join(dir, name), content);
  }
  return dir;
}
afterEach(() => {
  if (dir) {
    rmSync(dir, { recursive: true, force: true });
  }
});

beforeAll(() => ensureBuilt(), 300_000);

describe('tauline check: exit codes', () => {
  it('0 when every check passes', () => {
    const r = tauline(['check', '.'], folder({ 'a.md': PASSING }));
    expect(r.stderr).toBe('');
    expect(r.code).toBe(0);
    expect(r.stdout).toContain('pass  line 9  t <= 20 MPa');
  });

  it('1 when a check fails or a block has an error', () => {
    expect(tauline(['check'], folder({ 'a.md': FAILING })).code).toBe(1);
    expect(tauline(['check'], folder({ 'a.md': BROKEN })).code).toBe(1);
  });

  it('2 for a bad command line or a path that does not exist; the others are still checked', () => {
    expect(tauline(['check', '--no-such-option'], folder({ 'a.md': PASSING })).code).toBe(2);
    expect(tauline(['check', '--format', 'xml'], folder({ 'a.md': PASSING })).code).toBe(2);
    expect(tauline(['bogus'], dir).code).toBe(2);
    const r = tauline(['check', 'a.md', 'missing.md'], folder({ 'a.md': PASSING }));
    expect(r.code).toBe(2);
    expect(r.stderr).toContain('missing.md');
    expect(r.stdout).toContain('a.md');
  });
});

describe('tauline check --json keeps the contract', () => {
  it('has the shape PRODUCT.md gives, extended with stale stamps', () => {
    const r = tauline(['check', '--json', '.'], folder({ 'notes/a.md': FAILING, 'notes/b.md': BROKEN }));
    expect(r.code).toBe(1);
    const out = JSON.parse(r.stdout);
    expect(Object.keys(out).sort()).toEqual(['files', 'summary']);
    expect(out.files.map((f: { path: string }) => f.path)).toEqual(['notes/a.md', 'notes/b.md']);
    const [a, b] = out.files;
    expect(a.blocks[0]).toMatchObject({ line: 5, title: 'Web' });
    expect(a.blocks[0].values.V).toEqual({ line: 6, si: 12000, unit: 'N', text: '12.0 kN' });
    expect(a.blocks[0].values.t).toMatchObject({ line: 8, unit: 'Pa' });
    expect(a.blocks[0].checks).toEqual([{ line: 9, text: 't <= 10 MPa', pass: false, ratio: expect.any(Number) }]);
    expect(a.stale).toEqual([]);
    const d = b.blocks[0].diagnostics.find((x: { severity: string }) => x.severity === 'error');
    expect(d).toMatchObject({ line: 10, column: expect.any(Number), severity: 'error', message: expect.any(String), code: expect.any(String) });
    expect(out.summary).toEqual({ files: 2, blocks: 2, checks: 2, failed: 1, errors: 1, stale: 0 });
  });
});

describe('tauline check --frozen', () => {
  it('passes on fresh stamps and fails on a stale one, naming the block and the values', () => {
    const cwd = folder({ 'a.md': PASSING, 'b.md': PASSING.replace('Web', 'Other') });
    expect(tauline(['stamp'], cwd).code).toBe(0);
    expect(tauline(['check', '--frozen'], cwd).code).toBe(0);
    writeFileSync(join(cwd, 'a.md'), readFileSync(join(cwd, 'a.md'), 'utf8').replace('V = 12 kN', 'V = 13 kN'));
    expect(tauline(['check'], cwd).code).toBe(0);
    const r = tauline(['check', '--frozen'], cwd);
    expect(r.code).toBe(1);
    expect(r.stdout).toMatch(/STALE {2}a\.md:\d+ {2}stamp of block "Web": V 12\.0 kN -> 13\.0 kN, t 18\.0 MPa -> 19\.5 MPa/);
    expect(r.stdout).toContain('1 stale stamp');

    const json = JSON.parse(tauline(['check', '--frozen', '--json'], cwd).stdout);
    expect(json.summary.stale).toBe(1);
    expect(json.files[0].stale[0]).toMatchObject({ line: 5, title: 'Web', reason: 'changed', stampLine: 12 });
    expect(json.files[0].stale[0].changes[0]).toEqual({ name: 'V', old: '12.0 kN', new: '13.0 kN' });
    expect(json.files[1].stale).toEqual([]);

    const gh = tauline(['check', '--frozen', '--format', 'github'], cwd);
    expect(gh.code).toBe(1);
    expect(gh.stdout).toMatch(/^::error file=a\.md,line=12,title=tauline stale stamp::The results stamp after the block at line 5 "Web" is stale: V 12\.0 kN -> 13\.0 kN/m);
  });

  it('fails on damaged markers too', () => {
    const cwd = folder({ 'a.md': PASSING });
    tauline(['stamp'], cwd);
    writeFileSync(join(cwd, 'a.md'), readFileSync(join(cwd, 'a.md'), 'utf8').replace(STAMP_END, ''));
    const r = tauline(['check', '--frozen', '--json'], cwd);
    expect(r.code).toBe(1);
    expect(JSON.parse(r.stdout).files[0].stale[0]).toMatchObject({ reason: 'damaged' });
  });

  it('annotates failing checks and errors for GitHub', () => {
    const r = tauline(['check', '--format', 'github'], folder({ 'a.md': FAILING, 'b.md': BROKEN }));
    expect(r.code).toBe(1);
    expect(r.stdout).toContain('::error file=a.md,line=9,title=tauline check fails::t <= 10 MPa');
    expect(r.stdout).toMatch(/::error file=b\.md,line=10,col=\d+,title=tauline [\w.-]+::/);
  });
});

describe('tauline stamp', () => {
  it('stamps, is idempotent, and --remove gives back the original bytes (CRLF, BOM, no final newline)', () => {
    const original = '\ufeff' + PASSING.replace(/\n/g, '\r\n').replace(/\r\n$/, '') + '   ';
    const cwd = folder({ 'a.md': original });
    const r = tauline(['stamp'], cwd);
    expect(r.code).toBe(0);
    expect(r.stdout).toContain('stamped a.md (1 block)');
    const once = readFileSync(join(cwd, 'a.md'));
    const text = once.toString('utf8');
    expect(text.startsWith('\ufeff# Bracket\r\n')).toBe(true);
    expect(text).toContain('```\r\n\r\n' + STAMP_BEGIN + '\r\n\r\n| Result | Value | Check |\r\n');
    expect(text).toContain('| `t <= 20 MPa` | 18.0 MPa ≤ 20.0 MPa | ratio 0.900, pass |');
    expect(text.replace(/\r\n/g, '')).not.toMatch(/\n/);

    const again = tauline(['stamp'], cwd);
    expect(again.code).toBe(0);
    expect(again.stdout).toContain('0 stamped, 1 unchanged');
    expect(readFileSync(join(cwd, 'a.md')).equals(once)).toBe(true);

    expect(tauline(['stamp', '--remove'], cwd).code).toBe(0);
    expect(readFileSync(join(cwd, 'a.md'), 'utf8')).toBe(original);
  });

  it('keeps the file mode and a symbolic link', () => {
    const cwd = folder({ 'real/a.md': PASSING });
    chmodSync(join(cwd, 'real/a.md'), 0o640);
    symlinkSync('real/a.md', join(cwd, 'link.md'));
    expect(tauline(['stamp', 'link.md'], cwd).code).toBe(0);
    expect(lstatSync(join(cwd, 'link.md')).isSymbolicLink()).toBe(true);
    expect(readlinkSync(join(cwd, 'link.md'))).toBe('real/a.md');
    expect(readFileSync(join(cwd, 'real/a.md'), 'utf8')).toContain(STAMP_BEGIN);
    expect(statSync(join(cwd, 'real/a.md')).mode & 0o777).toBe(0o640);
  });

  it('a read-only file is a clear error (exit 2) and the other notes are still stamped', () => {
    const cwd = folder({ 'a.md': PASSING, 'b.md': PASSING, 'c.md': PASSING });
    chmodSync(join(cwd, 'b.md'), 0o444);
    const r = tauline(['stamp'], cwd);
    expect(r.code).toBe(2);
    expect(r.stderr).toContain('cannot write b.md: the file is read-only');
    expect(readFileSync(join(cwd, 'b.md'), 'utf8')).toBe(PASSING);
    expect(readFileSync(join(cwd, 'a.md'), 'utf8')).toContain(STAMP_BEGIN);
    expect(readFileSync(join(cwd, 'c.md'), 'utf8')).toContain(STAMP_BEGIN);
  });

  it('a path that is gone is a clear error (exit 2) and the others are still stamped', () => {
    const cwd = folder({ 'a.md': PASSING });
    const r = tauline(['stamp', 'gone.md', 'a.md'], cwd);
    expect(r.code).toBe(2);
    expect(r.stderr).toContain('cannot read gone.md');
    expect(readFileSync(join(cwd, 'a.md'), 'utf8')).toContain(STAMP_BEGIN);
  });

  it('refuses a file that is not UTF-8 (rewriting it would change other bytes)', () => {
    const bytes = Buffer.concat([Buffer.from(PASSING), Buffer.from([0xff, 0xfe, 0x0a])]);
    const cwd = folder({ 'a.md': bytes });
    const r = tauline(['stamp'], cwd);
    expect(r.code).toBe(2);
    expect(r.stderr).toContain('not valid UTF-8');
    expect(readFileSync(join(cwd, 'a.md')).equals(bytes)).toBe(true);
  });

  it('stamps a note with a failing check but exits 1; damaged markers are reported and left alone', () => {
    const cwd = folder({ 'a.md': FAILING });
    const r = tauline(['stamp'], cwd);
    expect(r.code).toBe(1);
    expect(readFileSync(join(cwd, 'a.md'), 'utf8')).toContain('ratio 1.80, **fails**');

    const damaged = PASSING + `\n${STAMP_BEGIN}\nstray\n`;
    writeFileSync(join(cwd, 'a.md'), damaged);
    const d = tauline(['stamp'], cwd);
    expect(d.code).toBe(1);
    expect(d.stderr).toMatch(/a\.md:14: error: The results stamp at line 14 does not follow a shear block/);
    const after = readFileSync(join(cwd, 'a.md'), 'utf8');
    expect(after.endsWith(`\n${STAMP_BEGIN}\nstray\n`)).toBe(true);
  });

  it('--dry-run writes nothing', () => {
    const cwd = folder({ 'a.md': PASSING });
    const r = tauline(['stamp', '--dry-run'], cwd);
    expect(r.code).toBe(0);
    expect(r.stdout).toContain('would stamp a.md');
    expect(readFileSync(join(cwd, 'a.md'), 'utf8')).toBe(PASSING);
    expect(tauline(['stamp', '--nope'], cwd).code).toBe(2);
  });
});

describe('tauline diff: command line', () => {
  it('2 outside a git repository and for a bad --format', () => {
    const cwd = folder({ 'a.md': PASSING });
    const r = tauline(['diff'], cwd, { GIT_CEILING_DIRECTORIES: tmpdir() });
    expect(r.code).toBe(2);
    expect(r.stderr).toContain('not inside a git repository');
    expect(tauline(['diff', '--format', 'html'], cwd).code).toBe(2);
  });
});
