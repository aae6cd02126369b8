/**
 * Bad beams: every problem comes back as data with a stable code and a message in an engineer's
 * words; nothing throws; no result ever holds NaN or an infinity.
 */
import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { type BeamInput, type BeamProblemCode, type BeamSolution, BEAM_LIMITS, solveBeam } from '../../src/core/beam';

const simple = (extra: Partial<BeamInput<string>> = {}): BeamInput<string> => ({
  span: 10,
  supports: [
    { kind: 'pin', x: 0, tag: 'A' },
    { kind: 'roller', x: 10, tag: 'B' },
  ],
  loads: [{ kind: 'point', P: 1000, x: 5, tag: 'P1' }],
  ...extra,
});

/** Solves, and asserts the result is an error carrying `code` (and `tag` when given). */
function expectError(input: unknown, code: BeamProblemCode, tag?: string): BeamSolution<string> {
  const solution = solveBeam(input as BeamInput<string>);
  expect(solution.beam).toBeUndefined();
  const problem = solution.problems.find((p) => p.code === code);
  expect(problem, `expected ${code} among ${JSON.stringify(solution.problems)}`).toBeDefined();
  expect(problem!.severity).toBe('error');
  expect(problem!.message.length).toBeGreaterThan(20);
  if (tag !== undefined) expect(problem!.tag).toBe(tag);
  return solution;
}

function expectWarning(input: BeamInput<string>, code: BeamProblemCode): BeamSolution<string> {
  const solution = solveBeam(input);
  expect(solution.beam).toBeDefined();
  const problem = solution.problems.find((p) => p.code === code);
  expect(problem, `expected ${code} among ${JSON.stringify(solution.problems)}`).toBeDefined();
  expect(problem!.severity).toBe('warning');
  return solution;
}

describe('span', () => {
  it('zero, negative and missing spans are beam.span', () => {
    expectError(simple({ span: 0 }), 'beam.span');
    const negative = expectError(simple({ span: -4 }), 'beam.span');
    expect(negative.problems[0]!.message).toContain('-4 m');
    expectError({ supports: [], loads: [] }, 'beam.span');
  });
  it('NaN and infinite spans are beam.not-finite', () => {
    expectError(simple({ span: Number.NaN }), 'beam.not-finite');
    expectError(simple({ span: Infinity }), 'beam.not-finite');
  });
});

describe('positions', () => {
  it('a support off the beam is beam.outside, tagged', () => {
    const s = expectError(
      simple({ supports: [{ kind: 'pin', x: 0, tag: 'A' }, { kind: 'roller', x: 12, tag: 'B' }] }),
      'beam.outside',
      'B',
    );
    expect(s.problems[0]!.message).toMatch(/12 m .*off the beam.*0 to 10 m/);
  });
  it('loads off the beam, wholly or partly, are beam.outside', () => {
    expectError(simple({ loads: [{ kind: 'point', P: 1, x: -1, tag: 'L' }] }), 'beam.outside', 'L');
    expectError(simple({ loads: [{ kind: 'udl', w: 1, x1: 8, x2: 12, tag: 'L' }] }), 'beam.outside', 'L');
    expectError(simple({ loads: [{ kind: 'ramp', w1: 1, w2: 2, x1: -3, x2: 2, tag: 'L' }] }), 'beam.outside', 'L');
    expectError(simple({ loads: [{ kind: 'moment', M: 1, x: 10.5, tag: 'L' }] }), 'beam.outside', 'L');
  });
  it('a position a billionth of the span past an end is on the end', () => {
    const s = solveBeam(simple({ loads: [{ kind: 'point', P: 1000, x: 10 + 5e-9 }] }));
    expect(s.problems).toEqual([]);
    expect(s.beam!.combinations[0]!.reaction(10)!.R).toBe(1000);
  });
  it('a line load that ends before it starts, or has no length, is beam.load-extent', () => {
    const s = expectError(simple({ loads: [{ kind: 'udl', w: 1, x1: 6, x2: 2, tag: 'U' }] }), 'beam.load-extent', 'U');
    expect(s.problems[0]!.message).toContain('from 6 m to 2 m');
    expectError(simple({ loads: [{ kind: 'ramp', w1: 1, w2: 1, x1: 3, x2: 3, tag: 'U' }] }), 'beam.load-extent', 'U');
  });
  it('two supports at one position are beam.duplicate-support, also when a millionth of the span apart', () => {
    expectError(
      simple({ supports: [{ kind: 'pin', x: 4, tag: 'A' }, { kind: 'roller', x: 4, tag: 'B' }, { kind: 'roller', x: 8 }] }),
      'beam.duplicate-support',
    );
    expectError(
      simple({ supports: [{ kind: 'pin', x: 4 }, { kind: 'roller', x: 4 + 5e-6 }] }),
      'beam.duplicate-support',
    );
    // 20 µm apart on a 10 m beam is two supports.
    expect(solveBeam(simple({ supports: [{ kind: 'pin', x: 4 }, { kind: 'roller', x: 4 + 2e-5 }] })).beam).toBeDefined();
  });
});

describe('stability (vertical loads need two pin/roller supports or one fixed support)', () => {
  it('no support is beam.unstable', () => {
    const s = expectError(simple({ supports: [] }), 'beam.unstable');
    expect(s.problems[0]!.message).toMatch(/at least two pin or roller supports, or one fixed support/);
  });
  it('a single pin or a single roller is beam.unstable, tagged', () => {
    expectError(simple({ supports: [{ kind: 'pin', x: 5, tag: 'A' }] }), 'beam.unstable', 'A');
    expectError(simple({ supports: [{ kind: 'roller', x: 0, tag: 'R' }] }), 'beam.unstable', 'R');
  });
  it('one fixed support alone, or a fixed support with others, is stable', () => {
    expect(solveBeam(simple({ supports: [{ kind: 'fixed', x: 10 }] })).problems).toEqual([]);
    expect(solveBeam(simple({ supports: [{ kind: 'fixed', x: 0 }, { kind: 'roller', x: 3 }] })).problems).toEqual([]);
  });
  it('rollers only: solved, with a warning that nothing holds the beam horizontally', () => {
    const s = expectWarning(
      simple({ supports: [{ kind: 'roller', x: 0 }, { kind: 'roller', x: 10 }] }),
      'beam.no-horizontal-restraint',
    );
    expect(s.beam!.combinations[0]!.reactions.map((r) => r.R)).toEqual([500, 500]);
  });
});

describe('load groups and combinations', () => {
  const grouped = (combinations: BeamInput<string>['combinations']): BeamInput<string> =>
    simple({
      loads: [
        { kind: 'point', P: 1000, x: 5, group: 'dead' },
        { kind: 'udl', w: 200, x1: 0, x2: 10, group: 'live' },
      ],
      combinations,
    });
  it('a combination naming an unknown group is beam.unknown-group, tagged, listing the groups', () => {
    const s = expectError(
      grouped([{ name: 'ULS', factors: [{ group: 'dead', factor: 1.2 }, { group: 'liv', factor: 1.6 }], tag: 'line 9' }]),
      'beam.unknown-group',
      'line 9',
    );
    expect(s.problems[0]!.message).toContain('liv');
    expect(s.problems[0]!.message).toContain('dead, live');
  });
  it('two combinations with one name are beam.duplicate-combination', () => {
    expectError(
      grouped([
        { name: 'ULS', factors: [{ group: 'dead', factor: 1.2 }] },
        { name: 'ULS', factors: [{ group: 'live', factor: 1.6 }] },
      ]),
      'beam.duplicate-combination',
    );
  });
  it('a group named twice in one combination is a warning and its factors add', () => {
    const s = expectWarning(
      grouped([{ name: 'C', factors: [{ group: 'dead', factor: 1 }, { group: 'dead', factor: 0.5 }] }]),
      'beam.repeated-group',
    );
    expect(s.beam!.combinations[0]!.factors).toEqual([{ group: 'dead', factor: 1.5 }]);
    expect(s.beam!.combinations[0]!.reactions[0]!.R).toBeCloseTo(750, 9);
  });
  it('a group in no combination is a warning', () => {
    const s = expectWarning(grouped([{ name: 'D', factors: [{ group: 'dead', factor: 1 }] }]), 'beam.group-unused');
    expect(s.problems[0]!.message).toContain('live');
  });
  it('a non-finite factor is beam.not-finite', () => {
    expectError(grouped([{ name: 'C', factors: [{ group: 'dead', factor: Number.NaN }] }]), 'beam.not-finite');
  });
});

describe('malformed and non-finite input', () => {
  it('non-finite load values and positions are beam.not-finite, tagged', () => {
    expectError(simple({ loads: [{ kind: 'point', P: Number.NaN, x: 5, tag: 'L' }] }), 'beam.not-finite', 'L');
    expectError(simple({ loads: [{ kind: 'udl', w: Infinity, x1: 0, x2: 5, tag: 'L' }] }), 'beam.not-finite', 'L');
    expectError(simple({ loads: [{ kind: 'moment', M: 1, x: Number.NaN, tag: 'L' }] }), 'beam.not-finite', 'L');
    expectError(simple({ supports: [{ kind: 'pin', x: -Infinity, tag: 'S' }, { kind: 'roller', x: 10 }] }), 'beam.not-finite', 'S');
  });
  it('unknown kinds and missing fields are beam.invalid', () => {
    expectError(simple({ supports: [{ kind: 'hinge' as 'pin', x: 0, tag: 'S' }, { kind: 'roller', x: 10 }] }), 'beam.invalid', 'S');
    expectError(simple({ loads: [{ kind: 'wave', x: 1, tag: 'L' } as never] }), 'beam.invalid', 'L');
    expectError(simple({ loads: [{ kind: 'point', x: 1, tag: 'L' } as never] }), 'beam.invalid', 'L');
    expectError(simple({ loads: [{ kind: 'point', P: 1, x: 1, group: 7 } as never] }), 'beam.invalid');
    expectError(null, 'beam.invalid');
    expectError('beam', 'beam.invalid');
    expectError({ span: 10, supports: 'pin at 0', loads: [] }, 'beam.invalid');
    expectError(simple({ combinations: [{ name: '', factors: [] }] }), 'beam.invalid');
  });
  it('too many items is beam.too-large', () => {
    const loads = Array.from({ length: BEAM_LIMITS.loads + 1 }, () => ({ kind: 'point' as const, P: 1, x: 1 }));
    expectError(simple({ loads }), 'beam.too-large');
  });
  it('loads too large to add up are beam.not-finite, not NaN', () => {
    const loads = [
      { kind: 'point' as const, P: 1.7e308, x: 5 },
      { kind: 'point' as const, P: 1.7e308, x: 6 },
    ];
    expectError(simple({ loads }), 'beam.not-finite');
    expectError(simple({ loads: [{ kind: 'udl', w: 1e308, x1: 0, x2: 10 }] }), 'beam.not-finite');
  });
  it('every problem of a bad beam is reported at once', () => {
    const s = solveBeam(
      simple({
        supports: [{ kind: 'pin', x: 0 }, { kind: 'roller', x: 11 }],
        loads: [
          { kind: 'point', P: Number.NaN, x: 5 },
          { kind: 'udl', w: 1, x1: 4, x2: 2 },
        ],
      }),
    );
    expect(s.problems.map((p) => p.code).sort()).toEqual(['beam.load-extent', 'beam.not-finite', 'beam.outside']);
  });
});

/** Every number reachable in a result, including typed arrays and what the reading methods return. */
function allFinite(solution: BeamSolution): boolean {
  const seen = new Set<unknown>();
  const walk = (value: unknown): boolean => {
    if (typeof value === 'number') return Number.isFinite(value);
    if (value instanceof Float64Array) return value.every(Number.isFinite);
    if (typeof value !== 'object' || value === null || seen.has(value)) return true;
    seen.add(value);
    return Object.values(value).every(walk);
  };
  if (!walk(solution)) return false;
  const beam = solution.beam;
  if (!beam) return true;
  const readings: unknown[] = [beam.sample(20), beam.shear(beam.span / 3), beam.moment(beam.span / 3)];
  for (const c of [...beam.cases, ...beam.combinations]) readings.push(c.sample(20), c.shear(0), c.moment(beam.span));
  return readings.every(walk);
}

describe('robustness on arbitrary input', () => {
  it('never throws on any value at all', () => {
    fc.assert(
      fc.property(fc.anything(), (value) => {
        const s = solveBeam(value as BeamInput);
        expect(Array.isArray(s.problems)).toBe(true);
        expect(allFinite(s)).toBe(true);
      }),
    );
  });

  it('never throws and never yields NaN or infinity on well-shaped beams with any numbers', () => {
    const anyNumber = fc.oneof(
      fc.double(),
      fc.double({ min: -1e6, max: 1e6 }),
      fc.constantFrom(0, -0, 1e-320, 1e300, -1e300, Number.MAX_VALUE),
    );
    const load = fc.oneof(
      fc.record({ kind: fc.constant('point' as const), P: anyNumber, x: anyNumber }),
      fc.record({ kind: fc.constant('udl' as const), w: anyNumber, x1: anyNumber, x2: anyNumber }),
      fc.record({ kind: fc.constant('ramp' as const), w1: anyNumber, w2: anyNumber, x1: anyNumber, x2: anyNumber }),
      fc.record({ kind: fc.constant('moment' as const), M: anyNumber, x: anyNumber }),
    );
    const support = fc.record({ kind: fc.constantFrom('pin' as const, 'roller' as const, 'fixed' as const), x: anyNumber });
    fc.assert(
      fc.property(
        fc.record({
          span: anyNumber,
          supports: fc.array(support, { maxLength: 5 }),
          loads: fc.array(load, { maxLength: 6 }),
        }),
        (input) => {
          const s = solveBeam(input);
          expect(allFinite(s)).toBe(true);
          if (s.beam) expect(s.problems.every((p) => p.severity === 'warning')).toBe(true);
          else expect(s.problems.some((p) => p.severity === 'error')).toBe(true);
        },
      ),
      { numRuns: 300 },
    );
  });

  it('well-shaped beams with realistic numbers at arbitrary (unrounded) positions solve', () => {
    const fraction = fc.double({ min: 0, max: 1, noNaN: true });
    fc.assert(
      fc.property(
        fc.double({ min: 0.1, max: 100, noNaN: true }),
        fc.uniqueArray(fraction, { minLength: 2, maxLength: 6 }),
        fc.array(fc.tuple(fraction, fraction, fc.double({ min: -1e5, max: 1e5, noNaN: true })), { maxLength: 8 }),
        (span, supportAt, loads) => {
          const xs = [...new Set(supportAt.map((f) => f * span))].sort((a, b) => a - b);
          fc.pre(xs.length >= 2 && xs.every((x, i) => i === 0 || x - xs[i - 1]! > 1e-6 * span));
          const s = solveBeam({
            span,
            supports: xs.map((x) => ({ kind: 'roller' as const, x })),
            loads: loads.map(([a, b, w]) =>
              Math.abs(a - b) < 1e-3 ? { kind: 'point' as const, P: w, x: a * span } : { kind: 'ramp' as const, w1: w, w2: -w / 2, x1: Math.min(a, b) * span, x2: Math.max(a, b) * span },
            ),
          });
          expect(s.problems.filter((p) => p.severity === 'error')).toEqual([]);
          expect(allFinite(s)).toBe(true);
        },
      ),
      { numRuns: 300 },
    );
  });
});
