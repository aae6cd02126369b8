/**
 * The beam solver at the edges of what floats can hold: supports a hair from an end (short
 * overhangs), loads of wildly different sizes, positions near the largest double. Every result is
 * checked against closed-form statics or a published coefficient; REFERENCES means
 * /work/shared/design/REFERENCES.md.
 */
import { describe, expect, it } from 'vitest';
import { type BeamInput, type BeamSupport, solveBeam } from '../../src/core/beam';

const kN = 1000;

function expectClose(actual: number, expected: number, rel: number, abs = 0): void {
  if (!(Math.abs(actual - expected) <= Math.max(rel * Math.abs(expected), abs))) {
    expect.fail(`expected ${actual} to be within ${rel} (relative) of ${expected}`);
  }
}

function solved(input: BeamInput, method?: 'stiffness') {
  const solution = solveBeam(input, method ? { method } : {});
  expect(solution.problems).toEqual([]);
  return solution.beam!.combinations[0]!;
}

const pin = (x: number): BeamSupport => ({ kind: 'pin', x });
const roller = (x: number): BeamSupport => ({ kind: 'roller', x });

describe('supports a hair from an end (short overhangs)', () => {
  it('three equal spans with the pin 1 µm in from the end: R = 0.4, 1.1, 1.1, 0.4 wL (Hicks (ed.), Civil Engineering Formulas, Table 2.1 [R], REFERENCES §5 S4)', () => {
    const w = 1.1 * kN;
    const L = 3.6;
    const d = solved({ span: 3 * L, supports: [pin(0.000001), roller(L), roller(2 * L), roller(3 * L)], loads: [{ kind: 'udl', w, x1: 0, x2: 3 * L }] });
    // The 1 µm overhang moves the coefficients by about 1e-7 of wL, far inside this band.
    [0.4, 1.1, 1.1, 0.4].forEach((c, i) => expectClose(d.reactions[i]!.R / (w * L), c, 1e-5));
    // Vertical equilibrium is exact statics [C].
    expectClose(d.reactions.reduce((a, r) => a + r.R, 0), w * 3 * L, 1e-12);
  });

  it('a simple span with 1 µm overhangs at both ends gives the statics reactions by the stiffness method too [C: closed-form statics]', () => {
    const span = 6;
    const a = 0.000001, b = span - 0.000001;
    const w = 2 * kN, P = 5 * kN, x = 2.2;
    const input: BeamInput = { span, supports: [pin(a), roller(b)], loads: [{ kind: 'udl', w, x1: 0, x2: span }, { kind: 'point', P, x }] };
    // Moments about each support: R_b·(b − a) = w·span·(span/2 − a) + P·(x − a), and R_a from ΣF.
    const Rb = (w * span * (span / 2 - a) + P * (x - a)) / (b - a);
    const Ra = w * span + P - Rb;
    for (const method of [undefined, 'stiffness'] as const) {
      const d = solved(input, method);
      expectClose(d.reactions[0]!.R, Ra, 1e-12);
      expectClose(d.reactions[1]!.R, Rb, 1e-12);
    }
  });

  it('three pins at 1 µm, 1/3 m and 0.5 m on a 1 m span under a tiny couple at the end balance it [C: closed-form statics]', () => {
    const M = 8.241458349128392e-246;
    const d = solved({ span: 1, supports: [pin(0.5), pin(1 / 3), pin(0.000001)], loads: [{ kind: 'moment', M, x: 0 }] });
    const R = d.reactions.map((r) => r.R);
    expect(R.every(Number.isFinite)).toBe(true);
    // ΣF = 0 and Σ(R·x) = M (clockwise couple balanced by the reactions' counterclockwise moment about x = 0).
    expectClose(R.reduce((s, r) => s + r, 0), 0, 0, 1e-12 * M);
    expectClose(d.reactions.reduce((s, r) => s + r.R * r.x, 0), M, 1e-9);
  });

  it('a cantilever carrying a huge couple near its root keeps the small udl in its reaction: R = wL exactly, by either method [C: closed-form statics]', () => {
    const input: BeamInput = { span: 1, supports: [{ kind: 'fixed', x: 0 }], loads: [{ kind: 'udl', w: 1, x1: 0, x2: 1 }, { kind: 'moment', M: 1.7976931348623157e308, x: 0.000001 }] };
    for (const method of [undefined, 'stiffness'] as const) {
      const d = solved(input, method);
      expect(d.reactions[0]!.R).toBe(1);
      expect(d.reactions[0]!.M).toBe(1.7976931348623157e308);
    }
  });
});

describe('messages about positions near the largest double', () => {
  it('a support at 1.7976931348623157e308 m is named by a finite position', () => {
    const solution = solveBeam({ span: 6, supports: [pin(1.7976931348623157e308), roller(6)], loads: [{ kind: 'udl', w: kN, x1: 0, x2: 6 }] });
    expect(solution.problems.map((p) => p.code)).toEqual(['beam.outside']);
    expect(solution.problems[0]!.message).toContain('at 1.798e+308 m');
    expect(solution.problems[0]!.message).not.toContain('Infinity');
  });
});
