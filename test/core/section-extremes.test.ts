/**
 * The section engine at the edges of what floats can hold: forces whose products overflow, sections
 * too large or too small for their properties to be represented, heights near the largest double.
 * Each comes back as a number checked against a closed form, or as a problem; never Infinity or NaN.
 * REFERENCES means /work/shared/design/REFERENCES.md.
 */
import { describe, expect, it } from 'vitest';
import { buildSection, circle, plate, translate } from '../../src/core/section';

const MAX = 1.7976931348623157e308;

function expectRelative(actual: number, expected: number, rel = 1e-12): void {
  if (!(Math.abs(actual - expected) <= rel * Math.abs(expected))) expect.fail(`expected ${actual} to be within ${rel} (relative) of ${expected}`);
}

function rectangle(b: number, h: number) {
  const built = buildSection([{ part: plate(b, h).part!, hole: false }]);
  expect(built.problems).toEqual([]);
  return built.section!;
}

describe('forces whose products overflow', () => {
  it('a 4 m square plate under V = 1e308 N: tau at the neutral axis is 3V/2A, though V·Q overflows (REFERENCES §1, rectangle k = 3/2 [R])', () => {
    const s = rectangle(4, 4);
    const V = 1e308;
    expect(Number.isFinite(V * s.firstMoment(2).value)).toBe(false);
    expect(s.tau(V, 2).problem).toBeUndefined();
    expectRelative(s.tau(V, 2).value, (1.5 * V) / 16);
    expectRelative(s.tauMax(V).value, (1.5 * V) / 16);
    // Shear flow at the neutral axis V·Q/I = V·(bh²/8)/(bh³/12) = 3V/(2h) [C: closed form].
    expectRelative(s.shearFlow(V, 2).value, (1.5 * V) / 4);
  });

  it('tau, shear flow, both sides and tau_max of the largest double on a 10 × 100 mm plate are a problem, not Infinity', () => {
    const s = rectangle(0.01, 0.1);
    const readings = [s.tau(MAX, 0.05), s.shearFlow(MAX, 0.05), s.tauMax(MAX), s.tauSides(MAX, 0.05)];
    for (const r of readings) {
      expect(r.problem?.code).toBe('section.not-finite');
      expect(r.problem?.message).toMatch(/too large to represent/);
      expect(JSON.stringify(r)).not.toMatch(/null|Infinity/);
    }
    expect(s.tau(MAX, 0.05).value).toBe(0);
    expect(s.tauMax(MAX).value).toBe(0);
  });
});

describe('sections whose properties cannot be represented', () => {
  it('parts 1e300 m apart, a circle 1.7e77 m across and a 1e100 m plate are refused as too large', () => {
    const outer = { kind: 'circle' as const, cx: 0, cy: -1e300, r: 5e11 };
    const layouts = [
      [
        { part: plate(0.002, 0.002).part!, hole: false },
        { part: [{ sign: 1 as const, shape: outer }, { sign: -1 as const, shape: { ...outer, r: 499999999999.999 } }], hole: false },
      ],
      [{ part: translate(circle(2 * 8.697439607311234e76).part!, 0, 8.697439607311234e76), hole: false }],
      [{ part: plate(1e100, 1e100).part!, hole: false }],
    ];
    for (const layout of layouts) {
      const built = buildSection(layout);
      expect(built.section).toBeUndefined();
      expect(built.problems.map((p) => p.code)).toContain('section.not-finite');
      expect(built.problems.find((p) => p.code === 'section.not-finite')!.message).toMatch(/^This section is too large to compute/);
    }
  });

  it('a plate 1e-80 m square, whose I is below the smallest full-precision double, is refused as too small', () => {
    const built = buildSection([{ part: plate(1e-80, 1e-80).part!, hole: false }]);
    expect(built.section).toBeUndefined();
    expect(built.problems.map((p) => p.code)).toEqual(['section.not-finite']);
    expect(built.problems[0]!.message).toMatch(/^This section is too small to compute/);
  });

  it('a plate 1e-60 m square is still computed: tau_max = 3V/2A and a finite profile (REFERENCES §1, rectangle k = 3/2 [R])', () => {
    const s = rectangle(1e-60, 1e-60);
    expectRelative(s.tauMax(1).value, 1.5e120);
    expectRelative(s.tau(1, 0.5e-60).value, 1.5e120);
    expect(Array.from(s.profile(11).tauPerV).every(Number.isFinite)).toBe(true);
  });
});

describe('messages about heights near the largest double', () => {
  it('a height of 1e306 m is named in metres, not "Infinity mm"', () => {
    const s = rectangle(0.001, 0.001);
    const p = s.heightProblem(1e306);
    expect(p?.code).toBe('section.outside');
    expect(p?.message).toBe('Height y = 1.000e+306 m is outside the section, which spans y = 0 to 1 mm measured up from its lowest point.');
  });
});
