/**
 * `tauline report`: one self-contained sheet per note and an index, exit codes as `tauline check`.
 */
import { cpSync, existsSync, mkdirSync, mkdtempSync, readFileSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { describe, expect, it } from 'vitest';
import { runReport } from '../../src/cli/report';
import { ROOT } from './helpers';

function run(args: string[], cwd: string) {
  let out = '';
  let err = '';
  const code = runReport(args, { cwd, out: (s) => (out += s), err: (s) => (err += s) });
  return code.then((c) => ({ code: c, out, err }));
}

function workspace(): string {
  const dir = mkdtempSync(join(tmpdir(), 'tauline-report-'));
  cpSync(join(ROOT, 'examples'), join(dir, 'notes'), { recursive: true });
  return dir;
}

describe('tauline report', () => {
  it('writes a self-contained sheet per note and an index with each status', async () => {
    const dir = workspace();
    const r = await run(['notes', '-o', 'out', '--date', '2026-12-01'], dir);
    expect(r.err).toBe('');
    expect(r.code).toBe(0);
    const sheet = readFileSync(join(dir, 'out', 'notes', 'mezzanine-girder.html'), 'utf8');
    expect(sheet).toContain('<meta http-equiv="Content-Security-Policy" content="default-src &#39;none&#39;');
    expect(sheet).toContain('>2026-12-01<');
    expect(sheet).toContain('>notes/mezzanine-girder.md<');
    expect(sheet).toContain('>all 2 checks pass<');
    expect(sheet).toContain('Have the work checked by a licensed engineer');
    expect(sheet).toMatch(/url\(data:font\/woff2;base64,/);
    expect(sheet).not.toMatch(/<script|<link |url\((?!data:)/);
    const index = readFileSync(join(dir, 'out', 'index.html'), 'utf8');
    for (const f of ['glulam-walkway', 'loading-dock-beam', 'mezzanine-girder', 'timber-box-footbridge']) expect(index).toContain(`href="notes/${f}.html"`);
    expect(index).not.toContain('font/woff2');
  });

  it('exits 1 when a check fails, and still writes the sheet', async () => {
    const dir = mkdtempSync(join(tmpdir(), 'tauline-report-'));
    writeFileSync(join(dir, 'fails.md'), '# Fails\n\n```shear\nV = 10 kN\ncheck V <= 5 kN\n```\n');
    const r = await run(['fails.md', '-o', 'out'], dir);
    expect(r.code).toBe(1);
    expect(readFileSync(join(dir, 'out', 'fails.html'), 'utf8')).toContain('tl-verdict tl-fail');
    expect(readFileSync(join(dir, 'out', 'index.html'), 'utf8')).toContain('1 of 1 check fails');
  });

  it('exits 2 on a bad command line or a missing file', async () => {
    const dir = mkdtempSync(join(tmpdir(), 'tauline-report-'));
    expect((await run(['--scheme', 'purple'], dir)).code).toBe(2);
    expect((await run(['--date', 'yesterday'], dir)).code).toBe(2);
    expect((await run(['--nonsense'], dir)).code).toBe(2);
    expect((await run(['missing.md', '-o', 'out'], dir)).code).toBe(2);
  });

  it('escapes file names and titles in the index, and keeps sheets inside the output folder', async () => {
    const dir = mkdtempSync(join(tmpdir(), 'tauline-report-'));
    mkdirSync(join(dir, 'n'));
    const name = '<img src=x onerror=alert(1)>.md';
    writeFileSync(join(dir, 'n', name), '# <script>alert(1)</script>\n\n```shear\nV = 1 kN\n```\n');
    const r = await run(['n', '-o', 'out'], dir);
    expect(r.code).toBe(0);
    const index = readFileSync(join(dir, 'out', 'index.html'), 'utf8');
    expect(index).not.toMatch(/<img|<script/);
    expect(index).toContain('href="n/%3Cimg%20src%3Dx%20onerror%3Dalert(1)%3E.html"');
    expect(existsSync(join(dir, 'out', 'n', '<img src=x onerror=alert(1)>.html'))).toBe(true);
  });
});
