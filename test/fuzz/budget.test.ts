/**
 * The per-block time budget (`blockBudgetMs`): a block that runs past it stops with a `block.budget`
 * diagnostic on the first statement not evaluated, the statements before it keep their results,
 * and every other block gets its own budget. With an injected clock this is exact; with the real
 * clock a block of slow statements is cut short and the time it took is printed.
 */
import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { evaluateNote } from '../../src/core/note';
import { fuzzParameters, testTimeout } from './config';

function block(lines: string[]): string {
  return ['```shear', ...lines, '```', ''].join('\n');
}

describe('block time budget', () => {
  it('stops a block once the clock passes its budget, and only that block (injected clock)', () => {
    fc.assert(
      fc.property(fc.integer({ min: 1, max: 40 }), fc.integer({ min: 1, max: 60 }), fc.integer({ min: 1, max: 5 }), fc.integer({ min: 1, max: 4 }), (statements, budget, step, blocks) => {
        let t = 0;
        const now = () => (t += step);
        const text = Array.from({ length: blocks }, (_v, b) => block(Array.from({ length: statements }, (_w, i) => `v${b}_${i} = ${i + 1} kN`))).join('\n');
        const r = evaluateNote(text, { now, blockBudgetMs: budget });
        expect(r.blocks).toHaveLength(blocks);
        for (const b of r.blocks) {
          const cut = b.diagnostics.filter((d) => d.code === 'block.budget');
          const evaluated = b.results.length;
          // The clock is read once when the block starts and once before each statement.
          expect(evaluated).toBeLessThanOrEqual(Math.floor(budget / step) + 1);
          if (evaluated < statements) {
            expect(cut).toHaveLength(1);
            expect(cut[0]!.line).toBe(b.statements[evaluated]!.line);
            expect(cut[0]!.severity).toBe('error');
            expect(cut[0]!.message).toContain(`${budget} ms`);
          } else {
            expect(cut).toEqual([]);
          }
          expect(b.results.every((x) => !x.failed)).toBe(true);
        }
      }),
      fuzzParameters(300),
    );
  }, testTimeout());

  it('cuts a block of slow statements short on the real clock, and the next block still runs', () => {
    // Each section with a few dozen bolt holes costs a millisecond or more to build (and nothing is
    // cached between sections): 800 of them are far over 150 ms on any machine.
    const holes = Array.from({ length: 16 }, (_v, i) => `  hole circle 4 mm at ${(i % 4) * 40 - 60} mm, ${Math.floor(i / 4) * 60 + 40} mm`);
    const slow = block(Array.from({ length: 800 }, (_v, k) => [`section S${k}`, `  plate ${240 + k} mm x 300 mm`, ...holes]).flat());
    const text = [slow, block(['after = 2 m', 'check after <= 3 m'])].join('\n');
    const started = performance.now();
    const r = evaluateNote(text, { blockBudgetMs: 150 });
    const elapsed = performance.now() - started;
    const [first, second] = r.blocks;
    const cut = first!.diagnostics.find((d) => d.code === 'block.budget');
    console.log(`budget 150 ms: ${first!.results.length} of ${first!.statements.length} statements evaluated in ${elapsed.toFixed(0)} ms, then the next block`);
    expect(cut).toBeDefined();
    expect(first!.results.length).toBeLessThan(first!.statements.length);
    expect(first!.results.length).toBeGreaterThanOrEqual(1);
    expect(second!.diagnostics).toEqual([]);
    expect(second!.checks[0]!.pass).toBe(true);
  }, testTimeout());

  it('with the default budget, an ordinary note is never cut', () => {
    const r = evaluateNote(block(Array.from({ length: 2000 }, (_v, i) => `v${i} = ${i} kN * 2`)));
    expect(r.diagnostics.filter((d) => d.code === 'block.budget')).toEqual([]);
  });
});
