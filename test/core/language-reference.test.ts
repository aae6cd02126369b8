/**
 * Published worked examples written as notes in the block language, end to end: the parser, the
 * placement rules, the section engine, the beam solver and the unit conversions all take part.
 * Tolerance: textbook answers are rounded to about 3 significant figures, so ±0.5 %.
 */
import { describe, expect, it } from 'vitest';
import { evaluateNote } from '../../src/core/note';

function run(...lines: string[]) {
  const r = evaluateNote(['```shear', ...lines, '```'].join('\n'));
  const errors = r.diagnostics.filter((d) => d.severity === 'error');
  expect(errors, JSON.stringify(errors)).toEqual([]);
  const v: Record<string, number> = {};
  for (const s of r.blocks[0]!.results) if (s.name && s.value?.kind === 'quantity') v[s.name] = s.value.si;
  return { v, r };
}
const close = (actual: number, expected: number, rel = 0.005) => expect(Math.abs(actual / expected - 1)).toBeLessThanOrEqual(rel);

const PSI = 4.4482216152605 / 0.0254 ** 2;

describe('worked examples as notes', () => {
  it('T-beam, max shear stress: Gere, Mechanics of Materials 7th ed., Problem 5.10-13 (2221 psi)', () => {
    const { v } = run('section T', '  plate 0.5 in x 6.2 in', '  plate 10 in x 0.8 in', 'V = 5300 lbf', 't = tau_max(T, V)', 'I = T.I', 'c2 = T.yc');
    close(v.t! / PSI, 2221);
    close(v.I! / 0.0254 ** 4, 37.726);
    close(v.c2! / 0.0254, 5.623);
  });

  it('T-section at the web-flange junction: Mott, Applied Strength of Materials, Example 8.5 (0.809 MPa web side)', () => {
    const { v } = run('section T', '  plate 38 mm x 200 mm', '  plate 200 mm x 50 mm', 'V = 5400 N', 'tw = tau(T, V, 200 mm)', 'ybar = T.yc');
    close(v.tw! / 1e6, 0.808);
    close(v.ybar! * 1000, 171.0);
  });

  it('nailed built-up beam: Beer, Johnston & DeWolf, Mechanics of Materials, Example 6.01 (q = 3704 N/m, 92.6 N per nail)', () => {
    const { v } = run(
      'section B',
      '  plate 100 mm x 20 mm',
      '  plate 20 mm x 100 mm',
      '  plate 100 mm x 20 mm',
      'V = 500 N',
      'q = flow(B, V, 120 mm)',
      'F = q * 25 mm',
    );
    close(v.q!, 3704);
    close(v.F!, 92.6);
  });

  it('wood box beam, V from nail capacity: Gere 7th ed., Problem 5.11-4 (10.7 kN)', () => {
    const { v } = run(
      'section box',
      '  plate 260 mm x 25 mm',
      '  plate 50 mm x 260 mm at -105 mm, 25 mm',
      '  plate 50 mm x 260 mm at 105 mm, 25 mm',
      '  plate 260 mm x 25 mm at 0 mm, 285 mm',
      'f = 2 * 1200 N / 100 mm',
      'Vmax = f * box.I / Q(box, 285 mm)',
    );
    close(v.Vmax!, 10.7e3);
  });

  it('welded plate girder, force per weld: Gere 7th ed., Problem 5.11-3 (1994 lb/in per weld)', () => {
    const { v } = run('units US', 'section G', '  plate 20 in x 1 in', '  plate 5/16 in x 60 in', '  plate 20 in x 1 in', 'F = flow(G, 280 kip, 61 in) / 2');
    close(v.F! / (4.4482216152605 / 0.0254), 1994);
  });

  it('continuous beam shear: Hicks, Civil Engineering Formulas, Table 2.1, two equal spans (Vmax = 5wL/8)', () => {
    const { v } = run('beam B: 10 m', '  pin at 0 m', '  roller at 5 m', '  roller at 10 m', '  udl 10 kN/m', 'V = B.Vmax', 'R = reaction(B, 5 m)', 'Vl = shear(B, 5 m, left)');
    close(v.V!, (5 / 8) * 10e3 * 5, 1e-9);
    close(v.R!, (10 / 8) * 10e3 * 5, 1e-9);
    close(v.Vl!, -(5 / 8) * 10e3 * 5, 1e-9);
  });

  it('rectangle: tau_max = 1.5 V/A at the neutral axis (closed form), circles placed by their centre', () => {
    const { v } = run('section R', '  plate 100 mm x 300 mm', 't = tau_max(R, 90 kN)', 'y = tau_max_at(R)', 'section C', '  circle 200 mm at 0 mm, 0 mm', 'yc = C.yc', 'tc = tau_max(C, 90 kN)');
    close(v.t!, (1.5 * 90e3) / 0.03, 1e-12);
    close(v.y!, 0.15, 1e-12);
    close(v.yc!, 0.1, 1e-12);
    close(v.tc!, ((4 / 3) * 90e3) / (Math.PI * 0.01), 1e-9);
  });
});
