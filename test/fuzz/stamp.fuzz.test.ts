/**
 * Fuzzing the stamper with real evaluations of any note (and of notes that already carry stamps,
 * damaged or not, in any line ending): stamping never throws, its edits are ordered and reproduce
 * its text, no byte outside the markers changes (stripping before and after gives the same text),
 * a second stamp of the stamped note changes nothing and finds nothing stale, and no stamp shows
 * NaN or Infinity.
 */
import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { extractBlocks } from '../../src/core/blocks';
import { evaluateNote } from '../../src/core/note';
import { findStaleStamps, readStamps, type StampOutcome, stampText, stripStamps } from '../../src/core/stamp';
import { anyNote, mutate, mutation } from './arbitraries';
import { fuzzParameters, testTimeout } from './config';

const still = { now: () => 0 };

function applyEdits(text: string, out: StampOutcome): string {
  let prev = -1;
  let result = '';
  let at = 0;
  for (const e of out.edits) {
    expect(e.start, 'edits in order, not overlapping').toBeGreaterThanOrEqual(Math.max(prev, at));
    expect(e.end).toBeGreaterThanOrEqual(e.start);
    result += text.slice(at, e.start) + e.newText;
    at = e.end;
    prev = e.end;
  }
  return result + text.slice(at);
}

const lineEnding = fc.constantFrom('\n', '\r\n', '\r');

/** A note in some line ending, maybe with a BOM, maybe already stamped and then edited. */
const stampableNote = fc
  .tuple(anyNote, lineEnding, fc.boolean(), fc.boolean(), fc.array(mutation, { maxLength: 3 }))
  .map(([text, eol, bom, prestamp, edits]) => {
    let t = text.replace(/\r\n|\r|\n/g, eol);
    if (bom) t = '\ufeff' + t;
    if (prestamp) {
      t = stampText(t, evaluateNote(t, still)).text;
      t = mutate(t, edits);
    }
    return t;
  });

describe('stamper', () => {
  it('changes nothing outside its markers, and a second stamp changes nothing', () => {
    fc.assert(
      fc.property(stampableNote, (text) => {
        const note = evaluateNote(text, still);
        const out = stampText(text, note);
        expect(applyEdits(text, out), 'edits reproduce the text').toBe(out.text);
        expect(out.changed).toBe(out.text !== text);
        // Stripping removes exactly what stamping wrote: the bytes outside the markers are the note's own.
        expect(stripStamps(out.text).text, text).toBe(stripStamps(text).text);
        if (readStamps(text).stamps.length === 0 && readStamps(text).problems.length === 0) expect(stripStamps(out.text).text).toBe(text);
        const again = evaluateNote(out.text, still);
        const second = stampText(out.text, again);
        expect(second.changed, out.text).toBe(false);
        expect(findStaleStamps(out.text, again), out.text).toEqual([]);
        const added = out.edits.map((e) => e.newText).join('\n');
        for (const w of ['NaN', 'Infinity', '∞', 'not a number', 'undefined', '[object']) if (!text.includes(w)) expect(added, `stamp shows ${w}`).not.toContain(w);
      }),
      fuzzParameters(120),
    );
  }, testTimeout());

  it('reads, strips and checks staleness of anything without throwing', () => {
    fc.assert(
      fc.property(stampableNote, fc.array(mutation, { minLength: 1, maxLength: 4 }), (text, edits) => {
        const other = mutate(text, edits);
        const note = evaluateNote(text, still);
        // A closing fence that became content in the other text is pinned as stamp-foreign-result (regressions.test.ts).
        const now = extractBlocks(other);
        if (note.blocks.some((b, i) => now[i] && now[i]!.fenceLine === b.block.fenceLine && now[i]!.closed !== b.block.closed)) return;
        // A NoteResult from another text must be refused or harmless, never applied at the wrong lines.
        const out = stampText(other, note);
        expect(stripStamps(out.text).text).toBe(stripStamps(other).text);
        readStamps(other);
        findStaleStamps(other, evaluateNote(text, still));
      }),
      fuzzParameters(80),
    );
  }, testTimeout());
});
