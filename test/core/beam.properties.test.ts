/**
 * Properties every solved beam must have, on random stable beams (fast-check). The checks are
 * independent of the solver's own code paths: equilibrium of the whole beam; V and M recomputed at
 * random sections by direct statics of the free body left of the cut; dM/dx = V and dV/dx = −w
 * (with left-up V and sagging M, dM/dx = +V); superposition of load groups; mirror symmetry;
 * compatibility (the deflection obtained by integrating M twice vanishes at every support and its
 * slope at every fixed support); and the determinate path agreeing with the stiffness path.
 */
import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import {
  type BeamCombination,
  type BeamDiagram,
  type BeamDiagramData,
  type BeamInput,
  type BeamLoad,
  type BeamSupport,
  DEFAULT_GROUP,
  solveBeam,
} from '../../src/core/beam';

const GROUPS = ['dead', 'live', 'wind'] as const;
fc.configureGlobal({ numRuns: Number(process.env.BEAM_PROPERTY_RUNS ?? 100) });
const SLOTS = 24;

// Positions on a fine grid: coincident positions happen often, and none is closer than a
// billionth of the span to another without being equal (those are gathered into one section;
// see beam.api.test.ts).
const position = fc.integer({ min: 0, max: 4000 }).map((k) => k / 4000);
// Whole newtons keep magnitudes physical; subnormal and extreme values are covered in beam.problems.
const force = fc.integer({ min: -60_000, max: 120_000 });
const intensity = fc.integer({ min: -20_000, max: 40_000 });
const group = fc.constantFrom<string | undefined>(undefined, ...GROUPS);

type LoadSpec =
  | { kind: 'point'; P: number; u: number; group: string | undefined }
  | { kind: 'udl'; w: number; u: number; length: number; group: string | undefined }
  | { kind: 'ramp'; w1: number; w2: number; u: number; length: number; group: string | undefined }
  | { kind: 'moment'; M: number; u: number; group: string | undefined };

const loadSpec: fc.Arbitrary<LoadSpec> = fc.oneof(
  fc.record({ kind: fc.constant('point' as const), P: force, u: position, group }),
  fc.record({ kind: fc.constant('udl' as const), w: intensity, u: position, length: fc.integer({ min: 80, max: 4000 }).map((k) => k / 4000), group }),
  fc.record({
    kind: fc.constant('ramp' as const),
    w1: intensity,
    w2: intensity,
    u: position,
    length: fc.integer({ min: 80, max: 4000 }).map((k) => k / 4000),
    group,
  }),
  fc.record({ kind: fc.constant('moment' as const), M: force, u: position, group }),
);

function toLoad(spec: LoadSpec, span: number): BeamLoad {
  const withGroup = <T extends object>(load: T): T & { group?: string } =>
    spec.group === undefined ? load : { ...load, group: spec.group };
  switch (spec.kind) {
    case 'point':
      return withGroup({ kind: 'point', P: spec.P, x: spec.u * span });
    case 'moment':
      return withGroup({ kind: 'moment', M: spec.M, x: spec.u * span });
    case 'udl':
    case 'ramp': {
      const start = Math.min(spec.u, 0.98);
      const end = Math.min(1, start + spec.length);
      const x1 = start * span;
      const x2 = end * span;
      return spec.kind === 'udl'
        ? withGroup({ kind: 'udl', w: spec.w, x1, x2 })
        : withGroup({ kind: 'ramp', w1: spec.w1, w2: spec.w2, x1, x2 });
    }
  }
}

interface BeamSpec {
  span: number;
  slots: number[];
  kinds: BeamSupport['kind'][];
  loads: LoadSpec[];
  factors: number[][];
}

const beamSpec: fc.Arbitrary<BeamSpec> = fc
  .record({
    span: fc.double({ min: 0.5, max: 40, noNaN: true, noDefaultInfinity: true }),
    slots: fc.uniqueArray(fc.integer({ min: 0, max: SLOTS }), { minLength: 1, maxLength: 7 }),
    kinds: fc.array(fc.constantFrom<BeamSupport['kind']>('pin', 'roller', 'roller', 'fixed'), { minLength: 7, maxLength: 7 }),
    loads: fc.array(loadSpec, { minLength: 1, maxLength: 10 }),
    factors: fc.array(fc.array(fc.integer({ min: -100, max: 200 }).map((k) => k / 100), { minLength: 4, maxLength: 4 }), {
      minLength: 0,
      maxLength: 3,
    }),
  })
  .filter((s) => s.slots.length >= 2 || s.kinds[0] === 'fixed');

function toInput(spec: BeamSpec): BeamInput {
  const supports: BeamSupport[] = spec.slots.map((slot, i) => ({ kind: spec.kinds[i]!, x: (slot / SLOTS) * spec.span }));
  const loads = spec.loads.map((l) => toLoad(l, spec.span));
  const present = [...new Set(loads.map((l) => l.group ?? DEFAULT_GROUP))];
  const combinations: BeamCombination[] = spec.factors.map((row, i) => ({
    name: `C${i + 1}`,
    factors: present.map((g, j) => ({ group: g, factor: row[j % row.length]! })),
  }));
  return combinations.length ? { span: spec.span, supports, loads, combinations } : { span: spec.span, supports, loads };
}

function solved(input: BeamInput, method?: 'stiffness') {
  const solution = solveBeam(input, method ? { method } : {});
  const errors = solution.problems.filter((p) => p.severity === 'error');
  if (errors.length || !solution.beam) throw new Error(`unexpected problems: ${JSON.stringify(errors)}`);
  return solution.beam;
}

/** The loads a diagram carries: its group's loads, or the factored loads of its combination. */
function loadsOf(input: BeamInput, diagram: BeamDiagramData): BeamLoad[] {
  const groupOf = (l: BeamLoad) => l.group ?? DEFAULT_GROUP;
  if (diagram.kind === 'group') return input.loads.filter((l) => groupOf(l) === diagram.name);
  const out: BeamLoad[] = [];
  for (const { group: g, factor } of diagram.factors) {
    for (const l of input.loads) if (groupOf(l) === g) out.push(scaleLoad(l, factor));
  }
  return out;
}

function scaleLoad(load: BeamLoad, factor: number): BeamLoad {
  switch (load.kind) {
    case 'point':
      return { ...load, P: load.P * factor };
    case 'moment':
      return { ...load, M: load.M * factor };
    case 'udl':
      return { ...load, w: load.w * factor };
    case 'ramp':
      return { ...load, w1: load.w1 * factor, w2: load.w2 * factor };
  }
}

/** Magnitude scale of the forces on a diagram, for relative tolerances. */
function forceScale(loads: BeamLoad[], diagram: BeamDiagramData): number {
  let total = 1;
  for (const l of loads) {
    if (l.kind === 'point') total += Math.abs(l.P);
    else if (l.kind === 'moment') total += Math.abs(l.M) / diagram.span;
    else if (l.kind === 'udl') total += Math.abs(l.w) * (l.x2 - l.x1);
    else total += (Math.abs(l.w1) + Math.abs(l.w2)) * (l.x2 - l.x1);
  }
  for (const r of diagram.reactions) total += Math.abs(r.R) + Math.abs(r.M ?? 0) / diagram.span;
  return total;
}

/** Intensity, force and moment (about the cut at x) of the part of a line load left of x. */
function lineLeftOf(x1: number, x2: number, w1: number, w2: number, x: number) {
  if (x <= x1) return { w: 0, F: 0, M: 0 };
  const slope = (w2 - w1) / (x2 - x1);
  const length = Math.min(x, x2) - x1;
  const F = w1 * length + (slope * length * length) / 2;
  const firstMoment = (w1 * length * length) / 2 + (slope * length ** 3) / 3;
  return { w: x < x2 ? w1 + slope * (x - x1) : 0, F, M: (x - x1) * F - firstMoment };
}

/** V, M and w at a section x (not at a concentrated action) from the free body left of the cut. */
function statics(loads: BeamLoad[], diagram: BeamDiagramData, x: number) {
  let V = 0;
  let M = 0;
  let w = 0;
  for (const r of diagram.reactions) {
    if (r.x < x) {
      V += r.R;
      M += r.R * (x - r.x) - (r.M ?? 0);
    }
  }
  for (const l of loads) {
    if (l.kind === 'point' && l.x < x) {
      V -= l.P;
      M -= l.P * (x - l.x);
    } else if (l.kind === 'moment' && l.x < x) M += l.M;
    else if (l.kind === 'udl' || l.kind === 'ramp') {
      const [w1, w2] = l.kind === 'udl' ? [l.w, l.w] : [l.w1, l.w2];
      const part = lineLeftOf(l.x1, l.x2, w1, w2, x);
      V -= part.F;
      M -= part.M;
      w += part.w;
    }
  }
  return { V, M, w };
}

/** Sections well inside the pieces of a diagram, away from every concentrated action. */
function interiorSections(diagram: BeamDiagramData, fractions: number[]): number[] {
  const xs: number[] = [];
  for (const piece of diagram.pieces) {
    if (piece.x1 - piece.x0 < diagram.span * 1e-3) continue;
    for (const f of fractions) xs.push(piece.x0 + (0.05 + 0.9 * f) * (piece.x1 - piece.x0));
  }
  return xs;
}

const everyDiagram = (beam: ReturnType<typeof solved>) => [...beam.cases, ...beam.combinations];

describe('equilibrium and statics', () => {
  it('reactions balance the loads: ΣR = ΣP + ∫w, ΣR·x + ΣM_reaction = ΣP·x + ∫w·x + ΣM_applied', () => {
    fc.assert(
      fc.property(beamSpec, (spec) => {
        const input = toInput(spec);
        const beam = solved(input);
        for (const diagram of everyDiagram(beam)) {
          const loads = loadsOf(input, diagram);
          const scale = forceScale(loads, diagram);
          const atEnd = statics(loads, diagram, Infinity);
          let Rsum = 0;
          for (const r of diagram.reactions) Rsum += r.R;
          let loadSum = 0;
          for (const l of loads) {
            if (l.kind === 'point') loadSum += l.P;
            else if (l.kind === 'udl') loadSum += l.w * (l.x2 - l.x1);
            else if (l.kind === 'ramp') loadSum += ((l.w1 + l.w2) / 2) * (l.x2 - l.x1);
          }
          expect(Math.abs(Rsum - loadSum)).toBeLessThan(1e-9 * scale);
          // Past the right end the left free body is the whole beam: V = M = 0.
          expect(Math.abs(atEnd.V)).toBeLessThan(1e-9 * scale);
          const xFar = 2 * spec.span;
          expect(Math.abs(statics(loads, diagram, xFar).M)).toBeLessThan(1e-9 * scale * spec.span);
        }
      }),
    );
  });

  it('V and M at any section equal the statics of the free body left of it', () => {
    fc.assert(
      fc.property(beamSpec, fc.array(position, { minLength: 1, maxLength: 3 }), (spec, fractions) => {
        const input = toInput(spec);
        const beam = solved(input);
        for (const diagram of everyDiagram(beam)) {
          const loads = loadsOf(input, diagram);
          const scale = forceScale(loads, diagram);
          for (const x of interiorSections(diagram, fractions)) {
            const expected = statics(loads, diagram, x);
            expect(Math.abs(shearOf(diagram, x) - expected.V)).toBeLessThan(1e-9 * scale);
            expect(Math.abs(momentOf(diagram, x) - expected.M)).toBeLessThan(1e-9 * scale * spec.span);
          }
        }
      }),
    );
  });

  it('dM/dx = V and dV/dx = −w inside every piece (central differences of the reading functions)', () => {
    fc.assert(
      fc.property(beamSpec, position, (spec, fraction) => {
        const input = toInput(spec);
        const beam = solved(input);
        for (const diagram of beam.combinations) {
          const loads = loadsOf(input, diagram);
          const scale = forceScale(loads, diagram);
          for (const piece of diagram.pieces) {
            const length = piece.x1 - piece.x0;
            if (length < spec.span / 100) continue;
            const x = piece.x0 + (0.1 + 0.8 * fraction) * length;
            const h = 1e-3 * length;
            const dM = (momentOf(diagram, x + h) - momentOf(diagram, x - h)) / (2 * h);
            const dV = (shearOf(diagram, x + h) - shearOf(diagram, x - h)) / (2 * h);
            expect(Math.abs(dM - shearOf(diagram, x))).toBeLessThan(1e-6 * scale);
            expect(Math.abs(dV + statics(loads, diagram, x).w)).toBeLessThan((1e-6 * scale) / spec.span);
          }
        }
      }),
    );
  });
});

const shearOf = (diagram: BeamDiagram, x: number): number => diagram.shear(x);
const momentOf = (diagram: BeamDiagram, x: number): number => diagram.moment(x);

describe('superposition and symmetry', () => {
  it('each combination equals the factored sum of its load groups solved separately', () => {
    fc.assert(
      fc.property(beamSpec, fc.array(position, { minLength: 1, maxLength: 4 }), (spec, fractions) => {
        const input = toInput(spec);
        const beam = solved(input);
        for (const combination of beam.combinations) {
          const scale = forceScale(loadsOf(input, combination), combination);
          combination.reactions.forEach((r, s) => {
            let sum = 0;
            let couple = 0;
            for (const { group: g, factor } of combination.factors) {
              sum += factor * beam.loadCase(g)!.reactions[s]!.R;
              couple += factor * (beam.loadCase(g)!.reactions[s]!.M ?? 0);
            }
            expect(Math.abs(r.R - sum)).toBeLessThan(1e-9 * scale);
            expect(Math.abs((r.M ?? 0) - couple)).toBeLessThan(1e-9 * scale * spec.span);
          });
          for (const f of fractions) {
            const x = f * spec.span;
            for (const side of ['left', 'right'] as const) {
              let V = 0;
              let M = 0;
              for (const { group: g, factor } of combination.factors) {
                V += factor * beam.loadCase(g)!.shear(x, side);
                M += factor * beam.loadCase(g)!.moment(x, side);
              }
              expect(Math.abs(combination.shear(x, side) - V)).toBeLessThan(1e-9 * scale);
              expect(Math.abs(combination.moment(x, side) - M)).toBeLessThan(1e-9 * scale * spec.span);
            }
          }
        }
      }),
    );
  });

  it('mirroring the beam mirrors the reactions, negates V and the reaction couples, and keeps M', () => {
    fc.assert(
      fc.property(beamSpec, fc.array(position, { minLength: 1, maxLength: 4 }), (spec, fractions) => {
        const input = toInput(spec);
        const L = input.span;
        const mirrored: BeamInput = {
          span: L,
          supports: input.supports.map((s) => ({ ...s, x: L - s.x })),
          loads: input.loads.map((l): BeamLoad => {
            switch (l.kind) {
              case 'point':
                return { ...l, x: L - l.x };
              case 'moment':
                return { ...l, x: L - l.x, M: -l.M };
              case 'udl':
                return { ...l, x1: L - l.x2, x2: L - l.x1 };
              case 'ramp':
                return { ...l, x1: L - l.x2, x2: L - l.x1, w1: l.w2, w2: l.w1 };
            }
          }),
        };
        const a = solved({ ...input, combinations: [] }).combinations[0]!;
        const b = solved(mirrored).combinations[0]!;
        const scale = forceScale(loadsOf(input, a), a);
        const reflected = [...b.reactions].reverse();
        a.reactions.forEach((r, s) => {
          expect(Math.abs(L - reflected[s]!.x - r.x)).toBeLessThan(1e-12 * L);
          expect(Math.abs(reflected[s]!.R - r.R)).toBeLessThan(1e-9 * scale);
          expect(Math.abs((reflected[s]!.M ?? 0) + (r.M ?? 0))).toBeLessThan(1e-9 * scale * L);
        });
        for (const f of fractions) {
          const x = f * L;
          expect(Math.abs(b.shear(L - x, 'left') + a.shear(x, 'right'))).toBeLessThan(1e-9 * scale);
          expect(Math.abs(b.moment(L - x, 'left') - a.moment(x, 'right'))).toBeLessThan(1e-9 * scale * L);
        }
        expect(Math.abs(Math.abs(b.Vmax.V) - Math.abs(a.Vmax.V))).toBeLessThan(1e-9 * scale);
        expect(Math.abs(b.Mmax.M - a.Mmax.M)).toBeLessThan(1e-9 * scale * L);
        expect(Math.abs(b.Mmin.M - a.Mmin.M)).toBeLessThan(1e-9 * scale * L);
      }),
    );
  });
});

/**
 * Integrates M twice exactly over the pieces (EI = 1) and returns the misfit of the best straight
 * line that makes the deflection zero at every support and the slope zero at every fixed support,
 * relative to the size of the deflections (with a floor for rounding). Zero when the reactions are compatible.
 */
function compatibilityMisfit(diagram: BeamDiagramData, scale: number): number {
  const slopeAt: number[] = [];
  const deflectionAt: number[] = [];
  const xs: number[] = [];
  let slope = 0;
  let deflection = 0;
  let size = 0;
  const record = (x: number) => {
    xs.push(x);
    slopeAt.push(slope);
    deflectionAt.push(deflection);
  };
  for (const piece of diagram.pieces) {
    record(piece.x0);
    const t = piece.x1 - piece.x0;
    let dSlope = 0;
    let dDeflection = slope * t;
    for (let i = 0; i < piece.moment.length; i++) {
      dSlope += (piece.moment[i]! * t ** (i + 1)) / (i + 1);
      dDeflection += (piece.moment[i]! * t ** (i + 2)) / ((i + 1) * (i + 2));
    }
    slope += dSlope;
    deflection += dDeflection;
    size = Math.max(size, Math.abs(deflection), Math.abs(slope) * diagram.span);
  }
  record(diagram.span);
  const valueAt = (values: number[], x: number) => values[xs.findIndex((p) => Math.abs(p - x) <= 1e-12 * diagram.span)]!;
  // Conditions a + b·x + deflection(x) = 0 at supports, b + slope(x) = 0 at fixed supports: least squares.
  const rows: [number, number, number][] = [];
  for (const r of diagram.reactions) {
    rows.push([1, r.x, -valueAt(deflectionAt, r.x)]);
    if (r.kind === 'fixed') rows.push([0, diagram.span, -valueAt(slopeAt, r.x) * diagram.span]);
  }
  let s11 = 0, s12 = 0, s22 = 0, t1 = 0, t2 = 0;
  for (const [p, q, rhs] of rows) {
    s11 += p * p;
    s12 += p * q;
    s22 += q * q;
    t1 += p * rhs;
    t2 += q * rhs;
  }
  const det = s11 * s22 - s12 * s12;
  const a = (t1 * s22 - t2 * s12) / det;
  const b = (s11 * t2 - s12 * t1) / det;
  let misfit = 0;
  for (const [p, q, rhs] of rows) misfit = Math.max(misfit, Math.abs(p * a + q * b - rhs));
  // Rounding in M (about 1e-15 of F·L) integrates to about 1e-15 of F·L³: that much is not a misfit.
  return misfit / (size + 1e-6 * scale * diagram.span ** 3);
}

describe('compatibility of indeterminate beams', () => {
  it('the deflection from M vanishes at every support, and its slope at every fixed support', () => {
    fc.assert(
      fc.property(beamSpec, (spec) => {
        const input = toInput(spec);
        const beam = solved(input);
        for (const diagram of everyDiagram(beam)) {
          expect(compatibilityMisfit(diagram, forceScale(loadsOf(input, diagram), diagram))).toBeLessThan(1e-8);
        }
      }),
    );
  });

  it('the misfit check itself detects wrong reactions (a continuous beam solved as two simple spans)', () => {
    const L = 5;
    const continuous = solved({
      span: 2 * L,
      supports: [{ kind: 'pin', x: 0 }, { kind: 'roller', x: L }, { kind: 'roller', x: 2 * L }],
      loads: [{ kind: 'udl', w: 1, x1: 0, x2: 2 * L }],
    }).combinations[0]!;
    expect(compatibilityMisfit(continuous, 2 * L)).toBeLessThan(1e-12);
    // Simple-span reactions wL/2, wL, wL/2 balance the load but are not compatible.
    const wrong = solved({
      span: 2 * L,
      supports: [{ kind: 'pin', x: 0 }, { kind: 'roller', x: 2 * L }],
      loads: [
        { kind: 'udl', w: 1, x1: 0, x2: 2 * L },
        { kind: 'point', P: -L, x: L },
      ],
    }).combinations[0]!;
    const asIfThreeSupports: BeamDiagramData = {
      ...wrong,
      reactions: [wrong.reactions[0]!, { x: L, kind: 'roller', R: L }, wrong.reactions[1]!],
    };
    expect(compatibilityMisfit(asIfThreeSupports, 2 * L)).toBeGreaterThan(1e-3);
  });
});

describe('determinate beams', () => {
  const determinate = fc
    .record({
      spec: beamSpec,
      cantilever: fc.boolean(),
    })
    .map(({ spec, cantilever }) => {
      const slots = cantilever ? spec.slots.slice(0, 1) : spec.slots.length >= 2 ? spec.slots.slice(0, 2) : [0, SLOTS];
      const kinds: BeamSupport['kind'][] = cantilever ? ['fixed'] : ['pin', 'roller'];
      return { ...spec, slots, kinds };
    });

  it('equilibrium and the stiffness method give the same reactions and diagrams', () => {
    fc.assert(
      fc.property(determinate, position, (spec, fraction) => {
        const input = toInput(spec);
        const byStatics = solved(input);
        const byStiffness = solved(input, 'stiffness');
        expect(byStatics.method).toBe('equilibrium');
        expect(byStiffness.method).toBe('stiffness');
        byStatics.combinations.forEach((a, i) => {
          const b = byStiffness.combinations[i]!;
          const scale = forceScale(loadsOf(input, a), a);
          a.reactions.forEach((r, s) => {
            expect(Math.abs(r.R - b.reactions[s]!.R)).toBeLessThan(1e-9 * scale);
            expect(Math.abs((r.M ?? 0) - (b.reactions[s]!.M ?? 0))).toBeLessThan(1e-9 * scale * spec.span);
          });
          const x = fraction * spec.span;
          expect(Math.abs(a.moment(x) - b.moment(x))).toBeLessThan(1e-9 * scale * spec.span);
        });
      }),
    );
  });
});

describe('extremes and zero-shear points', () => {
  it('Vmax, Mmax and Mmin bound every sampled value and are attained where reported; zero-shear points have V = 0', () => {
    fc.assert(
      fc.property(beamSpec, (spec) => {
        const input = toInput(spec);
        const beam = solved(input);
        for (const diagram of everyDiagram(beam)) {
          const scale = forceScale(loadsOf(input, diagram), diagram);
          const tolV = 1e-9 * scale;
          const tolM = 1e-9 * scale * spec.span;
          const samples = diagram.sample(200);
          let largestV = 0;
          let largestM = -Infinity;
          let smallestM = Infinity;
          let ordered = true;
          // A jump at an end is drawn from the zero outside the beam; that zero is not a beam value.
          const first = samples.x[0] === samples.x[1] ? 1 : 0;
          const last = samples.x.length - (samples.x.at(-1) === samples.x.at(-2) ? 2 : 1);
          for (let i = first; i <= last; i++) {
            largestV = Math.max(largestV, Math.abs(samples.V[i]!));
            largestM = Math.max(largestM, samples.M[i]!);
            smallestM = Math.min(smallestM, samples.M[i]!);
            if (i > first && samples.x[i]! < samples.x[i - 1]!) ordered = false;
          }
          expect(ordered).toBe(true);
          expect(largestV).toBeLessThanOrEqual(Math.abs(diagram.Vmax.V) + tolV);
          expect(largestM).toBeLessThanOrEqual(diagram.Mmax.M + tolM);
          expect(smallestM).toBeGreaterThanOrEqual(diagram.Mmin.M - tolM);
          expect(Math.abs(diagram.shear(diagram.Vmax.x, diagram.Vmax.side) - diagram.Vmax.V)).toBeLessThan(tolV);
          expect(Math.abs(diagram.moment(diagram.Mmax.x, diagram.Mmax.side) - diagram.Mmax.M)).toBeLessThan(tolM);
          expect(Math.abs(diagram.moment(diagram.Mmin.x, diagram.Mmin.side) - diagram.Mmin.M)).toBeLessThan(tolM);
          for (const zero of diagram.zeroShear) {
            if (zero.kind === 'jump') {
              expect(diagram.shear(zero.x, 'left') * diagram.shear(zero.x, 'right')).toBeLessThan(0);
            } else {
              const V = Math.min(Math.abs(diagram.shear(zero.x, 'left')), Math.abs(diagram.shear(zero.x, 'right')));
              expect(V).toBeLessThan(1e-7 * scale);
            }
          }
        }
        // The envelope is the extreme over the combinations.
        // (Combinations within 1e-10 of each other count as a tie; the first one is named.)
        const near = (a: number, b: number) => Math.abs(a - b) <= 1e-9 * Math.max(Math.abs(a), Math.abs(b), 1e-300);
        expect(near(beam.Vmax, Math.max(...beam.combinations.map((c) => Math.abs(c.Vmax.V))))).toBe(true);
        expect(near(beam.envelope.Mmax.M, Math.max(...beam.combinations.map((c) => c.Mmax.M)))).toBe(true);
        expect(near(beam.envelope.Mmin.M, Math.min(...beam.combinations.map((c) => c.Mmin.M)))).toBe(true);
        expect(beam.combination(beam.envelope.Mmax.combination)!.Mmax.M).toBe(beam.envelope.Mmax.M);
      }),
    );
  });
});
