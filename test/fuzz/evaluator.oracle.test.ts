/**
 * The evaluator against outside oracles, written to kill the mutants StrykerJS found surviving in
 * src/core/evaluate.ts (see DEVELOPERS.md, mutation testing):
 * - random arithmetic with units (+ − × ÷, integer powers, unary minus, sqrt, abs, min, max, `to`)
 *   compared with mathjs's own evaluator, a general-purpose library used here only as an oracle;
 * - members and functions of a plate section and a simply supported beam under a uniform load,
 *   compared with their closed forms;
 * - every error path of the function table, by its stable code.
 */
import fc from 'fast-check';
import { all, create } from 'mathjs';
import { describe, expect, it } from 'vitest';
import { NoteError } from '../../src/core/diagnostic';
import { type EvalContext, evaluate } from '../../src/core/evaluate';
import { TokenCursor, tokenize } from '../../src/core/expression';
import { evaluateNote } from '../../src/core/note';
import { buildSection, plate } from '../../src/core/section';
import type { Quantity, SectionValue } from '../../src/core/values';
import { fuzzParameters, testTimeout } from './config';

// predictable: the square root of a negative number is NaN, as in the block language, not a complex number.
const math = create(all, { predictable: true });

/** Units both sides define identically (mathjs rounds kip, so it is left out). */
const UNITS = ['mm', 'cm', 'm', 'N', 'kN', 'MN', 'Pa', 'kPa', 'MPa', 'in', 'ft', 'lbf', 'psi'];

const magnitude = fc.oneof(fc.integer({ min: 0, max: 999 }).map(String), fc.double({ min: 0.001, max: 1000, noNaN: true }).map((x) => String(Number(x.toPrecision(6)))));
const leaf = fc.tuple(magnitude, fc.option(fc.constantFrom(...UNITS), { freq: 4 })).map(([n, u]) => (u ? `(${n} ${u})` : n));

const expression: fc.Arbitrary<string> = fc.letrec<{ e: string }>((tie) => ({
  e: fc.oneof(
    { depthSize: 'small', withCrossShrink: true },
    { weight: 4, arbitrary: leaf },
    { weight: 3, arbitrary: fc.tuple(tie('e'), fc.constantFrom('+', '-', '*', '/'), tie('e')).map(([a, op, b]) => `(${a} ${op} ${b})`) },
    { weight: 1, arbitrary: fc.tuple(tie('e'), fc.integer({ min: -3, max: 3 })).map(([a, k]) => `(${a})^${k}`) },
    { weight: 1, arbitrary: tie('e').map((a) => `-(${a})`) },
    { weight: 1, arbitrary: fc.tuple(fc.constantFrom('sqrt', 'abs'), tie('e')).map(([f, a]) => `${f}(${a})`) },
    { weight: 1, arbitrary: fc.tuple(fc.constantFrom('min', 'max'), fc.array(tie('e'), { minLength: 1, maxLength: 3 })).map(([f, as]) => `${f}(${as.join(', ')})`) },
  ),
})).e;

type Oracle = { ok: true; si: number; dim: number[] } | { ok: false } | { ok: 'unknown' };

function oracle(expr: string): Oracle {
  try {
    const r = math.evaluate(expr) as unknown;
    if (typeof r === 'number') return Number.isFinite(r) ? { ok: true, si: r, dim: [0, 0, 0, 0, 0, 0, 0, 0, 0] } : { ok: false };
    const u = r as { value?: unknown; dimensions?: number[] };
    if (typeof u.value === 'number' && Array.isArray(u.dimensions) && Number.isFinite(u.value)) return { ok: true, si: u.value, dim: u.dimensions };
    return { ok: false };
  } catch (e) {
    // mathjs keeps a ratio of units as a dimensionless unit that min/max cannot compare with a
    // plain number; that is a limit of the oracle, not an answer.
    return /unexpected type of argument/.test(String(e)) ? { ok: 'unknown' } : { ok: false };
  }
}

function ours(expr: string): { value?: Quantity; errors: string[] } {
  const r = evaluateNote(['```shear', `x = ${expr}`, '```', ''].join('\n'));
  const v = r.blocks[0]!.results[0]?.value;
  return { value: v?.kind === 'quantity' ? v : undefined, errors: r.diagnostics.filter((d) => d.severity === 'error').map((d) => d.code) };
}

const close = (a: number, b: number) => Math.abs(a - b) <= 1e-9 * Math.max(Math.abs(a), Math.abs(b)) + 1e-300;

describe('arithmetic with units against mathjs', () => {
  it('gives the value and dimension mathjs gives, or an error exactly where mathjs has no real, finite answer', () => {
    fc.assert(
      fc.property(expression, fc.option(fc.constantFrom(...UNITS), { freq: 3 }), (e, to) => {
        const expr = to ? `${e} to ${to}` : e;
        const want = oracle(expr);
        if (want.ok === 'unknown') return;
        const got = ours(expr);
        if (!want.ok) {
          expect(got.errors.length, `${expr}: mathjs has no answer, we gave ${got.value?.si}`).toBeGreaterThan(0);
          return;
        }
        expect(got.errors, expr).toEqual([]);
        expect(close(got.value!.si, want.si), `${expr}: ${got.value!.si} vs ${want.si}`).toBe(true);
        expect([...got.value!.dim].map((d) => d + 0), expr).toEqual(want.dim.map((d) => d + 0));
      }),
      fuzzParameters(400),
    );
  }, testTimeout());

  it('shows a value in the unit written after `to` and in each unit of a compound unit (kN/m, N·m)', () => {
    const shown = (line: string) => evaluateNote(['```shear', line, '```'].join('\n')).blocks[0]!.results[0]!.text;
    expect(shown('w = 12 kN / (2 m) to kN/m')).toBe('6.00 kN/m');
    expect(shown('M = 3 kN * 2 m to kN*m')).toBe('6.00 kN·m');
    expect(shown('u = kN')).toBe('1.00 kN');
    expect(shown('p = 2 * pi')).toBe('6.28');
  });
});

/**
 * A plate 200 mm wide and 400 mm tall, bottom at y = 0, centred on x = 150 mm; a 10 m simple span
 * under 12 kN/m (dead) and a 20 kN point load at 4 m (live), combined as 1.2 dead + 1.6 live.
 */
const CONTEXT = [
  'section S', '  plate 200 mm x 400 mm at 150 mm, 0 mm',
  'beam B: 10 m', '  pin at 0 m', '  roller at 10 m', '  dead: udl 12 kN/m', '  live: point 20 kN at 4 m', '  combine ULS = 1.2 dead + 1.6 live',
];

function valueOf(expr: string): number {
  const r = evaluateNote(['```shear', ...CONTEXT, `x = ${expr}`, '```', ''].join('\n'));
  const errs = r.diagnostics.filter((d) => d.severity === 'error');
  if (errs.length) throw new Error(`${expr}: ${errs.map((d) => d.message).join('; ')}`);
  const v = r.blocks[0]!.results.at(-1)!.value!;
  if (v.kind !== 'quantity') throw new Error(`${expr} is not a quantity`);
  return v.si;
}

function errorOf(expr: string): string[] {
  const r = evaluateNote(['```shear', ...CONTEXT, `x = ${expr}`, '```', ''].join('\n'));
  return r.diagnostics.filter((d) => d.severity === 'error' && d.line === CONTEXT.length + 1).map((d) => d.code);
}

describe('members and functions against closed forms', () => {
  const b = 0.2;
  const h = 0.4;
  it('section members of a rectangle: A = bh, I = bh³/12, Iy = hb³/12, Ixy = 0, yc = h/2, xc, depth (closed form)', () => {
    expect(valueOf('S.A')).toBeCloseTo(b * h, 12);
    expect(valueOf('S.I')).toBeCloseTo((b * h ** 3) / 12, 12);
    expect(valueOf('S.Iy')).toBeCloseTo((h * b ** 3) / 12, 12);
    expect(valueOf('S.Ixy')).toBeCloseTo(0, 12);
    expect(valueOf('S.yc')).toBeCloseTo(h / 2, 12);
    expect(valueOf('S.xc')).toBeCloseTo(0.15, 12);
    expect(valueOf('S.depth')).toBeCloseTo(h, 12);
  });

  it('readings of a rectangle: tau at the neutral axis = 1.5 V/A, Q = b(h/2)²/2, width = b, flow = VQ/I (closed form)', () => {
    const V = 30e3;
    const Q = (b * (h / 2) ** 2) / 2;
    const I = (b * h ** 3) / 12;
    expect(valueOf('tau(S, 30 kN, 200 mm)')).toBeCloseTo((1.5 * V) / (b * h), 6);
    expect(valueOf('tau_max(S, 30 kN)')).toBeCloseTo((1.5 * V) / (b * h), 6);
    expect(valueOf('tau_max_at(S)')).toBeCloseTo(h / 2, 12);
    expect(valueOf('Q(S, 200 mm)')).toBeCloseTo(Q, 12);
    expect(valueOf('width(S, 100 mm)')).toBeCloseTo(b, 12);
    expect(valueOf('width(S, 0 mm)')).toBeCloseTo(b, 12);
    expect(valueOf('flow(S, 30 kN, 200 mm)')).toBeCloseTo((V * Q) / I, 6);
  });

  it('a simple span: reactions, V(x), M(x), extremes and one combination (closed form, statics)', () => {
    // dead alone: R = wL/2 = 60 kN; live alone: R_left = P(L − a)/L = 12 kN, R_right = 8 kN.
    // ULS = 1.2 dead + 1.6 live: R_left = 72 + 19.2 = 91.2 kN, R_right = 72 + 12.8 = 84.8 kN.
    expect(valueOf('B.span')).toBe(10);
    expect(valueOf('reaction(B.ULS, 0 m)')).toBeCloseTo(91.2e3, 6);
    expect(valueOf('reaction(B.ULS, 10 m)')).toBeCloseTo(84.8e3, 6);
    expect(valueOf('B.ULS.Vmax')).toBeCloseTo(91.2e3, 6);
    expect(valueOf('B.Vmax')).toBeCloseTo(91.2e3, 6);
    // V just left and right of the point load at 4 m: 91.2 − 14.4·4 = 33.6 kN, then 33.6 − 32 = 1.6 kN.
    expect(valueOf('shear(B.ULS, 4 m, left)')).toBeCloseTo(33.6e3, 6);
    expect(valueOf('shear(B.ULS, 4 m, right)')).toBeCloseTo(1.6e3, 6);
    expect(valueOf('shear(B.ULS, 0 m)')).toBeCloseTo(91.2e3, 6);
    expect(valueOf('shear(B.ULS, 10 m)')).toBeCloseTo(-84.8e3, 6);
    // M(4) = 91.2·4 − 14.4·4²/2 = 249.6 kN·m; dead alone M(x) = w x (L − x)/2, at 5 m 150 kN·m.
    expect(valueOf('moment(B.ULS, 4 m)')).toBeCloseTo(249.6e3, 6);
    expect(valueOf('moment(B.dead, 5 m)')).toBeCloseTo(150e3, 6);
    // Largest M of ULS: V = 0 at x = 4 + 1.6/14.4; M = 249.6 + 1.6²/(2·14.4) = 249.689 kN·m. No hogging: Mmin = 0.
    expect(valueOf('B.ULS.Mmax')).toBeCloseTo(249.6e3 + 1.6e3 ** 2 / (2 * 14.4e3), 3);
    expect(valueOf('B.ULS.Mmin')).toBeCloseTo(0, 6);
    expect(valueOf('B.Mmin')).toBeCloseTo(0, 6);
  });

  it('sqrt, abs, min, max (closed form)', () => {
    expect(valueOf('sqrt(0 m^2)')).toBe(0);
    expect(valueOf('sqrt(9 m^2)')).toBeCloseTo(3, 15);
    expect(valueOf('abs(-3 kN)')).toBe(3000);
    expect(valueOf('min(3 m, 1 m, 2 m)')).toBe(1);
    expect(valueOf('max(3 m, 1 m, 2 m)')).toBe(3);
    expect(valueOf('max(2 m)')).toBe(2);
    expect(valueOf('5 m - 2 m')).toBe(3);
    expect(valueOf('-(2 m)')).toBe(-2);
    expect(valueOf('(2 m)^12')).toBe(4096);
    expect(valueOf('(4 m^2)^0.5')).toBe(2);
    expect(valueOf('(2 m)^-12')).toBe(2 ** -12);
    expect(valueOf('+(2 m)')).toBe(2);
    expect(valueOf(`max(${Array.from({ length: 120 }, (_v, i) => `${i} mm`).join(', ')})`)).toBeCloseTo(0.119, 15);
  });

  it('min and max keep the first of equal values, with the unit it was written in', () => {
    const shown = (line: string) => evaluateNote(['```shear', line, '```'].join('\n')).blocks[0]!.results[0]!.text;
    expect(shown('x = max(1 m, 1000 mm)')).toBe('1.00 m');
    expect(shown('x = min(1000 mm, 1 m)')).toBe('1000 mm');
  });

  it('width at a flange-web junction is the narrower side (a tee: 200 × 20 mm flange on a 10 × 180 mm web, closed form)', () => {
    const r = evaluateNote(['```shear', 'section T', '  plate 10 mm x 180 mm', '  plate 200 mm x 20 mm', 'w = width(T, 180 mm)', 'wf = width(T, 190 mm)', '```', ''].join('\n'));
    expect(r.diagnostics).toEqual([]);
    const [w, wf] = r.blocks[0]!.results.slice(1).map((x) => (x.value as Quantity).si);
    expect(w).toBeCloseTo(0.01, 12);
    expect(wf).toBeCloseTo(0.2, 12);
  });
});

describe('error paths of the function table, by code', () => {
  const cases: [string, string][] = [
    ['tau(S, 1 kN)', 'call.arguments'],
    ['tau(S, 1 kN, 1 mm, 1 mm)', 'call.arguments'],
    ['max()', 'call.arguments'],
    ['shear(B, 1 m, up)', 'name.undefined'],
    ['shear(B, 1 m, 2 m)', 'call.arguments'],
    ['shear(S, 1 m)', 'type.beam'],
    ['tau(B, 1 kN, 1 mm)', 'type.section'],
    ['tau(S, 1 m, 1 mm)', 'unit.argument'],
    ['tau(S, 1 kN, 1 kN)', 'unit.argument'],
    ['tau(S, 1 kN, 500 mm)', 'section.outside'],
    ['shear(B, 11 m)', 'beam.outside'],
    ['shear(B, -1 m)', 'beam.outside'],
    ['reaction(B, 5 m)', 'beam.no-support'],
    ['sqrt(-1 m^2)', 'value.negative-root'],
    ['max(1 m, 1 kN)', 'unit.mismatch'],
    ['1 m / 0', 'value.division-by-zero'],
    ['2 ^ (1 m)', 'unit.exponent'],
    ['(2 m)^0.25', 'unit.exponent'],
    ['(2 m)^13', 'unit.exponent'],
    ['(2 m)^-13', 'unit.exponent'],
    ['tau', 'name.function'],
    ['constructor(1)', 'name.function-unknown'],
    ['S.volume', 'member.unknown'],
    ['B.ULS.dead', 'member.unknown'],
    ['B.nothing', 'member.unknown'],
    ['(1 m).A', 'member.unknown'],
    ['5 kN + 3 mm', 'unit.mismatch'],
    ['5 kN - 3 mm', 'unit.mismatch'],
    ['2 m to kN', 'unit.mismatch'],
    ['-S', 'type.quantity'],
    ['tau(S, S, 1 mm)', 'unit.argument'],
  ];
  for (const [expr, code] of cases) {
    it(`${expr} → ${code}`, () => expect(errorOf(expr)).toEqual([code]));
  }

  it('messages name what was given and suggest the unit meant', () => {
    const message = (expr: string) => evaluateNote(['```shear', ...CONTEXT, `x = ${expr}`, '```', ''].join('\n')).diagnostics.find((d) => d.line === CONTEXT.length + 1)!.message;
    expect(message('sqrt(S)')).toBe('The value under sqrt must be a quantity, but the section S was given.');
    expect(message('abs(B)')).toBe('The value in abs must be a quantity, but the beam B was given.');
    expect(message('5 KN')).toBe('"KN" is not a unit this tool knows. Did you mean kN?');
    expect(message('5 kN + 3 mm')).toBe('Cannot add a length (mm) to a force (kN).');
    expect(message('5 kN - 3 mm')).toBe('Cannot subtract a length (mm) from a force (kN).');
    expect(message('tau(S, 1 kN)')).toBe('tau takes 3 arguments: tau(section, V, y).');
    expect(message('shear(B)')).toBe('shear takes 2 to 3 arguments: shear(beam, x[, left | right]).');
    expect(message('tau_max_at(S, S)')).toBe('tau_max_at takes 1 argument: tau_max_at(section).');
    expect(message('B.nothing')).toBe('A beam has Vmax, Mmax, Mmin, span and its load groups and combinations ULS, dead, live; "nothing" is not one of them.');
    expect(message('B.ULS.nothing')).toBe('A beam has Vmax, Mmax, Mmin, span; "nothing" is not one of them.');
  });

  it('the edges of a beam and x = 0 are inside it; a tolerance of a billionth of a millimetre is not outside', () => {
    expect(valueOf('shear(B, 0 m)')).toBeGreaterThan(0);
    expect(valueOf('shear(B, 10 m)')).toBeLessThan(0);
    expect(valueOf('moment(B, 10 m)')).toBeCloseTo(0, 6);
  });

  it('one mistake is one diagnostic: names that read a failed definition are quiet', () => {
    const r = evaluateNote(['```shear', 'a = 1 furlong', 'b = a * 2', 'c = b + a', 'check c <= 1 m', '```', ''].join('\n'));
    expect(r.diagnostics.map((d) => d.code)).toEqual(['unit.unknown']);
  });

  it('a member or call that yields a non-finite number is a diagnostic (an engine fault cannot become a result)', () => {
    const built = buildSection([{ part: plate(0.1, 0.2).part!, hole: false }]);
    const broken = Object.create(built.section!, { I: { value: Number.NaN }, tauMax: { value: () => ({ value: Infinity, perV: Infinity, locations: [] }) } }) as SectionValue['section'];
    const value: SectionValue = { kind: 'section', name: 'S', title: '', section: broken };
    const ctx: EvalContext = { lookup: (n) => (n === 'S' ? { value, line: 0, start: 0, end: 1, blockIndex: 0 } : undefined), line: 3, system: 'SI' };
    for (const src of ['S.I', 'tau_max(S, 1 kN)']) {
      const e = new TokenCursor(tokenize(src, 0, 3), 3).expression();
      let code = '';
      try {
        evaluate(e, ctx);
      } catch (err) {
        code = err instanceof NoteError ? err.code : 'other';
      }
      expect(code, src).toBe('value.not-finite');
    }
  });
});
