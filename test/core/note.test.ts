import { describe, expect, it } from 'vitest';
import { evaluateNote, NoteCache } from '../../src/core/note';

/** A note with one block holding `lines`. */
function note(...lines: string[]): string {
  return ['# Note', '', '```shear', ...lines, '```', ''].join('\n');
}
function values(text: string) {
  const r = evaluateNote(text);
  const out: Record<string, { si?: number; text?: string }> = {};
  for (const b of r.blocks) for (const s of b.results) if (s.name && s.value?.kind === 'quantity') out[s.name] = { si: s.value.si, text: s.text };
  return { out, r };
}
function errors(text: string) {
  return evaluateNote(text).diagnostics.filter((d) => d.severity === 'error');
}

describe('quantities with units', () => {
  it('keeps SI values and shows the unit written', () => {
    const { out } = values(note('V = 66.6 kN', 'L = 7.2 m', 'w = 2 * V / L'));
    expect(out.V).toEqual({ si: 66600, text: '66.6 kN' });
    expect(out.w!.si).toBeCloseTo(18500, 9);
    expect(out.w!.text).toBe('18.5 kN/m');
  });

  it('reads US customary units, in as inch, and fractions of an inch', () => {
    const { out, r } = values(note('units US', 't = 5/16 in', 'A = 20 in * 1 in', 'F = 3 kip', 'P = 300 lb'));
    expect(r.unitSystem).toBe('US');
    expect(out.t!.si).toBeCloseTo((5 / 16) * 0.0254, 15);
    expect(out.A!.text).toBe('20.0 in²');
    expect(out.F!.si).toBeCloseTo(3 * 4448.2216152605, 9);
    expect(out.P!.text).toBe('300 lb');
  });

  it('converts with `to` and rejects a conversion between kinds', () => {
    const { out } = values(note('V = 66.6 kN', 'Vk = V to kip'));
    expect(out.Vk!.text).toBe('15.0 kip');
    const e = errors(note('V = 66.6 kN to mm'));
    expect(e[0]!.message).toBe('Cannot show a force (kN) in mm, which measures a length (mm).');
  });

  it('words unit errors for an engineer', () => {
    const [e] = errors(note('x = 5 kN + 3 mm'));
    expect(e!.message).toBe('Cannot add a length (mm) to a force (kN).');
    expect(e!.code).toBe('unit.mismatch');
    expect([e!.line, e!.column, e!.endColumn]).toEqual([3, 4, 15]);
  });

  it('says which name is undefined, on its columns', () => {
    const [e] = errors(note('x = 2 * missing'));
    expect(e!.code).toBe('name.undefined');
    expect([e!.column, e!.endColumn]).toEqual([8, 15]);
  });

  it('recovers: one bad line is one diagnostic and the rest evaluates', () => {
    const { out, r } = values(note('a = 1 kN', 'b = = 2', 'c = a * 3', 'plate 1 mm x 2 mm', 'd = c + 1 kN'));
    expect(r.diagnostics.filter((d) => d.severity === 'error')).toHaveLength(2);
    expect(out.d!.si).toBe(4000);
  });

  it('lets names flow from earlier blocks to later ones, never backwards', () => {
    const text = ['```shear', 'b = a', '```', '```shear', 'a = 1 m', '```', '```shear', 'c = a * 2', '```'].join('\n');
    const { out, r } = values(text);
    expect(out.c!.si).toBe(2);
    expect(r.blocks[0]!.diagnostics[0]!.code).toBe('name.undefined');
  });

  it('has no float noise in results', () => {
    const { out } = values(note('x = 0.1 m + 0.2 m'));
    expect(out.x!.text).toBe('300 mm');
  });
});

describe('checks', () => {
  it('gives pass/fail and the utilisation ratio', () => {
    const r = evaluateNote(note('t = 80 MPa', 'check t <= 0.4 * 345 MPa', 'check t > 100 MPa'));
    const [a, b] = r.blocks[0]!.checks;
    expect(a!.pass).toBe(true);
    expect(a!.ratio).toBeCloseTo(80 / 138, 12);
    expect(b!.pass).toBe(false);
    expect(b!.ratio).toBeCloseTo(100 / 80, 12);
    const warn = r.diagnostics.find((d) => d.code === 'check.fails')!;
    expect(warn.severity).toBe('warning');
    expect(warn.message).toContain('utilisation 1.25');
  });

  it('refuses to compare different kinds', () => {
    expect(errors(note('check 1 kN <= 1 MPa'))[0]!.message).toBe('Cannot compare a force (kN) with a stress (MPa).');
  });
});

describe('untrusted notes', () => {
  it('has no way to reach the host: every escape attempt is a diagnostic', () => {
    const attempts = [
      'x = constructor',
      'x = __proto__',
      'x = import("fs")',
      'x = evaluate(1)',
      'x = parse(1)',
      'x = createUnit(1)',
      'x = (1 m).constructor',
      'x = toString',
      'x = "text"',
      'x = [1, 2]',
      'x = a => 1',
      'x = 1 m; y = 2',
      'x = cos(1)',
      'x = 10 ^ 400',
      'x = 1 / 0',
      '__proto__ = 1 m',
    ];
    for (const a of attempts) {
      const r = evaluateNote(note(a));
      const errs = r.diagnostics.filter((d) => d.severity === 'error');
      expect(errs.length, a).toBeGreaterThan(0);
      expect(({} as Record<string, unknown>).polluted).toBeUndefined();
    }
  });

  it('survives a 10,000-line block, bounded', () => {
    const lines = Array.from({ length: 10000 }, (_v, i) => (i % 7 === 3 ? `bad line ${i} )` : `v${i} = ${i} kN`));
    const started = Date.now();
    const r = evaluateNote(note(...lines));
    console.log(`10,000-line block evaluated in ${Date.now() - started} ms with ${r.diagnostics.length} diagnostics`);
    expect(r.blocks[0]!.results.length).toBeGreaterThan(8000);
  });

  it('bounds deep nesting and long lines', () => {
    expect(errors(note(`x = ${'('.repeat(100)}1${')'.repeat(100)}`))[0]!.code).toBe('syntax.too-deep');
    expect(errors(note(`x = ${'1 + '.repeat(2000)}1`))[0]!.code).toBe('syntax.too-long');
  });

  it('stops a block past its time budget with a diagnostic', () => {
    let t = 0;
    const r = evaluateNote(note('a = 1 m', 'b = 2 m', 'c = 3 m'), { now: () => (t += 1000), blockBudgetMs: 1500 });
    expect(r.diagnostics.some((d) => d.code === 'block.budget')).toBe(true);
  });
});

describe('incremental evaluation', () => {
  it('re-evaluates only the edited block and the blocks that read its names', () => {
    const block = (i: number, body: string) => ['```shear', body, '```', ''].join('\n');
    const make = (v: string) => [block(0, `a = ${v}`), block(1, 'b = 2 m'), block(2, 'c = a * 2'), block(3, 'd = b * 2')].join('\n');
    const cache = new NoteCache();
    expect(evaluateNote(make('1 m'), {}, cache).reused).toBe(0);
    const second = evaluateNote(make('5 m'), {}, cache);
    expect(second.reused).toBe(2);
    expect(second.blocks[2]!.results[0]!.text).toBe('10.0 m');
  });

  it('notices a name newly defined upstream that a block could not find before', () => {
    const cache = new NoteCache();
    const t1 = '```shear\nz = 1\n```\n```shear\nc = a * 2\n```\n';
    const t2 = '```shear\na = 1\n```\n```shear\nc = a * 2\n```\n';
    expect(evaluateNote(t1, {}, cache).diagnostics).toHaveLength(1);
    expect(evaluateNote(t2, {}, cache).diagnostics).toHaveLength(0);
  });
});

describe('incremental evaluation when blocks move', () => {
  it('keeps results of blocks that only moved down, with their lines shifted', () => {
    const cache = new NoteCache();
    const body = '```shear\na = 1 m\n```\n\n```shear\nb = a * 2\ncheck b <= 1 m\nc = oops\n```\n';
    const first = evaluateNote(body, {}, cache);
    const second = evaluateNote('Intro line\n\n' + body, {}, cache);
    expect(second.reused).toBe(2);
    const again = evaluateNote('Intro line\n\n' + body);
    const strip = (r: typeof first) => r.blocks.map((b) => ({ d: b.diagnostics, c: b.checks.map((c) => [c.line, c.pass]), n: [...b.defines].map(([k, v]) => [k, v.line]), s: b.results.map((x) => [x.statement.line, x.text]) }));
    expect(strip(second)).toEqual(strip(again));
    expect(second.blocks[1]!.checks[0]!.line).toBe(first.blocks[1]!.checks[0]!.line + 2);
  });
});
