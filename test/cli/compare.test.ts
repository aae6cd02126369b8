/**
 * The pure comparison behind `tauline diff` (src/core/compare.ts), on hand-made results in the
 * `check --json` form. Percentages are plain arithmetic, (new − old) / |old| × 100.
 */
import { describe, expect, it } from 'vitest';
import { compareNotes, compareVersions, matchBlocks, type NoteSnapshot, percentChange, sameNumber } from '../../src/core/compare';
import type { JsonBlock, JsonFile } from '../../src/core/contract';

function block(title: string, values: Record<string, number>, checks: [string, boolean, number][] = [], line = 1, errors = 0): JsonBlock {
  return {
    line,
    title,
    values: Object.fromEntries(Object.entries(values).map(([k, si]) => [k, { line, si, unit: 'N', text: `${si / 1000} kN` }])),
    checks: checks.map(([text, pass, ratio]) => ({ line, text, pass, ratio })),
    diagnostics: Array.from({ length: errors }, (_, i) => ({ line: line + i + 1, column: 1, severity: 'error' as const, message: 'bad', code: 'x' })),
  };
}
const snap = (path: string, ...blocks: JsonBlock[]): NoteSnapshot => ({ path, file: { path, blocks } as JsonFile, unitSystem: 'SI' });

describe('numbers', () => {
  it('treats float noise as no change and gives percent changes', () => {
    expect(sameNumber(0.1 + 0.2, 0.3)).toBe(true);
    expect(sameNumber(1, 1 + 1e-6)).toBe(false);
    expect(percentChange(12, 15)).toBe(25);
    expect(percentChange(-10, -5)).toBe(50);
    expect(percentChange(0, 5)).toBeNull();
  });
});

describe('matching blocks', () => {
  it('by title, even when blocks were reordered', () => {
    const pairs = matchBlocks([block('A', { a: 1 }), block('B', { b: 1 })], [block('B', { b: 2 }), block('A', { a: 1 })]);
    expect(pairs.map(([o, n]) => [o?.title, n?.title])).toEqual([
      ['B', 'B'],
      ['A', 'A'],
    ]);
  });

  it('untitled blocks in order, so an inserted block does not shift the ones after it', () => {
    const before = [block('', { a: 1 }), block('', { b: 1 }), block('', { c: 1 })];
    const after = [block('', { a: 1 }), block('', { x: 1 }), block('', { b: 1 }), block('', { c: 2 })];
    const pairs = matchBlocks(before, after);
    expect(pairs.map(([o, n]) => [o && Object.keys(o.values)[0], n && Object.keys(n.values)[0]])).toEqual([
      ['a', 'a'],
      [undefined, 'x'],
      ['b', 'b'],
      ['c', 'c'],
    ]);
  });

  it('a removed block is listed where it was', () => {
    const pairs = matchBlocks([block('A', {}), block('Gone', { g: 1 }), block('C', {})], [block('A', {}), block('C', {})]);
    expect(pairs.map(([o, n]) => [o?.title, n?.title])).toEqual([
      ['A', 'A'],
      ['Gone', undefined],
      ['C', 'C'],
    ]);
  });
});

describe('comparing notes', () => {
  it('moved values, a check that changed status, a ratio that moved, errors that appeared', () => {
    const before = snap('n.md', block('W', { V: 12000, M: 5000 }, [['t <= f', true, 0.9], ['q <= s', true, 0.5]]));
    const after = snap('n.md', block('W', { V: 15000, M: 5000 }, [['t <= f', false, 1.125], ['q <= s', true, 0.6]], 1, 2));
    const c = compareNotes(before, after);
    expect(c.blocks).toHaveLength(1);
    const b = c.blocks[0]!;
    expect(b.values).toEqual([{ name: 'V', kind: 'moved', oldText: '12 kN', newText: '15 kN', oldSi: 12000, newSi: 15000, percent: 25 }]);
    expect(b.checks).toEqual([
      { text: 't <= f', kind: 'status', oldPass: true, newPass: false, oldRatio: 0.9, newRatio: 1.125 },
      { text: 'q <= s', kind: 'ratio', oldPass: true, newPass: true, oldRatio: 0.5, newRatio: 0.6 },
    ]);
    expect(b.errors).toEqual({ before: 0, after: 2 });
  });

  it('a value that now measures something else, and section members', () => {
    const before: NoteSnapshot = { path: 'n.md', unitSystem: 'SI', file: { path: 'n.md', blocks: [{ line: 1, title: '', checks: [], diagnostics: [], values: { x: { line: 2, si: 1, unit: 'N', text: '1 N' }, S: { line: 3, kind: 'section', A: 0.001, I: 1e-6, yc: 0.1, depth: 0.2, Iy: 0, Ixy: 0, tau_max_at: 0.1 } } }] } };
    const after: NoteSnapshot = { path: 'n.md', unitSystem: 'SI', file: { path: 'n.md', blocks: [{ line: 1, title: '', checks: [], diagnostics: [], values: { x: { line: 2, si: 1, unit: 'm', text: '1 m' }, S: { line: 3, kind: 'section', A: 0.001, I: 2e-6, yc: 0.1, depth: 0.2, Iy: 0, Ixy: 0, tau_max_at: 0.1 } } }] } };
    const values = compareNotes(before, after).blocks[0]!.values;
    expect(values[0]).toMatchObject({ name: 'x', kind: 'unit', percent: null });
    expect(values[1]).toMatchObject({ name: 'S.I', kind: 'moved', oldText: '1.00×10⁶ mm⁴', newText: '2.00×10⁶ mm⁴', percent: 100 });
    expect(values).toHaveLength(2);
  });

  it('lists nothing for a note whose results are the same (lines may move)', () => {
    expect(compareNotes(snap('n.md', block('A', { a: 1 }, [], 3)), snap('n.md', block('A', { a: 1 }, [], 9))).blocks).toEqual([]);
  });
});

describe('comparing versions', () => {
  it('added, removed and renamed notes; a rename whose old path still exists is not a rename', () => {
    const d = compareVersions(
      [snap('a.md', block('A', { a: 1 })), snap('old.md', block('O', { o: 1 })), snap('gone.md', block('G', { g: 1 })), snap('kept.md', block('K', { k: 1 }))],
      [snap('a.md', block('A', { a: 1 })), snap('new.md', block('O', { o: 2 })), snap('added.md', block('N', { n: 1 })), snap('kept.md', block('K', { k: 1 })), snap('copy.md', block('K', { k: 1 }))],
      [
        { from: 'old.md', to: 'new.md' },
        { from: 'kept.md', to: 'copy.md' },
      ],
    );
    expect(d.notes.map((n) => [n.path, n.status, n.oldPath])).toEqual([
      ['new.md', 'renamed', 'old.md'],
      ['added.md', 'added', undefined],
      ['copy.md', 'added', undefined],
      ['gone.md', 'removed', undefined],
    ]);
    expect(d.notes[0]!.blocks[0]!.values[0]).toMatchObject({ name: 'o', percent: 100 });
    expect(d.summary).toEqual({ notes: 6, changedNotes: 4, addedNotes: 2, removedNotes: 1, renamedNotes: 1, addedBlocks: 0, removedBlocks: 0, movedValues: 1, newlyFailing: 0, newlyPassing: 0 });
  });
});

describe('Markdown for a pull-request comment', () => {
  it('escapes what a note controls: titles, check texts and paths', async () => {
    const { diffToMarkdown } = await import('../../src/cli/diff');
    const before = snap('a|b.md', block('[x](http://example.invalid) <img> *B*', { V: 1000 }, [['a | b <= `c`', true, 0.5]]));
    const after = snap('a|b.md', block('[x](http://example.invalid) <img> *B*', { V: 2000 }, [['a | b <= `c`', false, 1.5]]));
    const md = diffToMarkdown({ from: { rev: 'A', commit: 'a', label: 'a' }, to: { rev: '', commit: null, label: 'the working tree' }, ...compareVersions([before], [after]) });
    expect(md).toContain('| \\[x\\](http://example.invalid) &lt;img&gt; \\*B\\* | `V` | 1 kN | 2 kN | +100 % |');
    expect(md).toContain('| check `` a \\| b <= `c` `` | pass (0.500) | **fails** (1.50) | **now fails** |');
    expect(md).not.toContain('<img>');
  });
});
