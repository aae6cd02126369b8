/**
 * Stamping the demo notes with the real evaluator: the stamped note evaluates to the same results,
 * a second stamp changes nothing, no stamp is stale, and stripping gives back the original bytes,
 * in LF and in CRLF with a BOM. (Idempotence only; no engineering value is asserted here.)
 */
import { readdirSync, readFileSync } from 'node:fs';
import { join } from 'node:path';
import { describe, expect, it } from 'vitest';
import { noteToJson } from '../../src/core/contract';
import { evaluateNote, NoteCache } from '../../src/core/note';
import { findStaleStamps, readStamps, stampText, stripStamps } from '../../src/core/stamp';

const dir = join(__dirname, '..', '..', 'examples');
const examples = readdirSync(dir).filter((f) => f.endsWith('.md'));

describe.each(examples)('stamping %s', (name) => {
  const lf = readFileSync(join(dir, name), 'utf8');
  it.each([
    ['LF', lf],
    ['CRLF with a BOM', '\ufeff' + lf.replace(/\r?\n/g, '\r\n')],
  ])('%s', (_label, text) => {
    const note = evaluateNote(text);
    const once = stampText(text, note);
    expect(once.problems).toEqual([]);
    expect(once.blocks).toBe(note.blocks.filter((b) => b.block.closed).length);
    const stampedNote = evaluateNote(once.text);
    const strip = (json: ReturnType<typeof noteToJson>) => JSON.stringify(json, (k, v) => (k === 'line' ? undefined : v));
    expect(strip(noteToJson('x', stampedNote))).toBe(strip(noteToJson('x', note)));
    expect(findStaleStamps(once.text, stampedNote)).toEqual([]);
    expect(stampText(once.text, stampedNote).changed).toBe(false);
    expect(readStamps(once.text).stamps).toHaveLength(once.blocks);
    expect(stripStamps(once.text).text).toBe(text);
  });

  it('works with a cached evaluation, as the language server keeps one', () => {
    const cache = new NoteCache();
    evaluateNote(lf, {}, cache);
    const once = stampText(lf, evaluateNote(lf, {}, cache));
    const again = evaluateNote(once.text, {}, cache);
    expect(findStaleStamps(once.text, again)).toEqual([]);
    expect(stampText(once.text, again).changed).toBe(false);
  });
});
