/**
 * Fuzzing the section engine through its public API: shape constructors with any numbers
 * (including NaN, infinities, zero, negative and extreme magnitudes), random layouts of parts and
 * holes, polygons with arbitrary vertices, then every reading at heights anywhere (inside, outside,
 * on breakpoints, non-finite) and with any shear force. Nothing may throw, and every number that
 * comes back without a problem is finite.
 */
import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { angle, box, buildSection, channel, circle, isection, type Part, plate, polygon, type Section, type SectionInput, tee, translate, tube } from '../../src/core/section';
import { fuzzParameters, testTimeout } from './config';
import { isInternalFault, withoutKnownBugs } from './invariants';

/** Lengths in metres: mostly structural sizes, sometimes absurd. */
const length = fc.oneof(
  { weight: 8, arbitrary: fc.double({ min: 0.001, max: 2, noNaN: true }) },
  { weight: 1, arbitrary: fc.constantFrom(0, -0.1, Number.NaN, Infinity, -Infinity, 1e-300, 5e-324, 1e300, 1.7976931348623157e308, 1e-12, 1e12) },
  { weight: 1, arbitrary: fc.double({ noNaN: false }) },
);
const coordinate = fc.oneof(
  { weight: 8, arbitrary: fc.double({ min: -1, max: 1, noNaN: true }) },
  { weight: 2, arbitrary: fc.integer({ min: -20, max: 20 }).map((i) => i * 0.01) },
    { weight: 1, arbitrary: fc.constantFrom(Number.NaN, Infinity, 1e300, -1e300, 1e6, 5e-324) },
);

const shape: fc.Arbitrary<{ part?: Part; problems: unknown[] }> = fc.oneof(
  fc.tuple(length, length).map(([b, h]) => plate(b, h, 'plate')),
  length.map((d) => circle(d, 'circle')),
  fc.tuple(length, length).map(([d, t]) => tube(d, t, 'tube')),
  fc.tuple(length, length, length).map(([b, h, t]) => box(b, h, t, 'box')),
  fc.tuple(fc.constantFrom(isection, tee, channel), length, length, length, length).map(([f, d, bf, tf, tw]) => f({ d, bf, tf, tw }, 'flanged')),
  fc.tuple(length, length, length).map(([d, b, t]) => angle({ d, b, t }, 'angle')),
  fc.array(fc.tuple(coordinate, coordinate), { maxLength: 12 }).map((pts) => polygon(pts, 'polygon')),
);

const layout: fc.Arbitrary<SectionInput[]> = fc.array(
  fc.tuple(shape, fc.boolean(), fc.option(fc.tuple(coordinate, coordinate), { freq: 2 })).map(([s, hole, at]) => ({ made: s, hole, at })),
  { minLength: 0, maxLength: 6 },
).map((items) => {
  const out: SectionInput[] = [];
  let top = 0;
  items.forEach((it, i) => {
    if (!it.made.part) return;
    let part = it.made.part;
    // Without a position, parts stack like `plate … / plate …` in a note.
    part = it.at ? translate(part, it.at[0], it.at[1]) : translate(part, 0, top);
    if (!it.at && !it.hole) {
      for (const p of part) {
        if (p.shape.kind === 'polygon') for (const y of p.shape.ys) top = Math.max(top, y);
        else top = Math.max(top, p.shape.cy + p.shape.r);
      }
    }
    out.push({ part, hole: it.hole && i > 0, tag: i });
  });
  return out;
});

/** Heights to read at: fractions of the depth, breakpoints, outside, non-finite. */
function heights(s: Section, picks: number[]): number[] {
  const bps = s.breakpoints().map((b) => b.y);
  const ys = [0, s.depth, s.centroidY, s.depth / 2, -1e-9, s.depth * (1 + 1e-9), -s.depth, 2 * s.depth, Number.NaN, Infinity, -Infinity, 1e300, ...bps];
  for (const p of picks) ys.push(p * s.depth);
  for (const b of bps) ys.push(b * (1 + 1e-13), b * (1 - 1e-13), b + 1e-12);
  return ys;
}

function finiteOrProblem(where: string, value: number, problem: unknown, out: string[]): void {
  if (!Number.isFinite(value)) out.push(`${where}: ${value}${problem ? ' (with a problem)' : ''}`);
}

function readAll(s: Section, V: number, picks: number[]): string[] {
  const out: string[] = [];
  for (const [k, v] of Object.entries({ area: s.area, I: s.I, Iy: s.Iy, Ixy: s.Ixy, centroidX: s.centroidX, centroidY: s.centroidY, depth: s.depth, width: s.width, bottom: s.bottom, left: s.left })) {
    if (!Number.isFinite(v)) out.push(`${k} = ${v}`);
  }
  if (!(s.I > 0) || !(s.area > 0)) out.push(`I = ${s.I}, area = ${s.area}`);
  for (const y of heights(s, picks)) {
    const at = `y=${y}`;
    const w = s.widthAt(y);
    finiteOrProblem(`${at} width below`, w.below, w.problem, out);
    finiteOrProblem(`${at} width above`, w.above, w.problem, out);
    const q = s.firstMoment(y);
    finiteOrProblem(`${at} Q`, q.value, q.problem, out);
    const f = s.shearFlow(V, y);
    finiteOrProblem(`${at} flow`, f.value, f.problem, out);
    const t = s.tau(V, y);
    finiteOrProblem(`${at} tau`, t.value, t.problem, out);
    finiteOrProblem(`${at} tau width`, t.width, t.problem, out);
    const sides = s.tauSides(V, y);
    if (sides.below !== undefined) finiteOrProblem(`${at} tau below`, sides.below, sides.problem, out);
    if (sides.above !== undefined) finiteOrProblem(`${at} tau above`, sides.above, sides.problem, out);
    if (!Number.isFinite(y) && !s.heightProblem(y)) out.push(`${at}: no height problem for a non-finite height`);
  }
  const m = s.tauMax(V);
  finiteOrProblem('tauMax', m.value, m.problem, out);
  finiteOrProblem('tauMax perV', m.perV, m.problem, out);
  for (const l of m.locations) if (!Number.isFinite(l.y) || l.y < -1e-9 * s.depth || l.y > s.depth * (1 + 1e-9)) out.push(`tauMax location ${l.y} outside 0..${s.depth}`);
  const prof = s.profile(picks.length + 2);
  for (const arr of [prof.y, prof.tauPerV, prof.width]) for (const v of arr) if (!Number.isFinite(v)) out.push(`profile value ${v}`);
  for (const b of s.breakpoints()) if (![b.y, b.widthAbove, b.widthBelow, b.firstMoment].every(Number.isFinite)) out.push(`breakpoint ${JSON.stringify(b)}`);
  for (const p of s.parts()) if (![p.area, p.centroidY, p.bottom, p.top, p.firstMoment].every(Number.isFinite)) out.push(`part summary ${JSON.stringify(p)}`);
  for (const o of s.outline()) {
    const sh = o.shape;
    const nums = sh.kind === 'circle' ? [sh.cx, sh.cy, sh.r] : [...sh.xs, ...sh.ys];
    if (!nums.every(Number.isFinite)) out.push('outline has a non-finite coordinate');
  }
  return out;
}

const shearForce = fc.oneof(
  { weight: 6, arbitrary: fc.double({ min: -1e7, max: 1e7, noNaN: true }) },
  { weight: 1, arbitrary: fc.constantFrom(0, -0, 1, Number.NaN, Infinity, -Infinity, 1e12, -1e12, 5e-324, 1e300, 1.7976931348623157e308) },
);

describe('section engine', () => {
  it('shape constructors refuse bad numbers with problems and never throw', () => {
    fc.assert(
      fc.property(shape, (made) => {
        expect(Array.isArray(made.problems)).toBe(true);
        if (made.part) for (const p of made.part) {
          const nums = p.shape.kind === 'circle' ? [p.shape.cx, p.shape.cy, p.shape.r] : [...p.shape.xs, ...p.shape.ys];
          expect(nums.every(Number.isFinite)).toBe(true);
        }
      }),
      fuzzParameters(500),
    );
  }, testTimeout());

  it('builds any layout or says why not, and every reading of a built section is finite', () => {
    fc.assert(
      fc.property(layout, shearForce, fc.array(fc.double({ min: -0.5, max: 1.5, noNaN: true }), { maxLength: 6 }), (inputs, V, picks) => {
        const built = buildSection(inputs);
        const faults = built.problems.filter((p) => isInternalFault(p));
        expect(faults, JSON.stringify(inputs)).toEqual([]);
        for (const p of built.problems) expect(typeof p.message === 'string' && p.message.length > 0 && !/NaN|undefined|\[object/.test(p.message), p.message).toBe(true);
        if (!built.section) {
          expect(built.problems.some((p) => p.severity === 'error')).toBe(true);
          return;
        }
        expect(withoutKnownBugs(readAll(built.section, V, picks)), JSON.stringify(inputs.map((i) => ({ hole: i.hole, part: i.part.map((p) => ({ sign: p.sign, shape: p.shape.kind === 'circle' ? p.shape : { xs: [...p.shape.xs], ys: [...p.shape.ys] } })) })))).toEqual([]);
      }),
      fuzzParameters(400),
    );
  }, testTimeout());

  it('tau is V·Q/(I·t) on the narrower side, names that side, and tau_max is the largest tau over the depth (at its own location)', () => {
    const realistic = fc.array(
      fc.oneof(
        fc.tuple(fc.double({ min: 0.005, max: 0.5, noNaN: true }), fc.double({ min: 0.005, max: 0.5, noNaN: true })).map(([b, h]) => plate(b, h).part!),
        fc.double({ min: 0.01, max: 0.5, noNaN: true }).map((d) => circle(d).part!),
        fc.tuple(fc.double({ min: 0.1, max: 0.6, noNaN: true }), fc.double({ min: 0.05, max: 0.3, noNaN: true })).map(([d, bf]) => isection({ d, bf, tf: d / 12, tw: bf / 15 }).part!),
      ),
      { minLength: 1, maxLength: 3 },
    ).map((parts) => {
      let top = 0;
      return parts.map((part) => {
        const placed = translate(part, 0, top);
        for (const p of placed) top = Math.max(top, p.shape.kind === 'circle' ? p.shape.cy + p.shape.r : Math.max(...p.shape.ys));
        return { part: placed, hole: false };
      });
    });
    fc.assert(
      fc.property(realistic, fc.double({ min: 1e3, max: 1e6, noNaN: true }), (inputs, V) => {
        const s = buildSection(inputs).section;
        if (!s) return;
        const ys = [...s.breakpoints().map((b) => b.y), ...Array.from(s.profile(60).y)];
        let largest = 0;
        for (const y of ys) {
          const t = s.tau(V, y);
          // Heights of a section's own profile and breakpoints have a reading, except where stacked
          // round parts touch at a point and there is no material across the cut.
          if (t.problem) {
            expect(t.problem.code, `y=${y}`).toBe('section.no-material');
            continue;
          }
          const w = s.widthAt(y);
          const Q = s.firstMoment(y).value;
          const positive = [w.below, w.above].filter((x) => x > 0);
          if (positive.length === 0) {
            expect(t.value).toBe(0);
            continue;
          }
          const width = Math.min(...positive);
          // tau = V·Q/(I·t), t the narrower side with material (closed form of the elementary theory).
          expect(Math.abs(t.value - (V * Q) / (s.I * width))).toBeLessThanOrEqual(1e-9 * Math.abs((V * Q) / (s.I * width)) + 1e-9);
          expect(t.width).toBeCloseTo(width, 12);
          const same = Math.abs(w.below - w.above) <= 1e-10 * s.width;
          const side = w.below > 0 && w.above > 0 ? (same ? 'both' : w.below < w.above ? 'below' : 'above') : w.below > 0 ? 'below' : 'above';
          expect(t.side, `y=${y}`).toBe(side);
          largest = Math.max(largest, Math.abs(t.value));
        }
        const m = s.tauMax(V);
        // A part touching another at a point pinches the material to nothing there: no finite maximum.
        if (m.problem) {
          expect(m.problem.code).toBe('section.pinch');
          return;
        }
        expect(Math.abs(m.value)).toBeGreaterThanOrEqual(largest * (1 - 1e-9));
        for (const l of m.locations) expect(Math.abs(Math.abs(s.tau(V, l.y).value) - Math.abs(m.value))).toBeLessThanOrEqual(1e-9 * Math.abs(m.value));
      }),
      fuzzParameters(200),
    );
  }, testTimeout());

  it('takes garbage in place of parts without throwing', () => {
    const junk = fc.oneof(fc.constant(null), fc.constant(undefined), fc.integer(), fc.string(), fc.constant([]), fc.constant([{}]), fc.constant([{ sign: 1, shape: { kind: 'circle', cx: 0, cy: 0, r: Number.NaN } }]), fc.constant([{ sign: 1, shape: { kind: 'polygon', xs: [0, 1], ys: [0] } }]), fc.constant([{ sign: 1, shape: { kind: 'triangle' } }]));
    fc.assert(
      fc.property(fc.array(fc.record({ part: junk, hole: fc.oneof(fc.boolean(), fc.constant('yes')), tag: fc.anything() }), { maxLength: 4 }), (inputs) => {
        const built = buildSection(inputs as unknown as SectionInput[]);
        expect(built.problems.filter((p) => isInternalFault(p))).toEqual([]);
      }),
      fuzzParameters(300),
    );
  }, testTimeout());
});
