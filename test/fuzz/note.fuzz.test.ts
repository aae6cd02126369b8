/**
 * Fuzzing the parser, the evaluator and the JSON contract with notes from the grammar, structured
 * notes that exercise the section engine and beam solver through the language, and mutations of the
 * demo notes and of the lines in the test files. Every note must evaluate without an exception,
 * with well-placed diagnostics, no NaN or Infinity in any result or in the JSON, and within a
 * bounded time; an edited note evaluated incrementally must give what a fresh evaluation gives.
 */
import fc from 'fast-check';
import { afterAll, describe, expect, it } from 'vitest';
import { extractBlocks, splitLines } from '../../src/core/blocks';
import { noteToJson } from '../../src/core/contract';
import { evaluateNote, NoteCache, type NoteOptions } from '../../src/core/note';
import { parseBlock } from '../../src/core/statements';
import { anyNote, blockText, grammarNote, mutatedNote, mutate, mutation, structuredNote } from './arbitraries';
import { fuzzParameters, HANG_MS, testTimeout } from './config';
import { checkDiagnostic, checkNote } from './invariants';
import { SEED_NOTES, TEST_LINES } from './seeds';

const slowest = { ms: 0, chars: 0 };

function timedEvaluate(text: string, options?: NoteOptions, cache?: NoteCache) {
  const t0 = performance.now();
  const r = evaluateNote(text, options, cache);
  const ms = performance.now() - t0;
  if (ms > slowest.ms) Object.assign(slowest, { ms, chars: text.length });
  return { r, ms };
}

afterAll(() => {
  console.log(`note fuzz: seed corpus ${SEED_NOTES.length} notes (${TEST_LINES.length} test lines); slowest evaluation ${slowest.ms.toFixed(1)} ms for ${slowest.chars} characters`);
});

const options: fc.Arbitrary<NoteOptions> = fc.record(
  {
    unitSystem: fc.constantFrom('auto', 'SI', 'US') as fc.Arbitrary<'auto' | 'SI' | 'US'>,
    significantFigures: fc.oneof(fc.integer({ min: 1, max: 10 }), fc.constantFrom(0, -3, 11, 1e9, Number.NaN, 2.5)),
  },
  { requiredKeys: [] },
);

describe('parser', () => {
  it('reads any block without throwing, and puts every diagnostic inside the note', () => {
    fc.assert(
      fc.property(fc.oneof(blockText, mutatedNote), (text) => {
        const lines = splitLines(text).length;
        for (const block of extractBlocks(text)) {
          const parsed = parseBlock(block);
          const problems: string[] = [];
          for (const d of parsed.diagnostics) checkDiagnostic(d, lines, text, 'parse', problems);
          for (const st of parsed.statements) if (st.line < block.fenceLine || st.line > block.endLine) problems.push(`statement on line ${st.line} outside its block`);
          expect(problems, text).toEqual([]);
        }
      }),
      fuzzParameters(400),
    );
  }, testTimeout());
});

describe('evaluator and JSON contract', () => {
  it('evaluates grammar notes: no exception, no NaN or Infinity, diagnostics in place', () => {
    fc.assert(
      fc.property(grammarNote, options, (text, opts) => {
        const { r, ms } = timedEvaluate(text, opts);
        expect(checkNote(text, r), text).toEqual([]);
        expect(ms, `hang: ${text.slice(0, 300)}`).toBeLessThan(HANG_MS);
      }),
      fuzzParameters(250),
    );
  }, testTimeout());

  it('evaluates structured notes that read sections and beams every way the language allows', () => {
    fc.assert(
      fc.property(structuredNote, options, (text, opts) => {
        const { r, ms } = timedEvaluate(text, opts);
        expect(checkNote(text, r), text).toEqual([]);
        expect(ms, `hang: ${text.slice(0, 300)}`).toBeLessThan(HANG_MS);
      }),
      fuzzParameters(250),
    );
  }, testTimeout());

  it('evaluates mutated demo notes and test lines', () => {
    fc.assert(
      fc.property(mutatedNote, options, (text, opts) => {
        const { r, ms } = timedEvaluate(text, opts);
        expect(checkNote(text, r), text).toEqual([]);
        expect(ms, `hang: ${text.slice(0, 300)}`).toBeLessThan(HANG_MS);
      }),
      fuzzParameters(300),
    );
  }, testTimeout());

  it('gives the same results incrementally as from scratch after any edit', () => {
    // A clock that never moves keeps the time budget out of the comparison.
    const still = { now: () => 0 };
    fc.assert(
      fc.property(anyNote, fc.array(mutation, { minLength: 1, maxLength: 4 }), (before, edits) => {
        const after = mutate(before, edits);
        const cache = new NoteCache();
        evaluateNote(before, still, cache);
        const incremental = noteToJson('n.md', evaluateNote(after, still, cache));
        const fresh = noteToJson('n.md', evaluateNote(after, still));
        expect(incremental, after).toEqual(fresh);
      }),
      fuzzParameters(150),
    );
  }, testTimeout());
});
