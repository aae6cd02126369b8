/**
 * Independent cross-checks of the exact engine. Nothing here reuses the engine's slab tables:
 *
 * 1. Clipping route (random polygons): the material above a cut is clipped off with the
 *    general-purpose polygon-clipping library and its area and first moment are taken by the
 *    shoelace formula written here, giving Q(y) = M_above − A_above·yc; A, yc and I come from the
 *    textbook polygon formulas. Exact in floating point, so agreement is expected to ~1e-12.
 * 2. Numeric integration (random polygons and sections with circles): the chord t(y) is computed
 *    here from scratch (a horizontal line is intersected with every edge, crossings sorted and
 *    paired; circle chords 2·sqrt(r² − v²)), and A, yc, I and Q(y) are integrated by composite
 *    Simpson's rule. For polygons the panels are split at the vertex heights read from the input,
 *    where the integrand is a polynomial of degree ≤ 3 between them, so Simpson is exact there; for
 *    circles the circle's span is integrated in the angle θ (y = cy + r·sin θ), which removes the
 *    square-root end singularity, with 4000 panels (error of order (π/4000)^4 ≈ 4e-13) and then a
 *    Richardson step against 2000 panels.
 * Agreement required: 1e-9 relative (Q relative to its largest value).
 */
import fc from 'fast-check';
import polygonClipping from 'polygon-clipping';
import { describe, expect, it } from 'vitest';
import { type Part, type Section, buildSection, plate, polygon, translate, tube } from '../../src/core/section';

type Pt = [number, number];

/** A random star-shaped (hence simple) polygon, in either orientation, somewhere in the plane. */
const starPolygon = fc
  .record({
    n: fc.integer({ min: 3, max: 14 }),
    gaps: fc.array(fc.double({ min: 0.2, max: 1, noNaN: true }), { minLength: 14, maxLength: 14 }),
    radii: fc.array(fc.double({ min: 0.15, max: 1, noNaN: true }), { minLength: 14, maxLength: 14 }),
    scale: fc.double({ min: 0.02, max: 3, noNaN: true }),
    cx: fc.double({ min: -50, max: 50, noNaN: true }),
    cy: fc.double({ min: -50, max: 50, noNaN: true }),
    phase: fc.double({ min: 0, max: 6.28, noNaN: true }),
    clockwise: fc.boolean(),
  })
  .map(({ n, gaps, radii, scale, cx, cy, phase, clockwise }) => {
    const total = gaps.slice(0, n).reduce((a, b) => a + b, 0);
    let angle = phase;
    const pts: Pt[] = [];
    for (let i = 0; i < n; i++) {
      pts.push([cx + scale * radii[i] * Math.cos(angle), cy + scale * radii[i] * Math.sin(angle)]);
      angle += (2 * Math.PI * gaps[i]) / total;
    }
    return clockwise ? pts.reverse() : pts;
  })
  // Shrinking can line up three vertices exactly (a spike of zero width); the engine rightly refuses those.
  .filter((pts) => polygon(pts).part !== undefined);

function build(part: Part, holes: Part[] = []): Section {
  const r = buildSection([{ part, hole: false }, ...holes.map((h) => ({ part: h, hole: true }))]);
  if (!r.section) throw new Error(JSON.stringify(r.problems));
  return r.section;
}

/** Area, first and second moments (∫dA, ∫y dA, ∫y² dA) of a simple polygon, textbook shoelace forms, positive orientation assumed. */
function polygonMoments(pts: Pt[]): { A: number; My: number; Iyy: number } {
  let A = 0, My = 0, Iyy = 0;
  for (let i = 0; i < pts.length; i++) {
    const [x1, y1] = pts[i];
    const [x2, y2] = pts[(i + 1) % pts.length];
    const c = x1 * y2 - x2 * y1;
    A += c / 2;
    My += ((y1 + y2) * c) / 6;
    Iyy += ((y1 * y1 + y1 * y2 + y2 * y2) * c) / 12;
  }
  return A < 0 ? { A: -A, My: -My, Iyy: -Iyy } : { A, My, Iyy };
}

/** Moments of a clipping result: outer rings add, inner rings subtract. */
function multiMoments(mp: Pt[][][]): { A: number; My: number } {
  let A = 0, My = 0;
  for (const poly of mp) {
    poly.forEach((ring, i) => {
      const m = polygonMoments(ring);
      A += i === 0 ? m.A : -m.A;
      My += i === 0 ? m.My : -m.My;
    });
  }
  return { A, My };
}

/** The chord of a polygon at height y: crossings of the line with the edges, sorted and paired. */
function polygonChord(pts: Pt[], y: number): number {
  const xs: number[] = [];
  for (let i = 0; i < pts.length; i++) {
    const [x1, y1] = pts[i];
    const [x2, y2] = pts[(i + 1) % pts.length];
    if ((y1 <= y && y < y2) || (y2 <= y && y < y1)) xs.push(x1 + ((y - y1) * (x2 - x1)) / (y2 - y1));
  }
  xs.sort((a, b) => a - b);
  let w = 0;
  for (let i = 0; i + 1 < xs.length; i += 2) w += xs[i + 1] - xs[i];
  return w;
}

function simpson(f: (x: number) => number, a: number, b: number, panels: number): number {
  if (b <= a) return 0;
  const h = (b - a) / panels;
  let s = f(a) + f(b);
  for (let i = 1; i < panels; i++) s += (i % 2 ? 4 : 2) * f(a + i * h);
  return (s * h) / 3;
}

/** ∫ over [a, b] of chord(y)·g(y) for a polygon, Simpson on pieces between vertex heights (exact for cubic integrands). */
function integratePolygon(pts: Pt[], g: (y: number) => number, a: number, b: number): number {
  const cuts = [...new Set(pts.map((p) => p[1]).filter((y) => y > a && y < b))].sort((p, q) => p - q);
  const edges = [a, ...cuts, b];
  let sum = 0;
  for (let i = 0; i + 1 < edges.length; i++) {
    const lo = edges[i], hi = edges[i + 1];
    // Evaluate the chord just inside the piece so crossings at its ends are unambiguous.
    sum += simpson((y) => polygonChord(pts, y === lo ? lo + 1e-12 * (hi - lo) : y === hi ? hi - 1e-12 * (hi - lo) : y) * g(y), lo, hi, 4);
  }
  return sum;
}

describe('exact engine vs polygon clipping + shoelace on random polygons', () => {
  it('A, yc, I and Q(y) at random heights agree to 1e-9', () => {
    let clipRuns = 0, clipFailures = 0;
    fc.assert(
      fc.property(starPolygon, fc.array(fc.double({ min: 0, max: 1, noNaN: true }), { minLength: 6, maxLength: 6 }), (placed, fractions) => {
        const s = build(polygon(placed).part!);
        // The reference works relative to the first vertex (the shoelace forms hold about any origin; this one is well conditioned).
        const [ox, oy] = placed[0];
        const pts = placed.map(([x, y]): Pt => [x - ox, y - oy]);
        const m = polygonMoments(pts);
        const minY = Math.min(...pts.map((p) => p[1])), maxY = Math.max(...pts.map((p) => p[1]));
        const minX = Math.min(...pts.map((p) => p[0])), maxX = Math.max(...pts.map((p) => p[0]));
        const ycAbs = m.My / m.A;
        const Ic = m.Iyy - m.A * ycAbs * ycAbs;
        expect(Math.abs(s.area - m.A)).toBeLessThanOrEqual(1e-9 * m.A);
        expect(Math.abs(s.bottom - oy + s.centroidY - ycAbs)).toBeLessThanOrEqual(1e-9 * (maxY - minY));
        expect(Math.abs(s.I - Ic)).toBeLessThanOrEqual(1e-9 * Ic);
        const Qref = s.firstMoment(s.centroidY).value;
        const margin = Math.max(maxX - minX, maxY - minY);
        for (const f of fractions) {
          const y = minY + f * (maxY - minY);
          let clipped: Pt[][][];
          try {
            clipped = polygonClipping.intersection([pts], [[[minX - margin, y], [maxX + margin, y], [maxX + margin, maxY + margin], [minX - margin, maxY + margin]]]) as Pt[][][];
          } catch {
            // The clipping library occasionally fails to close a ring on a cut through a vertex; that says nothing about the engine.
            clipFailures++;
            continue;
          }
          clipRuns++;
          const above = multiMoments(clipped);
          const Qclip = above.My - above.A * ycAbs;
          expect(Math.abs(s.firstMoment(y + oy - s.bottom).value - Qclip)).toBeLessThanOrEqual(1e-9 * Qref);
        }
      }),
      { numRuns: 150 },
    );
    expect(clipFailures).toBeLessThan(0.05 * clipRuns);
  });
});

describe('exact engine vs Simpson integration of an independently computed chord', () => {
  it('random polygons: A, yc, I, Q(y) and t(y)', () => {
    fc.assert(
      fc.property(starPolygon, fc.array(fc.double({ min: 0.001, max: 0.999, noNaN: true }), { minLength: 5, maxLength: 5 }), (raw, fractions) => {
        // Work in the section's own frame (bottom at y = 0) so the integration is well conditioned.
        const minY0 = Math.min(...raw.map((p) => p[1]));
        const pts = raw.map(([x, y]): Pt => [x, y - minY0]);
        fc.pre(polygon(pts).part !== undefined);
        const s = build(polygon(pts).part!);
        const depth = Math.max(...pts.map((p) => p[1]));
        const A = integratePolygon(pts, () => 1, 0, depth);
        const yc = integratePolygon(pts, (y) => y, 0, depth) / A;
        const I = integratePolygon(pts, (y) => (y - yc) ** 2, 0, depth);
        expect(Math.abs(s.area - A)).toBeLessThanOrEqual(1e-9 * A);
        expect(Math.abs(s.centroidY - yc)).toBeLessThanOrEqual(1e-9 * depth);
        expect(Math.abs(s.I - I)).toBeLessThanOrEqual(1e-9 * I);
        const Qmax = s.firstMoment(s.centroidY).value;
        for (const f of fractions) {
          const y = f * depth;
          const Q = integratePolygon(pts, (t) => t - yc, y, depth);
          expect(Math.abs(s.firstMoment(y).value - Q)).toBeLessThanOrEqual(1e-9 * Qmax);
          const w = s.widthAt(y);
          const chord = polygonChord(pts, y);
          if (w.below === w.above) expect(Math.abs(w.below - chord)).toBeLessThanOrEqual(1e-9 * s.width);
        }
      }),
      { numRuns: 150 },
    );
  });

  /** ∫ over [a, b] of chord·g for a rectangle b0 wide with a circular hole (cx irrelevant), via θ on the circle's span. */
  function plateWithHole(B: number, Hh: number, cy: number, r: number) {
    const chord = (y: number) => B - 2 * Math.sqrt(Math.max(0, r * r - (y - cy) ** 2));
    const integrate = (g: (y: number) => number, a: number, b: number): number => {
      let sum = 0;
      // Outside the circle's span: polynomial integrand, Simpson exact.
      const lo = cy - r, hi = cy + r;
      if (a < lo) sum += simpson((y) => B * g(y), a, Math.min(b, lo), 4);
      if (b > hi) sum += simpson((y) => B * g(y), Math.max(a, hi), b, 4);
      const a1 = Math.max(a, lo), b1 = Math.min(b, hi);
      if (b1 > a1) {
        const th = (y: number) => Math.asin(Math.max(-1, Math.min(1, (y - cy) / r)));
        const f = (t: number) => {
          const y = cy + r * Math.sin(t);
          return chord(y) * g(y) * r * Math.cos(t);
        };
        const coarse = simpson(f, th(a1), th(b1), 2000);
        const fine = simpson(f, th(a1), th(b1), 4000);
        sum += fine + (fine - coarse) / 15;
      }
      return sum;
    };
    return { chord, integrate, depth: Hh };
  }

  it('plate with an off-centre circular hole, and a tube: A, yc, I, Q(y)', () => {
    const cases: { s: Section; integrate: (g: (y: number) => number, a: number, b: number) => number; depth: number }[] = [];
    {
      const B = 0.3, Hh = 0.5, r = 0.06, cy = 0.31;
      const s = build(plate(B, Hh).part!, [translate([{ sign: 1, shape: { kind: 'circle', cx: 0.05, cy: 0, r } }], 0, cy)]);
      cases.push({ s, ...plateWithHole(B, Hh, cy, r) });
    }
    {
      // A tube is outer circle minus inner circle; integrate each in its own angle variable.
      const R = 0.1, r = 0.085;
      const s = build(tube(2 * R, R - r).part!);
      const one = (rr: number) => plateWithHole(0, 2 * R, R, rr).integrate;
      cases.push({ s, integrate: (g, a, b) => -one(R)(g, a, b) + one(r)(g, a, b), depth: 2 * R });
    }
    for (const { s, integrate, depth } of cases) {
      const A = integrate(() => 1, 0, depth);
      const yc = integrate((y) => y, 0, depth) / A;
      const I = integrate((y) => (y - yc) ** 2, 0, depth);
      expect(Math.abs(s.area - A)).toBeLessThanOrEqual(1e-9 * A);
      expect(Math.abs(s.centroidY - yc)).toBeLessThanOrEqual(1e-9 * depth);
      expect(Math.abs(s.I - I)).toBeLessThanOrEqual(1e-9 * I);
      const Qmax = s.firstMoment(s.centroidY).value;
      for (let i = 0; i <= 20; i++) {
        const y = (depth * i) / 20;
        expect(Math.abs(s.firstMoment(y).value - integrate((t) => t - yc, y, depth))).toBeLessThanOrEqual(1e-9 * Qmax);
      }
    }
  });
});
