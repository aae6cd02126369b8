/** The atomic replacement under `tauline stamp`: refusals leave the file as it was and no temporary file behind. */
import { chmodSync, mkdtempSync, readdirSync, readFileSync, rmSync, statSync, unlinkSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterEach, beforeEach, describe, expect, it } from 'vitest';
import { AtomicWriteError, writeFileAtomic } from '../../src/cli/atomic';

let dir: string;
beforeEach(() => {
  dir = mkdtempSync(join(tmpdir(), 'tauline-atomic-'));
});
afterEach(() => rmSync(dir, { recursive: true, force: true }));
const onlyFiles = () => readdirSync(dir).sort();

describe('writeFileAtomic', () => {
  it('replaces the content and keeps the permission bits', () => {
    const p = join(dir, 'a.md');
    writeFileSync(p, 'old');
    chmodSync(p, 0o604);
    writeFileAtomic(p, 'new ✓', { expected: 'old' });
    expect(readFileSync(p, 'utf8')).toBe('new ✓');
    expect(statSync(p).mode & 0o777).toBe(0o604);
    expect(onlyFiles()).toEqual(['a.md']);
  });

  it('refuses a read-only file (even for root), a vanished file and a file edited meanwhile', () => {
    const p = join(dir, 'a.md');
    writeFileSync(p, 'old');
    chmodSync(p, 0o444);
    expect(() => writeFileAtomic(p, 'new')).toThrow(/read-only/);
    chmodSync(p, 0o644);
    expect(() => writeFileAtomic(p, 'new', { expected: 'what was read before' })).toThrow(/changed while it was being stamped/);
    expect(readFileSync(p, 'utf8')).toBe('old');
    unlinkSync(p);
    expect(() => writeFileAtomic(p, 'new')).toThrow(AtomicWriteError);
    expect(() => writeFileAtomic(p, 'new')).toThrow(/no such file/);
    expect(onlyFiles()).toEqual([]);
  });
});
