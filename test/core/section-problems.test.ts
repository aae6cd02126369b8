/**
 * Bad input to the section engine: every degenerate case comes back as a problem with a stable code
 * and a message in an engineer's words; nothing throws and no result holds NaN or Infinity.
 */
import { describe, expect, it } from 'vitest';
import {
  type Part,
  type SectionProblem,
  MAX_POLYGON_VERTICES,
  angle,
  box,
  buildSection,
  channel,
  circle,
  isection,
  makePolygon,
  plate,
  polygon,
  tee,
  translate,
  tube,
} from '../../src/core/section';

function codes(problems: readonly SectionProblem[]): string[] {
  return problems.map((p) => p.code);
}

function deepFinite(value: unknown): boolean {
  if (typeof value === 'number') return Number.isFinite(value);
  if (value instanceof Float64Array) return value.every(Number.isFinite);
  if (Array.isArray(value)) return value.every(deepFinite);
  if (value && typeof value === 'object') return Object.values(value).every(deepFinite);
  return true;
}

const solid = (part: Part, tag?: unknown) => ({ part, hole: false, tag });
const hole = (part: Part, tag?: unknown) => ({ part, hole: true, tag });

describe('shape dimensions', () => {
  it.each([
    ['plate with zero width', () => plate(0, 0.1), 'section.bad-dimension', /width must be greater than zero/],
    ['plate with negative height', () => plate(0.1, -0.2), 'section.bad-dimension', /height must be greater than zero/],
    ['plate with NaN width', () => plate(NaN, 0.1), 'section.not-finite', /not a finite number/],
    ['circle of zero diameter', () => circle(0), 'section.bad-dimension', /diameter/],
    ['tube wall equal to the radius', () => tube(0.1, 0.05), 'section.bad-proportion', /thinner than its outside radius/],
    ['tube wall beyond the radius', () => tube(0.1, 0.08), 'section.bad-proportion', /thinner than its outside radius/],
    ['box wall filling the box', () => box(0.2, 0.1, 0.05), 'section.bad-proportion', /less than half/],
    ['I-section flanges filling the depth', () => isection({ d: 0.2, bf: 0.1, tf: 0.1, tw: 0.01 }), 'section.bad-proportion', /leave no web/],
    ['I-section web thicker than its flange is wide', () => isection({ d: 0.2, bf: 0.1, tf: 0.01, tw: 0.12 }), 'section.bad-proportion', /web .* thinner than its flange is wide/],
    ['I-section flange thinner than zero', () => isection({ d: 0.2, bf: 0.1, tf: -0.01, tw: 0.01 }), 'section.bad-dimension', /flange thickness tf must be greater than zero/],
    ['tee flange as deep as the tee', () => tee({ d: 0.1, bf: 0.1, tf: 0.1, tw: 0.01 }), 'section.bad-proportion', /leaves no web/],
    ['channel web wider than its flanges', () => channel({ d: 0.2, bf: 0.05, tf: 0.01, tw: 0.06 }), 'section.bad-proportion', /thinner than its flange/],
    ['angle thicker than a leg', () => angle({ d: 0.1, b: 0.05, t: 0.05 }), 'section.bad-proportion', /less than both legs/],
  ])('%s', (_label, make, code, message) => {
    const made = make();
    expect(made.part).toBeUndefined();
    expect(codes(made.problems)).toContain(code);
    expect(made.problems.map((p) => p.message).join(' ')).toMatch(message);
    expect(made.problems.every((p) => p.severity === 'error')).toBe(true);
  });

  it('the tag given to a shape comes back on its problems', () => {
    expect(plate(-1, 1, { line: 7 }).problems[0].tag).toEqual({ line: 7 });
  });
});

describe('polygons', () => {
  it.each([
    ['fewer than 3 distinct vertices', [[0, 0], [1, 1], [1, 1], [0, 0]], 'section.too-few-vertices'],
    ['all vertices on one line', [[0, 0], [1, 1], [2, 2], [3, 3]], 'section.zero-area'],
    ['a bow tie', [[0, 0], [1, 1], [1, 0], [0, 1]], 'section.self-intersecting'],
    ['a vertex touching another edge', [[0, 0], [2, 0], [2, 2], [1, 0], [0, 2]], 'section.self-intersecting'],
    ['an outline that folds back on itself', [[0, 0], [2, 0], [3, 0], [1, 0], [1, 1]], 'section.self-intersecting'],
    ['a vertex visited twice', [[0, 0], [1, 0], [1, 1], [0.5, 0.5], [0, 1], [0.5, 0.5]], 'section.self-intersecting'],
    ['a coordinate that is not a number', [[0, 0], [1, NaN], [0, 1]], 'section.not-finite'],
    ['an infinite coordinate', [[0, 0], [Infinity, 0], [0, 1]], 'section.not-finite'],
  ] as [string, [number, number][], string][])('%s', (_label, pts, code) => {
    const made = polygon(pts, 'line 3');
    expect(made.part).toBeUndefined();
    expect(codes(made.problems)).toEqual([code]);
    expect(made.problems[0].tag).toBe('line 3');
  });

  it('refuses more vertices than the limit', () => {
    const n = MAX_POLYGON_VERTICES + 1;
    const pts = Array.from({ length: n }, (_, i): [number, number] => [Math.cos((2 * Math.PI * i) / n), Math.sin((2 * Math.PI * i) / n)]);
    expect(codes(polygon(pts).problems)).toEqual(['section.too-many-vertices']);
  });

  it('turns a clockwise outline counter-clockwise and drops a repeated closing vertex', () => {
    const made = makePolygon([0, 0, 1, 1, 0], [0, 1, 1, 0, 0]);
    expect(made.problems).toEqual([]);
    const { xs, ys } = made.polygon!;
    expect(xs.length).toBe(4);
    let twice = 0;
    for (let i = 0; i < xs.length; i++) twice += xs[i] * ys[(i + 1) % 4] - xs[(i + 1) % 4] * ys[i];
    expect(twice).toBeCloseTo(2, 12);
  });
});

describe('how parts sit together', () => {
  const p = (b: number, h: number, x = 0, y = 0) => translate(plate(b, h).part!, x, y);

  it('no parts, only holes, an empty part', () => {
    expect(codes(buildSection([]).problems)).toEqual(['section.empty']);
    expect(codes(buildSection(undefined as unknown as []).problems)).toEqual(['section.empty']);
    expect(codes(buildSection([hole(p(0.1, 0.1))]).problems)).toEqual(['section.empty']);
    expect(codes(buildSection([solid([], 'line 4')]).problems)).toEqual(['section.zero-area']);
  });

  it('overlapping solid parts are refused, with the later part tagged; parts touching along an edge are fine', () => {
    const overlapping = buildSection([solid(p(0.2, 0.1), 'a'), solid(p(0.2, 0.1, 0.05, 0.05), 'b')]);
    expect(overlapping.section).toBeUndefined();
    expect(overlapping.problems).toHaveLength(1);
    expect(overlapping.problems[0]).toMatchObject({ code: 'section.overlap', tag: 'b', severity: 'error' });
    expect(overlapping.problems[0].message).toMatch(/overlaps part 1 by 37.5 % of the smaller one/);
    const touching = buildSection([solid(p(0.2, 0.1)), solid(p(0.05, 0.3, 0, 0.1)), solid(p(0.2, 0.1, 0, 0.4)), solid(p(0.1, 0.1, 0.15, 0.4))]);
    expect(touching.problems).toEqual([]);
    expect(touching.section).toBeDefined();
  });

  it('a circle resting on a plate touches it at a point: not an overlap, but a pinch', () => {
    const r = buildSection([solid(p(0.2, 0.02)), solid(translate(circle(0.1).part!, 0, 0.02))]);
    expect(r.section).toBeDefined();
    expect(codes(r.problems)).toContain('section.pinch');
    expect(r.problems.every((x) => x.severity === 'warning')).toBe(true);
    const max = r.section!.tauMax(1000);
    expect(max.problem?.code).toBe('section.pinch');
    expect(deepFinite(max)).toBe(true);
  });

  it('a hole outside the material, partly outside, or in a tube\'s bore is refused', () => {
    const outside = buildSection([solid(p(0.2, 0.2)), hole(translate(circle(0.02).part!, 0.5, 0), 'h')]);
    expect(outside.problems[0]).toMatchObject({ code: 'section.hole-outside', tag: 'h' });
    const partly = buildSection([solid(p(0.2, 0.2)), hole(translate(circle(0.04).part!, 0.09, 0.1), 'h')]);
    expect(codes(partly.problems)).toEqual(['section.hole-outside']);
    expect(partly.problems[0].message).toMatch(/not fully inside the material/);
    const bore = buildSection([solid(tube(0.2, 0.01).part!), hole(translate(circle(0.02).part!, 0, 0.09), 'h')]);
    expect(codes(bore.problems)).toEqual(['section.hole-outside']);
  });

  it('a hole drilled right at an edge (tangent inside) is accepted', () => {
    const r = buildSection([solid(p(0.2, 0.2)), hole(translate(circle(0.05).part!, 0.075, 0.1))]);
    expect(r.problems).toEqual([]);
  });

  it('a hole across the joint of two plates is inside the material', () => {
    const r = buildSection([solid(p(0.2, 0.1)), solid(p(0.2, 0.1, 0, 0.1)), hole(translate(circle(0.04).part!, 0, 0.08))]);
    expect(r.problems).toEqual([]);
  });

  it('overlapping holes are refused', () => {
    const r = buildSection([solid(p(0.3, 0.3)), hole(translate(circle(0.06).part!, 0, 0.1)), hole(translate(circle(0.06).part!, 0.03, 0.1), 'second')]);
    expect(r.problems).toHaveLength(1);
    expect(r.problems[0]).toMatchObject({ code: 'section.hole-overlap', tag: 'second' });
  });

  it('holes that remove all the material leave a section of zero area', () => {
    const r = buildSection([solid(p(0.2, 0.2)), hole(p(0.2, 0.2))]);
    expect(codes(r.problems)).toEqual(['section.zero-area']);
  });

  it('a hand-built part whose void lies outside its own material is refused', () => {
    const part: Part = [...p(0.1, 0.1), { sign: -1, shape: { kind: 'circle', cx: 1, cy: 1, r: 0.01 } }];
    expect(codes(buildSection([solid(part, 'x')]).problems)).toEqual(['section.void-outside']);
  });

  it('a primitive that is neither polygon nor circle is refused', () => {
    const part = [{ sign: 1, shape: { kind: 'blob' } }] as unknown as Part;
    expect(codes(buildSection([solid(part)]).problems)).toEqual(['section.zero-area']);
  });

  it('a hand-made polygon primitive is re-validated', () => {
    const bowtie: Part = [{ sign: 1, shape: { kind: 'polygon', xs: Float64Array.of(0, 1, 1, 0), ys: Float64Array.of(0, 1, 0, 1) } }];
    expect(codes(buildSection([solid(bowtie, 7)]).problems)).toEqual(['section.self-intersecting']);
  });
});

describe('a section in two pieces, and a hole as wide as its plate', () => {
  it('two plates with a gap between them: a warning, and no tau inside the gap', () => {
    const r = buildSection([solid(plate(0.2, 0.02).part!), solid(translate(plate(0.2, 0.02).part!, 0, 0.1))]);
    expect(r.section).toBeDefined();
    expect(codes(r.problems)).toEqual(['section.disconnected']);
    expect(r.problems[0].severity).toBe('warning');
    const s = r.section!;
    expect(s.heightProblem(0.05)?.code).toBe('section.no-material');
    expect(s.tau(1000, 0.05).problem?.code).toBe('section.no-material');
    expect(s.tau(1000, 0.05).value).toBe(0);
    expect(s.widthAt(0.05)).toEqual({ below: 0, above: 0 });
    expect(s.heightProblem(0.02)).toBeUndefined(); // the top face of the lower plate has material below it
    expect(s.tau(1000, 0.02).side).toBe('below');
    const max = s.tauMax(1000);
    expect(max.problem).toBeUndefined();
    expect(deepFinite(max)).toBe(true);
    expect(deepFinite(s.profile(50))).toBe(true);
  });

  it('a circular hole as wide as its plate pinches the section at the hole centre', () => {
    const r = buildSection([solid(plate(0.1, 0.3).part!), hole(translate(circle(0.1).part!, 0, 0.1))]);
    expect(r.section).toBeDefined();
    expect(codes(r.problems)).toContain('section.pinch');
    const s = r.section!;
    expect(s.tau(1, 0.15).problem?.code).toBe('section.no-material');
    expect(s.tauMax(1).problem?.code).toBe('section.pinch');
    expect(deepFinite(s.profile(64))).toBe(true);
  });
});

describe('queries', () => {
  const s = buildSection([solid(plate(0.1, 0.2).part!)]).section!;

  it('a height outside the section', () => {
    for (const y of [-0.01, 0.2001, 5]) {
      const pr = s.heightProblem(y);
      expect(pr?.code).toBe('section.outside');
      expect(pr?.message).toMatch(/outside the section, which spans y = 0 to 200 mm/);
      expect(s.tau(1, y)).toMatchObject({ value: 0, problem: { code: 'section.outside' } });
      expect(s.firstMoment(y)).toMatchObject({ value: 0, problem: { code: 'section.outside' } });
      expect(s.shearFlow(1, y)).toMatchObject({ value: 0, problem: { code: 'section.outside' } });
      expect(s.widthAt(y)).toMatchObject({ below: 0, above: 0, problem: { code: 'section.outside' } });
    }
  });

  it('a height that is not a number, a force that is not a number', () => {
    expect(s.heightProblem(NaN)?.code).toBe('section.bad-height');
    expect(s.tau(1, Infinity).problem?.code).toBe('section.bad-height');
    expect(s.tau(NaN, 0.1).problem?.code).toBe('section.bad-force');
    expect(s.tauMax(Infinity)).toMatchObject({ value: 0, problem: { code: 'section.bad-force' } });
    expect(s.shearFlow(NaN, 0.1).problem?.code).toBe('section.bad-force');
  });

  it('heights one rounding away from the edges or a junction read as on them', () => {
    expect(s.heightProblem(0.2 * (1 + 1e-15))).toBeUndefined();
    expect(s.heightProblem(-1e-18)).toBeUndefined();
    const IN = 0.0254;
    const t = buildSection([solid(tee({ d: 7 * IN, bf: 10 * IN, tf: 0.8 * IN, tw: 0.5 * IN }).part!)]).section!;
    // 6.2 in typed by the engineer vs 7 in − 0.8 in in the geometry: the junction, governing (web) side.
    expect(t.tau(1, 6.2 * IN).side).toBe('below');
  });

  it('the tip of a circle or a diamond at the bottom or top has zero width but tau is simply zero there', () => {
    const round = buildSection([solid(circle(0.1).part!)]).section!;
    const diamond = buildSection([solid(polygon([[0, 0], [0.1, 0.1], [0, 0.2], [-0.1, 0.1]]).part!)]).section!;
    for (const t of [round, diamond]) {
      for (const y of [0, t.depth]) {
        expect(t.heightProblem(y)).toBeUndefined();
        expect(t.tau(1000, y)).toEqual({ value: 0, width: 0, firstMoment: 0, side: 'both' });
        expect(t.tauSides(1000, y).problem).toBeUndefined();
      }
    }
  });

  it('profile takes any count and stays finite', () => {
    for (const n of [NaN, -5, 0, 1, 2.7, 1e9]) {
      const p = s.profile(n);
      expect(p.y.length).toBeGreaterThanOrEqual(2);
      expect(p.y.length).toBeLessThanOrEqual(100_010);
      expect(deepFinite(p)).toBe(true);
    }
  });
});
