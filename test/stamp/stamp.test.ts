import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { extractBlocks } from '../../src/core/blocks';
import { findStaleStamps, readStamps, STAMP_BEGIN, STAMP_END, stampText, stripStamps } from '../../src/core/stamp';
import { fakeNote } from './fake-note';

const stamp = (text: string, override?: (name: string) => string | undefined) => stampText(text, fakeNote(text, override));

describe('stampText: layout of a stamp', () => {
  it('writes a results table right after the closing fence, between our markers', () => {
    const text = '# Note\n\n```shear Girder\nV = abc\ncheck t <= 2 MPa\n```\n\nAfter.\n';
    const out = stamp(text);
    expect(out.changed).toBe(true);
    expect(out.blocks).toBe(1);
    expect(out.text).toBe(
      [
        '# Note',
        '',
        '```shear Girder',
        'V = abc',
        'check t <= 2 MPa',
        '```',
        '',
        STAMP_BEGIN,
        '',
        '| Result | Value | Check |',
        '| --- | --- | --- |',
        '| `V` | 3 kN | |',
        '| `t <= 2 MPa` | 1 MPa ≤ 2 MPa | ratio 0.500, pass |',
        '',
        STAMP_END,
        '',
        'After.',
        '',
      ].join('\n'),
    );
  });

  it('marks a failing check and counts lines with errors, without line numbers', () => {
    const out = stamp('```shear\ncheck a FAIL\nx = !\n```');
    expect(out.text).toContain('| `a FAIL` | 1 MPa ≤ 2 MPa | ratio 1.25, **fails** |');
    expect(out.text).toContain('| `x` | not evaluated (error) | |');
    expect(out.text).toContain('| _errors_ | 1 line has an error | |');
    expect(out.text).not.toMatch(/line \d/);
  });

  it('keeps CRLF, a BOM and a missing final newline', () => {
    const text = '\ufeffIntro  \r\n```shear\r\nV = 12\r\n```';
    const out = stamp(text);
    expect(out.text.startsWith('\ufeffIntro  \r\n```shear\r\nV = 12\r\n```\r\n\r\n<!-- tauline-results')).toBe(true);
    expect(out.text.endsWith(STAMP_END)).toBe(true);
    expect(out.text.replace(/\r\n/g, '')).not.toMatch(/[\r\n]/);
    expect(stripStamps(out.text).text).toBe(text);
  });

  it('stays inside a block quote or list item, with the fence line prefix', () => {
    const quoted = stamp('> ```shear\n> V = 1\n> ```\n> more\n');
    expect(quoted.text).toContain('> ```\n>\n> ' + STAMP_BEGIN + '\n>\n> | Result');
    expect(quoted.text).toContain('>\n> ' + STAMP_END + '\n> more\n');
    const listed = stamp('- item\n\n  ```shear\n  V = 1\n  ```\n');
    expect(listed.text).toContain('  ```\n\n  ' + STAMP_BEGIN + '\n\n  | Result');
    for (const t of [quoted.text, listed.text]) expect(stamp(t).changed).toBe(false);
  });

  it('does not stamp a block whose fence is never closed', () => {
    const out = stamp('```shear\nV = 1\n');
    expect(out.changed).toBe(false);
    expect(out.problems.map((p) => p.code)).toEqual(['stamp.unclosed-block']);
  });

  it('stamps only the blocks asked for', () => {
    const text = '```shear\nA = 1\n```\n\n```shear\nB = 22\n```\n';
    const out = stampText(text, fakeNote(text), { blocks: [1] });
    expect(readStamps(out.text).stamps.map((s) => s.blockIndex)).toEqual([1]);
  });

  it('refuses results that were computed from another text', () => {
    const out = stampText('intro\n\n```shear\nA = 1\n```\n', fakeNote('```shear\nA = 1\n```\n'));
    expect(out.changed).toBe(false);
    expect(out.problems[0]!.code).toBe('stamp.note-mismatch');
    // same block, same place, but its closing fence has gone since (as a cached evaluation could keep it)
    const unclosed = stampText('```shear\nA = 1\n\n', fakeNote('```shear\nA = 1\n```\n'));
    expect(unclosed.changed).toBe(false);
    expect(unclosed.problems[0]!.code).toBe('stamp.note-mismatch');
  });

  it('returns edits that turn the input into the output', () => {
    const text = '```shear\nA = 1\n```\n\n```shear\nB = 22\n```\n';
    const once = stamp(text);
    const changed = stamp(once.text, (n) => (n === 'B' ? '9 kN' : undefined));
    let rebuilt = once.text;
    for (const e of [...changed.edits].reverse()) rebuilt = rebuilt.slice(0, e.start) + e.newText + rebuilt.slice(e.end);
    expect(rebuilt).toBe(changed.text);
    expect(changed.edits).toHaveLength(1);
  });
});

describe('stale stamps', () => {
  const text = '```shear First\nA = 1\n```\n\n```shear Second\nB = 22\ncheck B <= 3\n```\n';

  it('finds no stale stamp right after stamping', () => {
    const once = stamp(text).text;
    expect(findStaleStamps(once, fakeNote(once))).toEqual([]);
  });

  it('names the block and the values that moved', () => {
    const once = stamp(text).text;
    const stale = findStaleStamps(once, fakeNote(once, (n) => (n === 'B' ? '23 kN' : undefined)));
    expect(stale).toHaveLength(1);
    expect(stale[0]).toMatchObject({ blockIndex: 1, title: 'Second', reason: 'changed', changes: [{ name: 'B', oldText: '2 kN', newText: '23 kN' }] });
    expect(once.split('\n')[stale[0]!.stampLine!]).toBe(STAMP_BEGIN);
  });

  it('rewrites only the changed stamp; the other keeps every byte', () => {
    const once = stamp(text).text;
    const twice = stamp(once, (n) => (n === 'B' ? '23 kN' : undefined)).text;
    const firstStamp = (t: string) => t.slice(0, t.indexOf('```shear Second'));
    expect(firstStamp(twice)).toBe(firstStamp(once));
    expect(twice).toContain('| `B` | 23 kN | |');
  });

  it('treats a formatter’s column padding as no change, and keeps those bytes', () => {
    const once = stamp(text).text;
    const padded = once.replace('| `A` | 1 kN | |', '| `A`    | 1 kN  |    |').replace('| --- | --- | --- |', '|:------|------:|-----|');
    expect(findStaleStamps(padded, fakeNote(padded))).toEqual([]);
    expect(stamp(padded).changed).toBe(false);
  });

  it('treats text a person wrote inside the markers as a change', () => {
    const once = stamp(text).text;
    const edited = once.replace('| `A` | 1 kN | |', '| `A` | 1 kN | |\nhand-written note');
    const stale = findStaleStamps(edited, fakeNote(edited));
    expect(stale[0]!.changes).toEqual([{ name: 'hand-written note', oldText: '' }]);
    expect(stamp(edited).text).toBe(once);
  });

  it('reports a block left without a stamp in a stamped note as missing', () => {
    const once = stamp(text).text;
    const withNew = once + '\n```shear Third\nC = 4\n```\n';
    const stale = findStaleStamps(withNew, fakeNote(withNew));
    expect(stale.map((s) => [s.title, s.reason])).toEqual([['Third', 'missing']]);
    expect(findStaleStamps(text, fakeNote(text))).toEqual([]);
  });
});

describe('damaged markers are reported, never guessed', () => {
  const text = '```shear First\nA = 1\n```\n\n```shear Second\nB = 22\n```\n';
  const once = stamp(text).text;
  const lines = once.split('\n');
  const endLines = lines.flatMap((l, i) => (l === STAMP_END ? [i] : []));

  it('a missing end marker', () => {
    const damaged = lines.filter((_, i) => i !== endLines[0]).join('\n');
    const out = stamp(damaged);
    expect(out.problems.map((p) => [p.code, p.blockIndex])).toEqual([['stamp.missing-end', 0]]);
    expect(out.changed).toBe(false);
    expect(stripStamps(damaged).text).toBe(stripStamps(damaged).text);
    expect(findStaleStamps(damaged, fakeNote(damaged))).toEqual([]);
  });

  it('nested markers', () => {
    const copy = [...lines];
    copy.splice(endLines[0]!, 0, STAMP_BEGIN);
    const damaged = copy.join('\n');
    const out = stamp(damaged);
    expect(out.problems.map((p) => p.code)).toEqual(['stamp.nested']);
    expect(out.text).toBe(damaged);
  });

  it('a stamp that follows no block, and an end marker without a start', () => {
    const damaged = `Intro\n\n${STAMP_BEGIN}\n| x |\n${STAMP_END}\n\n${STAMP_END}\n\n${text}`;
    const out = stamp(damaged);
    expect(out.problems.map((p) => [p.code, p.line])).toEqual([
      ['stamp.not-after-block', 2],
      ['stamp.stray-end', 6],
    ]);
    // The blocks themselves are still stamped; the damaged lines are untouched.
    expect(out.text.startsWith(damaged.slice(0, damaged.indexOf('```shear')))).toBe(true);
    expect(readStamps(out.text).stamps).toHaveLength(2);
  });

  it('markers inside code are text, not markers', () => {
    const doc = '````markdown\n' + once + '````\n\n' + text;
    const out = stamp(doc);
    expect(out.problems).toEqual([]);
    expect(stripStamps(out.text).text).toBe(doc);
  });
});

// ---------------------------------------------------------------------------------------------
// Properties over random notes

const word = fc.stringMatching(/^[A-Za-z0-9 .,:;|*_<>&!-]{0,24}$/);
const name = fc.stringMatching(/^[a-z][a-z0-9_]{0,6}$/);
const statement = fc.oneof(
  fc.tuple(name, fc.stringMatching(/^[a-z0-9 +*]{0,12}$/)).map(([n, v]) => `${n} = ${v || '1'}`),
  fc.tuple(name, fc.constantFrom('<=', '<', '>=', '>')).map(([n, op]) => `check ${n} ${op} 2 MPa`),
  name.map((n) => `check ${n} FAIL`),
  name.map((n) => `${n} = !`),
  fc.constant('# a comment'),
  fc.constant(''),
);
const fenceChar = fc.constantFrom('```', '~~~', '````');

/** A chunk is a list of lines; containers give each line of the chunk a prefix. */
const shearBlock = fc
  .tuple(fenceChar, fc.option(word, { nil: undefined }), fc.array(statement, { maxLength: 5 }), fc.constantFrom('', '', '', '> ', '  ', '   '))
  .map(([fence, title, body, prefix]) => {
    const head = `${fence}shear${title ? ' ' + title.replace(/[`~]/g, '') : ''}`;
    const lines = [head, ...body, fence].map((l) => (prefix === '  ' ? '  ' + l : prefix + l));
    return prefix === '  ' ? ['- list item', '', ...lines] : lines;
  });
const otherCode = fc.constantFrom(
  ['```js', 'const x = 1;', '```'],
  ['```markdown', STAMP_BEGIN, '| a |', STAMP_END, '```'],
  ['', '# Code', '', '    indented code', `    ${STAMP_END}`, ''],
);
const prose = fc.array(word, { minLength: 1, maxLength: 3 }).map((ws) => ws.map((w) => w.replace(/^[\s>|*_<!-]+/, '') || 'text'));
const chunk = fc.oneof(
  { weight: 4, arbitrary: shearBlock },
  { weight: 3, arbitrary: prose },
  { weight: 1, arbitrary: otherCode },
  { weight: 1, arbitrary: fc.constantFrom(['# Heading'], ['<!-- a comment of the author -->'], ['| a | b |', '| - | - |', '| 1 | 2 |'], ['  trailing spaces   ']) },
  { weight: 2, arbitrary: fc.constant(['']) },
);
const eolStyle = fc.constantFrom('\n', '\r\n', '\r', 'mixed');
const note = fc
  .record({ chunks: fc.array(chunk, { maxLength: 8 }), eol: eolStyle, bom: fc.boolean(), finalNewline: fc.boolean(), seed: fc.array(fc.constantFrom('\n', '\r\n'), { minLength: 64, maxLength: 64 }) })
  .map(({ chunks, eol, bom, finalNewline, seed }) => {
    const lines = chunks.flat();
    let text = bom ? '\ufeff' : '';
    lines.forEach((l, i) => {
      const end = eol === 'mixed' ? seed[i % seed.length]! : eol;
      text += l + (i < lines.length - 1 || finalNewline ? end : '');
    });
    return text;
  });

describe('properties of stamping random notes', () => {
  it('stamping twice changes nothing, and stripping gives back the original bytes', () => {
    fc.assert(
      fc.property(note, (text) => {
        const once = stamp(text);
        const twice = stamp(once.text);
        expect(twice.changed).toBe(false);
        expect(twice.text).toBe(once.text);
        expect(stripStamps(once.text).text).toBe(text);
        expect(stripStamps(text).text).toBe(text);
        expect(once.problems.filter((p) => p.severity === 'error')).toEqual([]);
        expect(findStaleStamps(once.text, fakeNote(once.text))).toEqual([]);
      }),
      { numRuns: 400 },
    );
  });

  it('keeps the BOM, and a stamp uses the file’s own line ending', () => {
    fc.assert(
      fc.property(note, (text) => {
        const out = stamp(text).text;
        expect(out.charCodeAt(0) === 0xfeff).toBe(text.charCodeAt(0) === 0xfeff);
        const crlf = (text.match(/\r\n/g) ?? []).length;
        const lf = (text.match(/(?<!\r)\n/g) ?? []).length;
        const cr = (text.match(/\r(?!\n)/g) ?? []).length;
        const own = crlf > lf && crlf >= cr ? '\r\n' : cr > lf && cr > crlf ? '\r' : '\n';
        for (const e of stamp(text).edits) {
          const endings = e.newText.match(/\r\n|\r|\n/g) ?? [];
          for (const x of endings) expect(x).toBe(own);
        }
      }),
      { numRuns: 300 },
    );
  });

  it('a changed value rewrites only its own block’s stamp', () => {
    fc.assert(
      fc.property(note, fc.nat(), (text, pick) => {
        const once = stamp(text).text;
        const blocks = extractBlocks(once).filter((b) => b.closed);
        const names = blocks.flatMap((b) => b.lines.map((l) => /^\s*([a-z]\w*)\s*=\s*(?!!)/.exec(l.text)?.[1]).filter((n): n is string => !!n));
        if (names.length === 0) return;
        const target = names[pick % names.length]!;
        const again = stamp(once, (n) => (n === target ? '999 kN' : undefined));
        expect(stripStamps(again.text).text).toBe(text);
        const stale = findStaleStamps(once, fakeNote(once, (n) => (n === target ? '999 kN' : undefined)));
        for (const e of again.edits) {
          // every edit lies inside one stamp of `once`, strictly between its markers
          const before = once.slice(0, e.start);
          expect(before.lastIndexOf('<!-- tauline-results')).toBeGreaterThan(before.lastIndexOf('<!-- /tauline-results'));
          expect(once.slice(e.end).startsWith(STAMP_END) || /^[ \t>]*<!-- \/tauline-results/.test(once.slice(e.end))).toBe(true);
        }
        expect(again.edits.length).toBe(stale.length);
        for (const s of stale) expect(s.changes.some((c) => c.name === target && c.newText === '999 kN')).toBe(true);
      }),
      { numRuns: 300 },
    );
  });
});
