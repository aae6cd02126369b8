import { describe, expect, it } from 'vitest';
import { DIM, lookupUnit, sameDimension, siUnitText } from '../../src/core/units';

// Conversion factors are definitions: 1 in = 0.0254 m and 1 lbf = 4.4482216152605 N exactly
// (NIST Special Publication 811, 2008 edition, Appendix B).
describe('unit catalogue', () => {
  it.each([
    ['kN', 1000, DIM.force],
    ['MPa', 1e6, DIM.stress],
    ['mm', 1e-3, DIM.length],
    ['in', 0.0254, DIM.length],
    ['ft', 0.3048, DIM.length],
    ['lbf', 4.4482216152605, DIM.force],
    ['kip', 4448.2216152605, DIM.force],
    ['psi', 4.4482216152605 / 0.0254 ** 2, DIM.stress],
    ['ksi', 4448.2216152605 / 0.0254 ** 2, DIM.stress],
    ['plf', 4.4482216152605 / 0.3048, DIM.lineLoad],
    ['klf', 4448.2216152605 / 0.3048, DIM.lineLoad],
    ['GPa', 1e9, DIM.stress],
  ])('%s', (name, factor, dim) => {
    const u = lookupUnit(name)!;
    expect(u.factor).toBeCloseTo(factor, 9);
    expect(u.factor / factor).toBeCloseTo(1, 12);
    expect(sameDimension(u.dim, dim)).toBe(true);
  });

  it('refuses names that are not engineering units or could reach the library', () => {
    for (const n of ['constructor', '__proto__', 'toString', 'import', 'evaluate', 'bit', 'b', 'Hz', 'foo', 'prototype']) {
      expect(lookupUnit(n)).toBeUndefined();
    }
  });

  it('names SI units of the JSON contract', () => {
    expect(siUnitText(DIM.force)).toBe('N');
    expect(siUnitText(DIM.quartic)).toBe('m^4');
    expect(siUnitText(DIM.lineLoad)).toBe('N/m');
  });
});
