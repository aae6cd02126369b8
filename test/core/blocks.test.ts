import fc from 'fast-check';
import MarkdownIt from 'markdown-it';
import { describe, expect, it } from 'vitest';
import { extractBlocks } from '../../src/core/blocks';

describe('extractBlocks (CommonMark fences through markdown-it)', () => {
  it('finds backtick and tilde fences with titles and exact lines', () => {
    const text = ['# Note', '', '```shear Girder G2', 'V = 1 kN', '```', '', '~~~shear', 'W = 2 kN', '~~~', '```js', 'x = 1', '```'].join('\n');
    const blocks = extractBlocks(text);
    expect(blocks.map((b) => [b.fenceLine, b.title, b.lines.map((l) => [l.line, l.text])])).toEqual([
      [2, 'Girder G2', [[3, 'V = 1 kN']]],
      [6, '', [[7, 'W = 2 kN']]],
    ]);
  });

  it('maps columns of fences in lists and block quotes', () => {
    const text = ['- item', '', '  ```shear', '  V = 1 kN', '  ```', '', '> ```shear', '> W = 2 kN', '> ```'].join('\n');
    const blocks = extractBlocks(text);
    expect(blocks).toHaveLength(2);
    expect(blocks[0]!.lines[0]).toEqual({ line: 3, column: 2, text: 'V = 1 kN' });
    expect(blocks[1]!.lines[0]).toEqual({ line: 7, column: 2, text: 'W = 2 kN' });
  });

  it('treats an unclosed fence as running to the end, as CommonMark does', () => {
    const blocks = extractBlocks('```shear\nV = 1 kN\nW = 2 kN');
    expect(blocks[0]!.closed).toBe(false);
    expect(blocks[0]!.lines.map((l) => l.text)).toEqual(['V = 1 kN', 'W = 2 kN']);
  });

  it('handles CRLF line endings and a byte-order mark', () => {
    const blocks = extractBlocks('\ufeff# x\r\n```shear\r\nV = 1 kN\r\n```\r\n');
    expect(blocks[0]!.lines[0]).toEqual({ line: 2, column: 0, text: 'V = 1 kN' });
  });

  it('ignores a fence longer inside and an info string that only starts with shear', () => {
    const blocks = extractBlocks('````shearing\nx\n````\n````shear\n```\n````');
    expect(blocks).toHaveLength(1);
    expect(blocks[0]!.lines.map((l) => l.text)).toEqual(['```']);
  });

  it('property: agrees with markdown-it on which fences exist, and each line maps back to the source', () => {
    const md = new MarkdownIt('commonmark');
    const line = fc.oneof(fc.constantFrom('```shear', '```', '~~~shear', '~~~', '- list', '> quote', '  ```shear', '    code', '', 'V = 1 kN', '# head'), fc.string({ maxLength: 12 }));
    fc.assert(
      fc.property(fc.array(line, { maxLength: 30 }), (lines) => {
        const text = lines.join('\n');
        const expected = md.parse(text, {}).filter((t) => t.type === 'fence' && t.info.trim().split(/\s+/)[0]!.toLowerCase() === 'shear').length;
        const blocks = extractBlocks(text);
        expect(blocks).toHaveLength(expected);
        const src = text.split(/\r\n|\r|\n/);
        for (const b of blocks) for (const l of b.lines) expect(src[l.line]!.slice(l.column)).toBe(l.text);
      }),
      { numRuns: 300 },
    );
  });
});
