/**
 * Beam solver against published values and closed-form results. Each check names its source;
 * REFERENCES means /work/shared/design/REFERENCES.md, whose marks ([R], [C], [M]) are repeated.
 * Tolerances: published answers rounded to 3–4 figures get ±0.5 % (REFERENCES §6); exact closed
 * forms get 1e-9 relative.
 */
import { describe, expect, it } from 'vitest';
import { type BeamInput, type BeamLoad, type BeamSupport, solveBeam } from '../../src/core/beam';

const kN = 1000;
const PUBLISHED = { rel: 5e-3, abs: 0 };
const EXACT = { rel: 1e-9, abs: 1e-6 };

/** |actual − expected| ≤ max(rel·|expected|, abs). */
function isClose(actual: number, expected: number, tolerance: { rel: number; abs: number }): boolean {
  return Math.abs(actual - expected) <= Math.max(tolerance.rel * Math.abs(expected), tolerance.abs);
}

function expectClose(actual: number, expected: number, tolerance = EXACT): void {
  if (!isClose(actual, expected, tolerance)) {
    expect.fail(`expected ${actual} to be within ${JSON.stringify(tolerance)} of ${expected}`);
  }
}

describe('tolerance helper', () => {
  it('accepts values inside the relative band and rejects values outside it', () => {
    expect(isClose(100.4, 100, PUBLISHED)).toBe(true);
    expect(isClose(99.6, 100, PUBLISHED)).toBe(true);
    expect(isClose(100.6, 100, PUBLISHED)).toBe(false);
    expect(isClose(-100.4, -100, PUBLISHED)).toBe(true);
    expect(isClose(100.4, -100, PUBLISHED)).toBe(false);
  });
  it('uses the absolute floor near zero', () => {
    expect(isClose(1e-7, 0, EXACT)).toBe(true);
    expect(isClose(1e-5, 0, EXACT)).toBe(false);
    expect(isClose(0, 0, PUBLISHED)).toBe(true);
  });
  it('fails a test through expectClose', () => {
    expect(() => expectClose(1.1, 1)).toThrow();
    expect(() => expectClose(1 + 1e-12, 1)).not.toThrow();
  });
});

/** Solves a beam with one load group and returns its single design combination. */
function design(span: number, supports: BeamSupport[], loads: BeamLoad[], method?: 'stiffness') {
  const input: BeamInput = { span, supports, loads };
  const solution = solveBeam(input, method ? { method } : {});
  expect(solution.problems.filter((p) => p.severity === 'error')).toEqual([]);
  return solution.beam!.combinations[0]!;
}

const pin = (x: number): BeamSupport => ({ kind: 'pin', x });
const roller = (x: number): BeamSupport => ({ kind: 'roller', x });
const fixed = (x: number): BeamSupport => ({ kind: 'fixed', x });
const R = (d: { reactions: { x: number; R: number }[] }) => d.reactions.map((r) => r.R);

describe('REFERENCES §5 S1: overhanging beam, partial udl and tip load [R+C]', () => {
  // Pin A at 0, roller B at 6 m, free end D at 10 m; 5 kN/m from 2 m to 6 m; 30 kN at D.
  const loads: BeamLoad[] = [
    { kind: 'udl', w: 5 * kN, x1: 2, x2: 6 },
    { kind: 'point', P: 30 * kN, x: 10 },
  ];
  for (const method of [undefined, 'stiffness'] as const) {
    it(`gives the published reactions, shears and moments (${method ?? 'equilibrium'})`, () => {
      const d = design(10, [pin(0), roller(6)], loads, method);
      expectClose(d.reactions[0]!.R, -13.33 * kN, PUBLISHED);
      expectClose(d.reactions[1]!.R, 63.33 * kN, PUBLISHED);
      expectClose(d.shear(1), -13.33 * kN, PUBLISHED);
      expectClose(d.shear(6, 'left'), -33.33 * kN, PUBLISHED);
      expectClose(d.shear(6, 'right'), 30 * kN, PUBLISHED);
      expectClose(d.shear(8), 30 * kN, PUBLISHED);
      expectClose(d.moment(2), -26.66 * kN, PUBLISHED);
      expectClose(d.moment(6), -120 * kN, PUBLISHED);
      // The hogging maximum sits where V changes sign, across the reaction at B.
      expectClose(d.Mmin.M, -120 * kN, PUBLISHED);
      expect(d.Mmin.x).toBe(6);
      expect(d.zeroShear).toEqual([{ x: 6, kind: 'jump', M: d.Mmin.M }]);
      // "No contraflexure": M never turns sagging.
      expect(d.Mmax.M).toBe(0);
      expectClose(d.Vmax.V, -33.33 * kN, PUBLISHED);
      expect(d.Vmax).toMatchObject({ x: 6, side: 'left' });
    });
  }
});

describe('REFERENCES §5 S2: overhang with full-length udl [R, Q&A source; C recomputed]', () => {
  // Pin A at 0, roller B at 4 m, free end C at 6 m, 8 kN/m over the whole length.
  const d = design(6, [pin(0), roller(4)], [{ kind: 'udl', w: 8 * kN, x1: 0, x2: 6 }]);
  it('gives R_A = 12 kN and R_B = 36 kN', () => {
    expectClose(d.reactions[0]!.R, 12 * kN, PUBLISHED);
    expectClose(d.reactions[1]!.R, 36 * kN, PUBLISHED);
  });
  it('gives the published shears and the jump at B', () => {
    expectClose(d.shear(0, 'right'), 12 * kN, PUBLISHED);
    expectClose(d.shear(4, 'left'), -20 * kN, PUBLISHED);
    expectClose(d.shear(4, 'right'), 16 * kN, PUBLISHED);
    expectClose(d.shear(6, 'left'), 0, EXACT);
    const jumpB = d.jumps.find((j) => j.x === 4)!;
    expectClose(jumpB.shearRight - jumpB.shearLeft, 36 * kN, PUBLISHED);
    // Default side at a jump: the larger magnitude.
    expectClose(d.shear(4), -20 * kN, PUBLISHED);
  });
  it('gives zero shear at 1.5 m with M = 9 kN·m, and M_B = −16 kN·m [C]', () => {
    const crossing = d.zeroShear.find((z) => z.kind === 'crossing')!;
    expectClose(crossing.x, 1.5);
    expectClose(crossing.M, 9 * kN);
    expectClose(d.Mmax.M, 9 * kN);
    expectClose(d.Mmax.x, 1.5);
    expectClose(d.moment(4), -16 * kN);
    expectClose(d.Mmin.M, -16 * kN);
  });
});

describe('REFERENCES §5 S3: cantilever with udl and tip load [R, Q&A source; C recomputed]', () => {
  // L = 4 m fixed at A, 2 kN/m over the 2 m nearest the free end C, 4 kN at C.
  it('fixed at the left end: SF_C = 4, SF_B = SF_A = 8 kN, BM_B = −12, BM_A = −28 kN·m', () => {
    for (const method of [undefined, 'stiffness'] as const) {
      const d = design(
        4,
        [fixed(0)],
        [
          { kind: 'udl', w: 2 * kN, x1: 2, x2: 4 },
          { kind: 'point', P: 4 * kN, x: 4 },
        ],
        method,
      );
      expectClose(d.shear(4, 'left'), 4 * kN, PUBLISHED);
      expectClose(d.shear(2), 8 * kN, PUBLISHED);
      expectClose(d.shear(0, 'right'), 8 * kN, PUBLISHED);
      expectClose(d.moment(2), -12 * kN, PUBLISHED);
      expectClose(d.moment(0, 'right'), -28 * kN, PUBLISHED);
      expectClose(d.reactions[0]!.R, 8 * kN, PUBLISHED);
      // The wall's couple on the beam is counterclockwise.
      expectClose(d.reactions[0]!.M!, 28 * kN, PUBLISHED);
      expectClose(d.Mmin.M, -28 * kN, PUBLISHED);
      expect(d.Mmin.x).toBe(0);
    }
  });
  it('fixed at the right end: same magnitudes, shear of opposite sign', () => {
    const d = design(
      4,
      [fixed(4)],
      [
        { kind: 'udl', w: 2 * kN, x1: 0, x2: 2 },
        { kind: 'point', P: 4 * kN, x: 0 },
      ],
    );
    expectClose(d.shear(0, 'right'), -4 * kN, PUBLISHED);
    expectClose(d.shear(3), -8 * kN, PUBLISHED);
    expectClose(d.moment(2), -12 * kN, PUBLISHED);
    expectClose(d.moment(4, 'left'), -28 * kN, PUBLISHED);
    expectClose(d.reactions[0]!.M!, -28 * kN, PUBLISHED);
  });
  it('general closed form: full udl w and tip load P give V = P + w·s, M_support = −(PL + wL²/2) [C/M]', () => {
    const P = 7 * kN;
    const w = 3 * kN;
    const L = 5;
    const d = design(L, [fixed(0)], [
      { kind: 'udl', w, x1: 0, x2: L },
      { kind: 'point', P, x: L },
    ]);
    expectClose(d.shear(L - 1.2), P + w * 1.2);
    expectClose(d.Vmax.V, P + w * L);
    expectClose(d.moment(0, 'right'), -(P * L + (w * L * L) / 2));
  });
});

describe('REFERENCES §5 S4: Hicks (ed.), Civil Engineering Formulas, Table 2.1, equal-span continuous beams under full udl [R]', () => {
  const w = 10 * kN;
  const L = 5;
  it('two spans: R = 3wL/8, 10wL/8, 3wL/8; V = 5wL/8 each side of the middle support', () => {
    const d = design(2 * L, [pin(0), roller(L), roller(2 * L)], [{ kind: 'udl', w, x1: 0, x2: 2 * L }]);
    expect(R(d).map((r) => r / (w * L))).toEqual([
      expect.closeTo(3 / 8, 12),
      expect.closeTo(10 / 8, 12),
      expect.closeTo(3 / 8, 12),
    ]);
    expectClose(d.shear(L, 'left'), (-5 * w * L) / 8);
    expectClose(d.shear(L, 'right'), (5 * w * L) / 8);
    expectClose(Math.abs(d.Vmax.V), (5 * w * L) / 8);
    expect(d.Vmax.x).toBe(L);
    expectClose(d.moment(L), (-w * L * L) / 8);
    expectClose(d.Mmin.M, (-w * L * L) / 8);
    // Span maximum 9wL²/128 at 0.375L; point of inflection at 0.75L.
    expectClose(d.Mmax.M, (9 * w * L * L) / 128);
    expectClose(d.Mmax.x, 0.375 * L);
    expectClose(d.moment(0.75 * L), 0, { rel: 0, abs: 1e-9 * w * L * L });
    // The numeric instance in the table's notes [C]: 18.75 / 62.5 / 18.75 kN, +17.58 kN·m at 1.875 m.
    expectClose(d.reactions[1]!.R, 62.5 * kN);
    expectClose(d.Mmax.M, 17.58 * kN, PUBLISHED);
    expect(d.zeroShear.map((z) => z.kind)).toEqual(['crossing', 'jump', 'crossing']);
    expectClose(d.zeroShear[2]!.x, 2 * L - 0.375 * L);
  });
  it('three spans: R = 0.4, 1.1, 1.1, 0.4 wL; shears 0.6 wL and 0.5 wL at the interior supports', () => {
    const d = design(3 * L, [pin(0), roller(L), roller(2 * L), roller(3 * L)], [{ kind: 'udl', w, x1: 0, x2: 3 * L }]);
    const coefficients = R(d).map((r) => r / (w * L));
    [0.4, 1.1, 1.1, 0.4].forEach((c, i) => expectClose(coefficients[i]!, c));
    expectClose(d.shear(0, 'right'), 0.4 * w * L);
    expectClose(d.shear(L, 'left'), -0.6 * w * L);
    expectClose(d.shear(L, 'right'), 0.5 * w * L);
    expectClose(d.shear(2 * L, 'left'), -0.5 * w * L);
    expectClose(d.shear(2 * L, 'right'), 0.6 * w * L);
    // Moments: 0.08 wL² in the end spans at 0.4L, −0.10 wL² over the interior supports, 0.025 wL² mid-centre.
    expectClose(d.moment(0.4 * L), 0.08 * w * L * L);
    expectClose(d.moment(L), -0.1 * w * L * L);
    expectClose(d.moment(1.5 * L), 0.025 * w * L * L);
    expectClose(d.Mmax.M, 0.08 * w * L * L);
    expectClose(d.Mmax.x, 0.4 * L);
    expectClose(d.Mmin.M, -0.1 * w * L * L);
  });
  it('the same beams give the same results with every support fixed against translation only by pins', () => {
    const d = design(2 * L, [pin(0), pin(L), pin(2 * L)], [{ kind: 'udl', w, x1: 0, x2: 2 * L }]);
    expectClose(d.reactions[1]!.R, 1.25 * w * L);
  });
});

describe('REFERENCES §5 S5: linearly varying load on a simple span [C; table values M: AISC Manual beam-diagram case "load increasing uniformly to one end", from memory]', () => {
  it('triangle 0 → 12 kN/m on 6 m: R = W/3, 2W/3; zero shear at L/√3; M_max = 0.1283 WL', () => {
    const w0 = 12 * kN;
    const L = 6;
    const W = (w0 * L) / 2;
    const d = design(L, [pin(0), roller(L)], [{ kind: 'ramp', w1: 0, w2: w0, x1: 0, x2: L }]);
    expectClose(d.reactions[0]!.R, W / 3);
    expectClose(d.reactions[1]!.R, (2 * W) / 3);
    expectClose(d.reactions[0]!.R, 12 * kN, PUBLISHED);
    expectClose(d.reactions[1]!.R, 24 * kN, PUBLISHED);
    expect(d.zeroShear).toHaveLength(1);
    expectClose(d.zeroShear[0]!.x, L / Math.sqrt(3));
    expectClose(d.zeroShear[0]!.x, 3.464, PUBLISHED);
    expectClose(d.Mmax.M, (2 * W * L) / (9 * Math.sqrt(3)));
    expectClose(d.Mmax.M, 0.1283 * W * L, PUBLISHED);
    expectClose(d.Mmax.M, 27.71 * kN, PUBLISHED);
    // V(x) = w0L/6 − w0x²/(2L).
    expectClose(d.shear(2.5), (w0 * L) / 6 - (w0 * 2.5 * 2.5) / (2 * L));
  });
  it('the same triangle by the stiffness method', () => {
    const d = design(6, [pin(0), roller(6)], [{ kind: 'ramp', w1: 0, w2: 12 * kN, x1: 0, x2: 6 }], 'stiffness');
    expectClose(d.reactions[0]!.R, 12 * kN);
    expectClose(d.reactions[1]!.R, 24 * kN);
  });
  it('trapezoid 2 → 6 kN/m on 8 m: R_A = 13.33 kN, R_B = 18.67 kN [C]', () => {
    const d = design(8, [pin(0), roller(8)], [{ kind: 'ramp', w1: 2 * kN, w2: 6 * kN, x1: 0, x2: 8 }]);
    expectClose(d.reactions[0]!.R, 13.33 * kN, PUBLISHED);
    expectClose(d.reactions[1]!.R, 18.67 * kN, PUBLISHED);
  });
});

describe('closed-form results (statics of a simple span)', () => {
  it('udl on a simple span: R = wL/2, V = ±wL/2, M_max = wL²/8 at midspan (closed form)', () => {
    const w = 4.2 * kN;
    const L = 7.3;
    const d = design(L, [pin(0), roller(L)], [{ kind: 'udl', w, x1: 0, x2: L }]);
    expectClose(d.reactions[0]!.R, (w * L) / 2);
    expectClose(d.reactions[1]!.R, (w * L) / 2);
    expectClose(Math.abs(d.Vmax.V), (w * L) / 2);
    expectClose(d.Mmax.M, (w * L * L) / 8);
    expectClose(d.Mmax.x, L / 2);
  });
  it('point load P at any position: R_A = Pb/L, R_B = Pa/L, M_max = Pab/L (closed form)', () => {
    const P = 55 * kN;
    const L = 9;
    for (const a of [0, 0.3, 2.25, 4.5, 7.9, 9]) {
      const b = L - a;
      for (const method of [undefined, 'stiffness'] as const) {
        const d = design(L, [pin(0), roller(L)], [{ kind: 'point', P, x: a }], method);
        expectClose(d.reactions[0]!.R, (P * b) / L);
        expectClose(d.reactions[1]!.R, (P * a) / L);
        expectClose(d.Mmax.M, (P * a * b) / L);
        if (a > 0 && a < L) {
          expectClose(d.shear(a, 'left'), (P * b) / L);
          expectClose(d.shear(a, 'right'), (-P * a) / L);
        }
      }
    }
  });
  it('clockwise couple M0 at a: R_A = −M0/L, R_B = M0/L, M jumps by +M0 (closed form; checks the couple sign)', () => {
    const M0 = 24 * kN;
    const L = 8;
    const a = 3;
    const d = design(L, [pin(0), roller(L)], [{ kind: 'moment', M: M0, x: a }]);
    expectClose(d.reactions[0]!.R, -M0 / L);
    expectClose(d.reactions[1]!.R, M0 / L);
    expectClose(d.moment(a, 'left'), (-M0 * a) / L);
    expectClose(d.moment(a, 'right'), (M0 * (L - a)) / L);
    expectClose(d.Mmax.M, (M0 * (L - a)) / L);
    expect(d.Mmax.side).toBe('right');
    expect(d.zeroShear).toEqual([]);
  });
});

describe('closed-form results (statically indeterminate beams)', () => {
  it('propped cantilever under udl: 5wL/8 at the fixed end, 3wL/8 at the prop, fixed-end moment −wL²/8 (closed form, standard beam tables)', () => {
    const w = 6 * kN;
    const L = 6.5;
    const d = design(L, [fixed(0), roller(L)], [{ kind: 'udl', w, x1: 0, x2: L }]);
    expectClose(d.reactions[0]!.R, (5 * w * L) / 8);
    expectClose(d.reactions[1]!.R, (3 * w * L) / 8);
    expectClose(d.reactions[0]!.M!, (w * L * L) / 8);
    expectClose(d.moment(0, 'right'), (-w * L * L) / 8);
    // Span maximum 9wL²/128 at 3L/8 from the prop (closed form).
    expectClose(d.Mmax.M, (9 * w * L * L) / 128);
    expectClose(d.Mmax.x, L - (3 * L) / 8);
  });
  it('fixed-fixed beam under udl: end moments −wL²/12, midspan +wL²/24, R = wL/2 (closed form)', () => {
    const w = 9 * kN;
    const L = 5.5;
    const d = design(L, [fixed(0), fixed(L)], [{ kind: 'udl', w, x1: 0, x2: L }]);
    expectClose(d.reactions[0]!.R, (w * L) / 2);
    expectClose(d.reactions[1]!.R, (w * L) / 2);
    expectClose(d.moment(0, 'right'), (-w * L * L) / 12);
    expectClose(d.moment(L, 'left'), (-w * L * L) / 12);
    expectClose(d.moment(L / 2), (w * L * L) / 24);
    expectClose(d.reactions[0]!.M!, (w * L * L) / 12);
    expectClose(d.reactions[1]!.M!, (-w * L * L) / 12);
  });
  it('fixed-fixed beam, point load at a: end moments −Pab²/L², −Pa²b/L², R_A = Pb²(3a + b)/L³ (closed form)', () => {
    const P = 40 * kN;
    const L = 10;
    const a = 3;
    const b = L - a;
    const d = design(L, [fixed(0), fixed(L)], [{ kind: 'point', P, x: a }]);
    expectClose(d.moment(0, 'right'), (-P * a * b * b) / (L * L));
    expectClose(d.moment(L, 'left'), (-P * a * a * b) / (L * L));
    expectClose(d.reactions[0]!.R, (P * b * b * (3 * a + b)) / L ** 3);
    expectClose(d.reactions[1]!.R, (P * a * a * (a + 3 * b)) / L ** 3);
  });
  it('fixed-fixed beam, triangular load 0 → w: end moments −wL²/30 and −wL²/20, R = 3wL/20, 7wL/20 (closed form, from memory)', () => {
    const w = 15 * kN;
    const L = 6;
    const d = design(L, [fixed(0), fixed(L)], [{ kind: 'ramp', w1: 0, w2: w, x1: 0, x2: L }]);
    expectClose(d.moment(0, 'right'), (-w * L * L) / 30);
    expectClose(d.moment(L, 'left'), (-w * L * L) / 20);
    expectClose(d.reactions[0]!.R, (3 * w * L) / 20);
    expectClose(d.reactions[1]!.R, (7 * w * L) / 20);
  });
  it('propped cantilever with a couple M0 at the prop: half of it carries over to the fixed end (closed form, carry-over factor 1/2)', () => {
    const M0 = 12 * kN;
    const L = 4;
    const d = design(L, [fixed(0), roller(L)], [{ kind: 'moment', M: M0, x: L }]);
    expectClose(d.moment(L, 'left'), -M0);
    expectClose(d.moment(0, 'right'), M0 / 2);
    expectClose(d.reactions[1]!.R, (3 * M0) / (2 * L));
  });
});

describe('REFERENCES §2 E10: AISC Design Examples v15.0, Example G.1A, factored end shear [R]', () => {
  // End shears 48 kips dead and 145 kips live; the span is not part of the check.
  const kip = 4448.2216152605;
  const span = 9;
  const beam = solveBeam({
    span,
    supports: [pin(0), roller(span)],
    loads: [
      { kind: 'udl', w: (2 * 48 * kip) / span, x1: 0, x2: span, group: 'dead' },
      { kind: 'udl', w: (2 * 145 * kip) / span, x1: 0, x2: span, group: 'live' },
    ],
    combinations: [
      { name: 'LRFD', factors: [{ group: 'dead', factor: 1.2 }, { group: 'live', factor: 1.6 }] },
      { name: 'ASD', factors: [{ group: 'dead', factor: 1 }, { group: 'live', factor: 1 }] },
    ],
  }).beam!;
  it('V_u = 1.2·48 + 1.6·145 = 290 kips governs; V_a = 193 kips', () => {
    expectClose(beam.Vmax, 290 * kip, PUBLISHED);
    expect(beam.envelope.Vmax.combination).toBe('LRFD');
    expectClose(Math.abs(beam.combination('ASD')!.Vmax.V), 193 * kip, PUBLISHED);
    expectClose(beam.loadCase('dead')!.reactions[0]!.R, 48 * kip);
  });
});
