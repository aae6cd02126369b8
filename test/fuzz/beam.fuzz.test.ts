/**
 * Fuzzing the beam solver through its public API: spans, supports, loads, load groups and
 * combinations with any numbers (NaN, infinities, zero, negative, extreme), unknown kinds and plain
 * garbage in place of the input. solveBeam must never throw or fall back on its internal-fault net,
 * and a solved beam must give finite values everywhere it is read, in range or not.
 */
import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { type BeamInput, type BeamResult, solveBeam } from '../../src/core/beam';
import { fuzzParameters, testTimeout } from './config';
import { isInternalFault, isKnownFault } from './invariants';

/** Faults of the engine, less those already pinned in regressions.test.ts. */
const newFaults = (problems: { code: string; message: string }[]) => problems.filter((p) => isInternalFault(p) && !isKnownFault(p));

const SPAN_CHOICES = [1, 3.6, 7.2, 10.8, 18 * 0.3048];

const number = (min: number, max: number) =>
  fc.oneof(
    { weight: 10, arbitrary: fc.double({ min, max, noNaN: true }) },
    { weight: 3, arbitrary: fc.integer({ min: Math.ceil(min), max: Math.floor(max) }) },
    { weight: 1, arbitrary: fc.constantFrom(0, -0, Number.NaN, Infinity, -Infinity, 1e300, -1e300, 5e-324, 1.7976931348623157e308, 1e-12) },
  );

const GROUPS = ['default', 'dead', 'live', 'snow', '__proto__', 'constructor', 'toString', 'all loads', ''];

/** Positions as fractions of the span (scaled once the span is known: `.chain` would rebuild arbitraries per run). */
const fraction = fc.oneof(
  { weight: 6, arbitrary: fc.double({ min: 0, max: 1, noNaN: true }) },
  { weight: 3, arbitrary: fc.constantFrom(0, 1, 0.5, 1 / 3, 1 - 1e-12, 1e-9, 1e-6) },
  { weight: 1, arbitrary: number(-1, 2) },
);
const group = fc.option(fc.constantFrom(...GROUPS), { freq: 2 }).map((g) => g ?? undefined);
const load = fc.oneof(
  fc.record({ kind: fc.constant('point' as const), P: number(-1e6, 1e6), x: fraction, group }),
  fc.record({ kind: fc.constant('udl' as const), w: number(-1e5, 1e5), x1: fraction, x2: fraction, group }),
  fc.record({ kind: fc.constant('ramp' as const), w1: number(-1e5, 1e5), w2: number(-1e5, 1e5), x1: fraction, x2: fraction, group }),
  fc.record({ kind: fc.constant('moment' as const), M: number(-1e6, 1e6), x: fraction, group }),
);
const support = fc.record({ kind: fc.constantFrom('pin' as const, 'roller' as const, 'fixed' as const), x: fraction });
const combination = fc.record({
  name: fc.constantFrom('ULS', 'SLS', 'c1', '__proto__', 'constructor', 'dead', ''),
  factors: fc.array(fc.record({ group: fc.constantFrom(...GROUPS, 'missing'), factor: number(-3, 3) }), { maxLength: 4 }),
});

const beamInput: fc.Arbitrary<BeamInput<number>> = fc
  .record({
    span: fc.oneof({ weight: 8, arbitrary: fc.constantFrom(...SPAN_CHOICES) }, { weight: 1, arbitrary: number(-1, 100) }),
    supports: fc.array(support, { maxLength: 5 }),
    loads: fc.array(load, { maxLength: 8 }),
    combinations: fc.option(fc.array(combination, { maxLength: 4 }), { freq: 2 }).map((c) => c ?? undefined),
  })
  .map(({ span, supports, loads, combinations }) => {
    const L = Number.isFinite(span) && span > 0 ? span : 5;
    const scale = (f: number) => f * L;
    return {
      span,
      supports: supports.map((s, i) => ({ ...s, x: scale(s.x), tag: i })),
      loads: loads.map((l, i) => ({ ...l, ...('x' in l ? { x: scale(l.x) } : { x1: scale(l.x1), x2: scale(l.x2) }), tag: 100 + i })),
      combinations,
    } as BeamInput<number>;
  });

function readAll(beam: BeamResult<number>, xs: number[]): string[] {
  const out: string[] = [];
  const L = beam.span;
  const bad = (where: string, v: number | undefined) => {
    if (v !== undefined && !Number.isFinite(v)) out.push(`${where} = ${v}`);
  };
  bad('Vmax', beam.Vmax);
  bad('envelope Mmax', beam.envelope.Mmax.M);
  bad('envelope Mmin', beam.envelope.Mmin.M);
  const points = [0, L, L / 2, -1, 2 * L, Number.NaN, Infinity, ...xs.map((f) => f * L), ...beam.supports.map((s) => s.x)];
  for (const x of points) {
    for (const side of [undefined, 'left', 'right'] as const) {
      bad(`shear(${x}, ${side})`, beam.shear(x, side));
      bad(`moment(${x}, ${side})`, beam.moment(x, side));
    }
    const r = beam.reaction(x);
    if (r) for (const [k, v] of Object.entries(r)) if (v && typeof v === 'object' && 'value' in v) bad(`reaction(${x}).${k}`, (v as { value: number }).value);
  }
  for (const d of [...beam.cases, ...beam.combinations]) {
    bad(`${d.name} Vmax`, d.Vmax.V);
    bad(`${d.name} Mmax`, d.Mmax.M);
    for (const r of d.reactions) {
      bad(`${d.name} R at ${r.x}`, r.R);
      bad(`${d.name} M at ${r.x}`, r.M);
    }
    for (const x of points) bad(`${d.name} shear(${x})`, d.shear(x));
    const s = d.sample(16);
    for (const arr of [s.x, s.V, s.M]) for (const v of arr) bad(`${d.name} sample`, v);
  }
  const env = beam.sample(16);
  for (const arr of [env.x, env.Vmax, env.Vmin, env.Mmax, env.Mmin]) for (const v of arr) bad('envelope sample', v);
  return out;
}

describe('beam solver', () => {
  it('solves any beam or says why not; a solved beam reads finite everywhere', () => {
    fc.assert(
      fc.property(beamInput, fc.array(fc.double({ min: -0.2, max: 1.2, noNaN: true }), { maxLength: 6 }), (input, xs) => {
        const solved = solveBeam(input);
        expect(newFaults(solved.problems), JSON.stringify(input)).toEqual([]);
        for (const p of solved.problems) expect(/undefined|\[object/.test(p.message), p.message).toBe(false);
        if (!solved.beam) {
          expect(solved.problems.some((p) => p.severity === 'error'), JSON.stringify(input)).toBe(true);
          return;
        }
        expect(readAll(solved.beam, xs), JSON.stringify(input)).toEqual([]);
      }),
      fuzzParameters(400),
    );
  }, testTimeout());

  it('gives the same reactions by equilibrium and by the stiffness method', () => {
    fc.assert(
      fc.property(beamInput, (input) => {
        const a = solveBeam(input);
        const b = solveBeam(input, { method: 'stiffness' });
        expect(newFaults(b.problems)).toEqual([]);
        if (!a.beam || !b.beam) return;
        const scale = Math.max(1, ...a.beam.envelope.reactions.map((r) => Math.abs(r.R.value)));
        a.beam.envelope.reactions.forEach((r, i) => {
          expect(Math.abs(r.R.value - b.beam!.envelope.reactions[i]!.R.value), JSON.stringify(input)).toBeLessThanOrEqual(1e-6 * scale);
        });
      }),
      fuzzParameters(200),
    );
  }, testTimeout());

  it('takes garbage in place of a beam without throwing', () => {
    const junk = fc.oneof(fc.constant(null), fc.constant(undefined), fc.string(), fc.integer(), fc.constant({}), fc.constant([]), fc.anything());
    fc.assert(
      fc.property(fc.oneof(junk, fc.record({ span: fc.oneof(junk, fc.double()), supports: fc.oneof(junk, fc.array(fc.record({ kind: fc.oneof(fc.string(), fc.constant('pin')), x: fc.oneof(fc.double(), junk) }))), loads: fc.oneof(junk, fc.array(fc.record({ kind: fc.constantFrom('point', 'udl', 'ramp', 'moment', 'gravity'), P: fc.anything(), w: fc.anything(), x: fc.anything(), x1: fc.anything(), x2: fc.anything(), group: fc.anything() }))), combinations: fc.oneof(junk, fc.array(fc.record({ name: fc.anything(), factors: fc.anything() }))) })), (input) => {
        const solved = solveBeam(input as unknown as BeamInput);
        expect(newFaults(solved.problems)).toEqual([]);
      }),
      fuzzParameters(300),
    );
  }, testTimeout());
});
