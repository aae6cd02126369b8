/**
 * The contract of the beam API: groups, combinations and the envelope; reading V and M at a jump;
 * reactions by position; drawing samples; positions gathered into sections; plain-data results.
 * Values here are simple statics worked by hand (closed form) unless a source is named.
 */
import { describe, expect, it } from 'vitest';
import {
  ALL_LOADS_COMBINATION,
  type BeamInput,
  DEFAULT_GROUP,
  SIGN_CONVENTION,
  momentAt,
  reactionAt,
  sampleDiagram,
  shearAt,
  solveBeam,
} from '../../src/core/beam';

function solve<Tag>(input: BeamInput<Tag>) {
  const s = solveBeam(input);
  expect(s.problems.filter((p) => p.severity === 'error')).toEqual([]);
  return s.beam!;
}

describe('load groups, combinations and the envelope', () => {
  // Simple span 10 m: dead 2 kN/m over the span, live 30 kN at 2.5 m, wind 10 kN upward at 5 m.
  const input: BeamInput<string> = {
    span: 10,
    supports: [
      { kind: 'pin', x: 0, tag: 'A' },
      { kind: 'roller', x: 10, tag: 'B' },
    ],
    loads: [
      { kind: 'udl', w: 2000, x1: 0, x2: 10, group: 'dead' },
      { kind: 'point', P: 30000, x: 2.5, group: 'live' },
      { kind: 'point', P: -10000, x: 5, group: 'wind' },
    ],
    combinations: [
      { name: 'ULS', factors: [{ group: 'dead', factor: 1.2 }, { group: 'live', factor: 1.6 }], tag: 'c1' },
      { name: 'uplift', factors: [{ group: 'dead', factor: 0.9 }, { group: 'wind', factor: 1.5 }], tag: 'c2' },
    ],
  };
  const beam = solve(input);

  it('solves each group alone, in order of first appearance', () => {
    expect(beam.groups).toEqual(['dead', 'live', 'wind']);
    expect(beam.cases.map((c) => [c.name, c.kind])).toEqual([
      ['dead', 'group'],
      ['live', 'group'],
      ['wind', 'group'],
    ]);
    expect(beam.loadCase('live')!.reactions.map((r) => r.R)).toEqual([22500, 7500]);
    expect(beam.loadCase('nothing')).toBeUndefined();
  });

  it('solves each combination with its factors', () => {
    const uls = beam.combination('ULS')!;
    expect(uls.kind).toBe('combination');
    expect(uls.factors).toEqual([{ group: 'dead', factor: 1.2 }, { group: 'live', factor: 1.6 }]);
    // R_A = 1.2·10 kN + 1.6·22.5 kN = 48 kN; R_B = 1.2·10 + 1.6·7.5 = 24 kN.
    expect(uls.reactions[0]!.R).toBeCloseTo(48000, 6);
    expect(uls.reactions[1]!.R).toBeCloseTo(24000, 6);
    expect(uls.reactions[0]!.tag).toBe('A');
    // Uplift: R_A = 0.9·10 − 1.5·5 = 1.5 kN.
    expect(beam.combination('uplift')!.reactions[0]!.R).toBeCloseTo(1500, 6);
  });

  it('takes the envelope over the combinations and names the governing one', () => {
    expect(beam.Vmax).toBeCloseTo(48000, 6);
    expect(beam.envelope.Vmax).toMatchObject({ x: 0, combination: 'ULS' });
    expect(beam.envelope.Mmax.combination).toBe('ULS');
    // Under uplift the midspan moment is 0.9·25 − 1.5·25 = −15 kN·m (hogging).
    expect(beam.envelope.Mmin.combination).toBe('uplift');
    expect(beam.envelope.Mmin.M).toBeCloseTo(-15000, 6);
    const ra = beam.reaction(0)!;
    expect(ra.tag).toBe('A');
    expect(ra.R).toEqual({ value: expect.closeTo(48000, 6), combination: 'ULS' });
    expect(ra.Rmin).toEqual({ value: expect.closeTo(1500, 6), combination: 'uplift' });
    expect(ra.M).toBeUndefined();
    expect(beam.reaction(3)).toBeUndefined();
  });

  it('reads the governing V and the range of M at a section over the combinations', () => {
    expect(beam.governingShear(1)).toEqual({ value: expect.closeTo(48000 - 2400, 6), combination: 'ULS' });
    expect(beam.shear(1)).toBeCloseTo(45600, 6);
    const range = beam.momentRange(5);
    expect(range.min.combination).toBe('uplift');
    expect(range.max.combination).toBe('ULS');
    expect(beam.moment(5)).toBe(range.max.value);
  });

  it('samples the envelope with both sides of every jump', () => {
    const s = beam.sample(11);
    const at = [...s.x].flatMap((x, i) => (x === 2.5 ? [i] : []));
    expect(at).toHaveLength(2);
    expect(s.Vmax[at[0]!]!).toBeGreaterThan(s.Vmax[at[1]!]!);
    for (let i = 0; i < s.x.length; i++) {
      expect(s.Vmax[i]!).toBeGreaterThanOrEqual(s.Vmin[i]!);
      expect(s.Mmax[i]!).toBeGreaterThanOrEqual(s.Mmin[i]!);
    }
  });

  it('echoes the sign convention for reports', () => {
    expect(beam.signConvention).toBe(SIGN_CONVENTION);
    expect(SIGN_CONVENTION).toContain('dM/dx = V');
  });
});

describe('the default group and the implicit design case', () => {
  it('loads without a group form the default group; with no combinations every group has factor 1', () => {
    const beam = solve({
      span: 4,
      supports: [{ kind: 'fixed', x: 0 }],
      loads: [
        { kind: 'point', P: 1000, x: 4 },
        { kind: 'point', P: 500, x: 2, group: 'live' },
      ],
    });
    expect(beam.groups).toEqual([DEFAULT_GROUP, 'live']);
    expect(beam.combinations).toHaveLength(1);
    const design = beam.combinations[0]!;
    expect(design.name).toBe(ALL_LOADS_COMBINATION);
    expect(design.factors).toEqual([
      { group: DEFAULT_GROUP, factor: 1 },
      { group: 'live', factor: 1 },
    ]);
    expect(design.reactions[0]).toEqual({ x: 0, kind: 'fixed', R: 1500, M: 5000 });
  });
  it('a combination may name the default group', () => {
    const beam = solve({
      span: 4,
      supports: [{ kind: 'fixed', x: 0 }],
      loads: [{ kind: 'point', P: 1000, x: 4 }],
      combinations: [{ name: 'C', factors: [{ group: DEFAULT_GROUP, factor: 1.35 }] }],
    });
    expect(beam.combinations[0]!.reactions[0]!.R).toBeCloseTo(1350, 9);
  });
  it('a beam without loads solves to zero everywhere, with one zero-shear interval', () => {
    const beam = solve({ span: 3, supports: [{ kind: 'pin', x: 0 }, { kind: 'roller', x: 3 }], loads: [] });
    const d = beam.combinations[0]!;
    expect(d.reactions.map((r) => r.R)).toEqual([0, 0]);
    expect(d.zeroShear).toEqual([{ x: 0, kind: 'interval', end: 3, M: 0 }]);
    expect(beam.Vmax).toBe(0);
  });
});

describe('reading a diagram', () => {
  // Simple span 6 m with 12 kN at 2 m: V = +8 kN, then −4 kN.
  const d = solve({
    span: 6,
    supports: [{ kind: 'pin', x: 0 }, { kind: 'roller', x: 6 }],
    loads: [{ kind: 'point', P: 12000, x: 2 }],
  }).combinations[0]!;

  it('reads either side of a jump, and the larger magnitude by default', () => {
    expect(d.shear(2, 'left')).toBeCloseTo(8000, 9);
    expect(d.shear(2, 'right')).toBeCloseTo(-4000, 9);
    expect(d.shear(2)).toBeCloseTo(8000, 9);
    expect(d.shear(1)).toBeCloseTo(8000, 9);
    expect(d.shear(1, 'right')).toBeCloseTo(8000, 9);
  });
  it('reads the ends against the zero outside the beam', () => {
    expect(d.shear(0, 'left')).toBe(0);
    expect(d.shear(0, 'right')).toBeCloseTo(8000, 9);
    expect(d.shear(6)).toBeCloseTo(-4000, 9);
    expect(d.shear(6, 'right')).toBe(0);
  });
  it('returns 0 outside the beam and for a non-finite x', () => {
    expect(d.shear(-1)).toBe(0);
    expect(d.moment(7)).toBe(0);
    expect(d.shear(Number.NaN)).toBe(0);
  });
  it('treats a section within a billionth of the span as the breakpoint', () => {
    expect(d.shear(2 + 1e-12, 'left')).toBeCloseTo(8000, 9);
    expect(d.shear(2 - 1e-12, 'right')).toBeCloseTo(-4000, 9);
  });
  it('finds reactions by position', () => {
    expect(d.reaction(0)).toEqual({ x: 0, kind: 'pin', R: expect.closeTo(8000, 9) });
    expect(d.reaction(6 - 1e-12)!.R).toBeCloseTo(4000, 9);
    expect(d.reaction(3)).toBeUndefined();
  });
  it('lists the jumps with both sides', () => {
    expect(d.jumps.map((j) => j.x)).toEqual([0, 2, 6]);
    expect(d.jumps[1]).toEqual({
      x: 2,
      shearLeft: expect.closeTo(8000, 9),
      shearRight: expect.closeTo(-4000, 9),
      momentLeft: expect.closeTo(16000, 9),
      momentRight: expect.closeTo(16000, 9),
    });
  });
  it('samples for drawing: uniform sections plus breakpoints, each jump twice, from the zero outside', () => {
    const s = d.sample(4);
    expect([...s.x]).toEqual([0, 0, 2, 2, 4, 6, 6]);
    expect([...s.V].map((v) => Math.round(v))).toEqual([0, 8000, 8000, -4000, -4000, -4000, 0]);
    expect([...s.M].map((v) => Math.round(v))).toEqual([0, 0, 16000, 16000, 8000, 0, 0]);
  });
  it('stores the pieces as Float64Array polynomials in x − x0', () => {
    const piece = d.pieces[1]!;
    expect(piece.x0).toBe(2);
    expect(piece.shear).toBeInstanceOf(Float64Array);
    expect(piece.moment).toBeInstanceOf(Float64Array);
    expect(piece.moment[0]).toBeCloseTo(16000, 9);
    expect(piece.moment[1]).toBeCloseTo(-4000, 9);
  });
});

describe('plain data', () => {
  it('the reading functions work on a structured clone of a result', () => {
    const beam = solve({
      span: 10,
      supports: [{ kind: 'pin', x: 0 }, { kind: 'roller', x: 5 }, { kind: 'roller', x: 10 }],
      loads: [{ kind: 'udl', w: 10000, x1: 0, x2: 10 }],
    });
    const clone = structuredClone(beam.combinations[0]!);
    expect(shearAt(clone, 5, 'left')).toBeCloseTo(-31250, 6);
    expect(momentAt(clone, 5)).toBeCloseTo(-31250, 6);
    expect(reactionAt(clone, 5)!.R).toBeCloseTo(62500, 6);
    expect(sampleDiagram(clone, 5).x.length).toBeGreaterThan(5);
    const whole = structuredClone(beam);
    expect(whole.envelope.Vmax.V).toBe(beam.envelope.Vmax.V);
  });
});

describe('positions closer than a billionth of the span are one section', () => {
  it('a point load a hair off a support goes into that support', () => {
    const beam = solve({
      span: 6,
      supports: [{ kind: 'pin', x: 0 }, { kind: 'roller', x: 4 }],
      loads: [{ kind: 'point', P: 10000, x: 4 * (1 + 1e-15) }],
    });
    const d = beam.combinations[0]!;
    expect(d.reactions.map((r) => r.R)).toEqual([0, 10000]);
    expect(d.jumps).toEqual([]);
    expect(d.Vmax.V).toBe(0);
  });
  it('two udls that nearly meet are taken to meet, with no sliver piece between them', () => {
    const beam = solve({
      span: 6,
      supports: [{ kind: 'pin', x: 0 }, { kind: 'roller', x: 6 }],
      loads: [
        { kind: 'udl', w: 1000, x1: 0, x2: 3 - 1e-13 },
        { kind: 'udl', w: 1000, x1: 3 + 1e-13, x2: 6 },
      ],
    });
    const d = beam.combinations[0]!;
    expect(d.pieces).toHaveLength(2);
    expect(d.pieces[1]!.x0).toBeCloseTo(3, 12);
    expect(d.Mmax.M).toBeCloseTo(4500, 9);
    expect(d.zeroShear).toHaveLength(1);
  });
});
