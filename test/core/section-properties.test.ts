/**
 * Property tests of the section engine on random sections (polygons, rolled-shape outlines, tubes,
 * boxes, stacked plates, plates with circular holes).
 */
import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import {
  type Part,
  type Section,
  angle,
  box,
  buildSection,
  channel,
  circle,
  isection,
  plate,
  polygon,
  tee,
  topOf,
  translate,
  tube,
} from '../../src/core/section';

interface Spec {
  label: string;
  parts: { part: Part; hole: boolean }[];
}

const dim = (min: number, max: number) => fc.double({ min, max, noNaN: true });

const star = fc
  .record({
    n: fc.integer({ min: 3, max: 10 }),
    gaps: fc.array(dim(0.25, 1), { minLength: 10, maxLength: 10 }),
    radii: fc.array(dim(0.2, 1), { minLength: 10, maxLength: 10 }),
    scale: dim(0.05, 2),
  })
  .map(({ n, gaps, radii, scale }): Spec | undefined => {
    const total = gaps.slice(0, n).reduce((a, b) => a + b, 0);
    let a = 0;
    const pts: [number, number][] = [];
    for (let i = 0; i < n; i++) {
      pts.push([scale * radii[i] * Math.cos(a), scale * radii[i] * Math.sin(a)]);
      a += (2 * Math.PI * gaps[i]) / total;
    }
    const part = polygon(pts).part;
    return part && { label: 'polygon', parts: [{ part, hole: false }] };
  });

const flanged = fc
  .record({ kind: fc.constantFrom('isection', 'tee', 'channel'), d: dim(0.1, 1), bf: dim(0.05, 0.5), tfr: dim(0.02, 0.3), twr: dim(0.02, 0.6) })
  .map(({ kind, d, bf, tfr, twr }): Spec | undefined => {
    const dims = { d, bf, tf: tfr * d, tw: twr * bf };
    const part = (kind === 'isection' ? isection(dims) : kind === 'tee' ? tee(dims) : channel(dims)).part;
    return part && { label: kind, parts: [{ part, hole: false }] };
  });

const other = fc
  .record({ kind: fc.constantFrom('angle', 'tube', 'circle', 'box'), a: dim(0.05, 0.8), b: dim(0.05, 0.8), r: dim(0.02, 0.45) })
  .map(({ kind, a, b, r }): Spec | undefined => {
    const part =
      kind === 'angle' ? angle({ d: a, b, t: r * Math.min(a, b) }).part
      : kind === 'tube' ? tube(a, r * a).part
      : kind === 'circle' ? circle(a).part
      : box(a, b, r * Math.min(a, b)).part;
    return part && { label: kind, parts: [{ part, hole: false }] };
  });

const stacked = fc
  .array(fc.record({ b: dim(0.01, 0.5), h: dim(0.005, 0.3) }), { minLength: 2, maxLength: 4 })
  .map((plates): Spec => {
    const placed: Part[] = [];
    for (const p of plates) placed.push(translate(plate(p.b, p.h).part!, 0, topOf(placed)));
    return { label: 'stacked plates', parts: placed.map((part) => ({ part, hole: false })) };
  });

const drilled = fc
  .record({ b: dim(0.1, 0.6), h: dim(0.1, 0.8), rr: dim(0.05, 0.45), fx: dim(-1, 1), fy: dim(-1, 1) })
  .map(({ b, h, rr, fx, fy }): Spec => {
    const r = rr * Math.min(b, h);
    const cx = fx * (b / 2 - r) * 0.999, cy = h / 2 + fy * (h / 2 - r) * 0.999;
    return {
      label: 'plate with hole',
      parts: [
        { part: plate(b, h).part!, hole: false },
        { part: [{ sign: 1, shape: { kind: 'circle', cx, cy, r } }], hole: true },
      ],
    };
  });

const anySection = fc.oneof(star, flanged, other, stacked, drilled).filter((s): s is Spec => s !== undefined);

function build(spec: Spec): Section {
  const r = buildSection(spec.parts);
  if (!r.section) throw new Error(`${spec.label}: ${JSON.stringify(r.problems)}`);
  return r.section;
}

const fractions = fc.array(dim(0, 1), { minLength: 5, maxLength: 5 });

/** Gauss–Legendre nodes and weights on [-1, 1], by Newton on the Legendre polynomial. */
function gaussLegendre(n: number): { x: number[]; w: number[] } {
  const x: number[] = [], w: number[] = [];
  for (let i = 1; i <= n; i++) {
    let z = Math.cos((Math.PI * (i - 0.25)) / (n + 0.5));
    let dp = 0;
    for (let it = 0; it < 100; it++) {
      let p0 = 1, p1 = z;
      for (let k = 2; k <= n; k++) [p0, p1] = [p1, ((2 * k - 1) * z * p1 - (k - 1) * p0) / k];
      dp = (n * (z * p1 - p0)) / (z * z - 1);
      const dz = p1 / dp;
      z -= dz;
      if (Math.abs(dz) < 1e-16) break;
    }
    x.push(z);
    w.push(2 / ((1 - z * z) * dp * dp));
  }
  return { x, w };
}
const GL = gaussLegendre(40);

describe('section engine properties', () => {
  it('translating a section moves its centroid and leaves A, yc (from the bottom), I, Q(y) and tau(y) unchanged', () => {
    fc.assert(
      fc.property(anySection, dim(-1000, 1000), dim(-1000, 1000), fractions, (spec, dx, dy, fs) => {
        const a = build(spec);
        const b = build({ label: spec.label, parts: spec.parts.map((p) => ({ part: translate(p.part, dx, dy), hole: p.hole })) });
        const rel = (x: number, y: number, scale: number) => expect(Math.abs(x - y)).toBeLessThanOrEqual(1e-9 * scale);
        rel(b.area, a.area, a.area);
        rel(b.I, a.I, a.I);
        rel(b.centroidY, a.centroidY, a.depth);
        rel(b.depth, a.depth, a.depth);
        rel(b.centroidX, a.centroidX + dx, a.width);
        rel(b.bottom, a.bottom + dy, a.depth);
        const tMax = a.tauMax(1).value;
        rel(b.tauMax(1).value, tMax, tMax);
        // 1e-9 of the local value, with an absolute floor of 1e-10 of the largest value: within about 1e-11·depth of
        // the tip of a circle the chord sqrt(r² − v²) is ill-conditioned (the rounding of a translated centre
        // changes r − |v| there), and a height that close to an edge is read as on it.
        const Qmax = a.firstMoment(a.centroidY).value;
        for (const f of fs) {
          const y = f * a.depth;
          const qa = a.firstMoment(y).value;
          expect(Math.abs(b.firstMoment(y).value - qa)).toBeLessThanOrEqual(1e-9 * qa + 1e-10 * Qmax);
          const ta = a.tau(1, y).value;
          expect(Math.abs(b.tau(1, y).value - ta)).toBeLessThanOrEqual(1e-9 * ta + 1e-10 * tMax);
        }
      }),
      { numRuns: 200 },
    );
  });

  it('Q is exactly zero at the bottom and the top', () => {
    fc.assert(
      fc.property(anySection, (spec) => {
        const s = build(spec);
        expect(s.firstMoment(0).value).toBe(0);
        expect(s.firstMoment(s.depth).value).toBe(0);
        expect(s.tau(1, 0).value).toBe(0);
        expect(s.tau(1, s.depth).value).toBe(0);
      }),
      { numRuns: 200 },
    );
  });

  it('the stresses carry the shear force: ∫ tau(y)·t(y) dy over the depth = V', () => {
    // tau·t = V·Q/I, so this is ∫Q dy = I, which holds because ∫₀ʰ Q dy = ∫ t(s)(s − yc)·s ds = I.
    // Integrated by 40-point Gauss–Legendre on each piece between breakpoints, in θ with y = mid − half·cos θ
    // so the square-root behaviour of circular chords at the piece ends becomes smooth.
    fc.assert(
      fc.property(anySection, dim(-5e5, 5e5).filter((v) => Math.abs(v) > 1), (spec, V) => {
        const s = build(spec);
        const cuts = s.breakpoints().map((b) => b.y);
        let total = 0;
        for (let i = 0; i + 1 < cuts.length; i++) {
          const mid = (cuts[i] + cuts[i + 1]) / 2, half = (cuts[i + 1] - cuts[i]) / 2;
          for (let j = 0; j < GL.x.length; j++) {
            const theta = (Math.PI / 2) * (GL.x[j] + 1);
            const y = mid - half * Math.cos(theta);
            const t = s.tau(V, y);
            total += (Math.PI / 2) * GL.w[j] * half * Math.sin(theta) * (t.problem ? 0 : t.value * t.width);
          }
        }
        expect(Math.abs(total - V)).toBeLessThanOrEqual(1e-9 * Math.abs(V));
      }),
      { numRuns: 200 },
    );
  });

  it('splitting a plate into two stacked plates changes nothing', () => {
    fc.assert(
      fc.property(dim(0.01, 1), dim(0.01, 2), dim(0.05, 0.95), fractions, (b, h, split, fs) => {
        const whole = build({ label: 'plate', parts: [{ part: plate(b, h).part!, hole: false }] });
        const lower = plate(b, split * h).part!;
        const upper = translate(plate(b, h - split * h).part!, 0, split * h);
        const two = build({ label: 'two plates', parts: [{ part: lower, hole: false }, { part: upper, hole: false }] });
        const rel = (x: number, y: number, scale: number) => expect(Math.abs(x - y)).toBeLessThanOrEqual(1e-12 * scale);
        rel(two.area, whole.area, whole.area);
        rel(two.centroidY, whole.centroidY, h);
        rel(two.I, whole.I, whole.I);
        const tMax = whole.tauMax(1);
        rel(two.tauMax(1).value, tMax.value, tMax.value);
        expect(two.tauMax(1).locations).toHaveLength(1);
        for (const f of fs) rel(two.tau(1, f * h).value, whole.tau(1, f * h).value, tMax.value);
        expect(two.breakpoints().map((p) => p.y)).toEqual([0, expect.closeTo(h, 12)]);
      }),
      { numRuns: 200 },
    );
  });

  it('tau_max is at least tau at every height, and a dense scan never beats it', () => {
    fc.assert(
      fc.property(anySection, fractions, (spec, fs) => {
        const s = build(spec);
        const max = s.tauMax(1);
        expect(max.problem).toBeUndefined();
        expect(max.value).toBeGreaterThan(0);
        for (const l of max.locations) expect(Math.abs(s.tau(1, l.y).value - max.value)).toBeLessThanOrEqual(1e-9 * max.value);
        for (const f of fs) expect(s.tau(1, f * s.depth).value).toBeLessThanOrEqual(max.value * (1 + 1e-12));
        // An independent search: a dense scan, each of its local maxima refined by golden-section search
        // between its neighbours, plus tau at every kink (breakpoint). Its best must be the exact maximum.
        const n = 4000;
        const f = (y: number) => s.tau(1, y).value;
        const scan = Array.from({ length: n + 1 }, (_, i) => f((i / n) * s.depth));
        expect(Math.max(...scan)).toBeLessThanOrEqual(max.value * (1 + 1e-12));
        const g = (Math.sqrt(5) - 1) / 2;
        let refined = Math.max(...s.breakpoints().map((k) => f(k.y)));
        for (let i = 0; i <= n; i++) {
          if ((i > 0 && scan[i] < scan[i - 1]) || (i < n && scan[i] < scan[i + 1])) continue;
          let lo = (Math.max(0, i - 1) / n) * s.depth, hi = (Math.min(n, i + 1) / n) * s.depth;
          for (let it = 0; it < 200 && hi - lo > 1e-15 * s.depth; it++) {
            const a = hi - g * (hi - lo), b = lo + g * (hi - lo);
            if (f(a) < f(b)) lo = a; else hi = b;
          }
          refined = Math.max(refined, scan[i], f((lo + hi) / 2));
        }
        expect(refined).toBeLessThanOrEqual(max.value * (1 + 1e-12));
        expect(refined).toBeGreaterThanOrEqual(max.value * (1 - 1e-9));
      }),
      { numRuns: 200 },
    );
  });

  it('regression: a hole just below mid-height puts the maximum a hair above the slab boundary at its centre', () => {
    const spec: Spec = {
      label: 'plate with hole',
      parts: [
        { part: plate(0.1, 0.1).part!, hole: false },
        { part: [{ sign: 1, shape: { kind: 'circle', cx: 0, cy: 0.04997499598041253, r: 0.007599726161617169 } }], hole: true },
      ],
    };
    const s = build(spec);
    const max = s.tauMax(1);
    for (let i = 0; i <= 20000; i++) expect(s.tau(1, (i / 20000) * s.depth).value).toBeLessThanOrEqual(max.value * (1 + 1e-12));
  });

  it('the profile includes both sides of every jump and never holds NaN', () => {
    fc.assert(
      fc.property(anySection, fc.integer({ min: 2, max: 300 }), (spec, n) => {
        const s = build(spec);
        const p = s.profile(n);
        expect(p.y.length).toBe(p.tauPerV.length);
        for (let i = 0; i < p.y.length; i++) {
          expect(Number.isFinite(p.y[i]) && Number.isFinite(p.tauPerV[i]) && Number.isFinite(p.width[i])).toBe(true);
          if (i > 0) expect(p.y[i]).toBeGreaterThanOrEqual(p.y[i - 1]);
        }
        const max = s.tauMax(1).perV;
        expect(Math.max(...p.tauPerV)).toBeCloseTo(max, 9 - Math.ceil(Math.log10(max)));
        for (const b of s.breakpoints()) {
          if (b.widthBelow > 0 && b.widthAbove > 0 && b.widthBelow !== b.widthAbove) {
            const at = [...p.y].flatMap((y, i) => (y === b.y ? [p.width[i]] : []));
            expect(at).toContain(b.widthBelow);
            expect(at).toContain(b.widthAbove);
          }
        }
      }),
      { numRuns: 100 },
    );
  });
});
