import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { extractBlocks } from '../../src/core/blocks';
import { extractBlocksAfterEdit } from '../../src/core/blocks-edit';

const strip = (bs: ReturnType<typeof extractBlocks>) => bs.map(({ index, fenceLine, endLine, closed, title, lines, source }) => ({ index, fenceLine, endLine, closed, title, lines, source }));

describe('extractBlocksAfterEdit', () => {
  it('follows a keystroke inside a block and shifts the blocks below when a line is added', () => {
    const before = '# N\n\n```shear\na = 1 m\n```\n\ntext\n\n```shear B\nb = 2 m\n```\n';
    const after = before.replace('a = 1 m', 'a = 1 m\nc = 3 m');
    const inc = extractBlocksAfterEdit(before, extractBlocks(before), after);
    expect(inc).toBeDefined();
    expect(strip(inc!)).toEqual(strip(extractBlocks(after)));
  });

  it('declines edits that can change Markdown structure', () => {
    const before = '```shear\na = 1 m\n```\n';
    expect(extractBlocksAfterEdit(before, extractBlocks(before), before.replace('a = 1 m', '```'))).toBeUndefined();
    expect(extractBlocksAfterEdit(before, extractBlocks(before), 'x' + before)).toBeUndefined();
    const listed = '- item\n\n  ```shear\n  a = 1 m\n  ```\n';
    expect(extractBlocksAfterEdit(listed, extractBlocks(listed), listed.replace('  a = 1 m', 'a = 1 m'))).toBeUndefined();
  });

  it('property: whenever it answers, it answers what a full parse gives', () => {
    const line = fc.oneof(fc.constantFrom('```shear', '```shear T', '```', '~~~shear', '~~~', '- item', '> quote', '', 'a = 1 m', '  plate 1 mm x 2 mm', '# head', '    code'), fc.string({ maxLength: 8 }));
    const edit = fc.record({ at: fc.nat(), del: fc.nat({ max: 12 }), ins: fc.oneof(fc.string({ maxLength: 10 }), fc.constantFrom('\n', 'x\n', '\n\n', ' = 2 m', '`', '~~~')) });
    let answered = 0;
    fc.assert(
      fc.property(fc.array(line, { maxLength: 20 }), fc.array(edit, { minLength: 1, maxLength: 4 }), (lines, edits) => {
        let text = lines.join('\n');
        let blocks = extractBlocks(text);
        for (const e of edits) {
          const at = text.length ? e.at % (text.length + 1) : 0;
          const next = text.slice(0, at) + e.ins + text.slice(at + e.del);
          const inc = extractBlocksAfterEdit(text, blocks, next);
          const full = extractBlocks(next);
          if (inc) {
            answered++;
            expect(strip(inc)).toEqual(strip(full));
          }
          text = next;
          blocks = full;
        }
      }),
      { numRuns: 3000 },
    );
    console.log(`incremental extraction answered ${answered} edits without a full parse`);
    expect(answered).toBeGreaterThan(20);
  });
});
