import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { formatNumber } from '../../src/core/format';

describe('formatNumber', () => {
  it.each([
    [66600 / 1000, '66.6'],
    [5.999999, '6.00'],
    [0.1 + 0.2, '0.300'],
    [1234.5, '1230'],
    [-13.333, '-13.3'],
    [0, '0'],
    [-0, '0'],
    [693e6, '693×10⁶'],
    [0.000125, '125×10⁻⁶'],
    [0.0025, '0.00250'],
    [999.96, '1000'],
  ])('%s -> %s', (v, s) => expect(formatNumber(v)).toBe(s));

  it('honours the significant figures asked for', () => {
    expect(formatNumber(2221.4, { significantFigures: 4 })).toBe('2221');
    expect(formatNumber(0.27999, { significantFigures: 2 })).toBe('0.28');
  });

  it('property: the text reads back within half a unit of the last significant figure', () => {
    fc.assert(
      fc.property(fc.double({ min: -1e12, max: 1e12, noNaN: true }), (v) => {
        const s = formatNumber(v).replace(/×10([⁻⁰¹²³⁴⁵⁶⁷⁸⁹]+)/, (_m, p: string) => 'e' + p.replace(/[⁻⁰¹²³⁴⁵⁶⁷⁸⁹]/g, (c) => '-0123456789'['⁻⁰¹²³⁴⁵⁶⁷⁸⁹'.indexOf(c)]!));
        const back = Number(s);
        expect(Number.isFinite(back)).toBe(true);
        expect(Math.abs(back - v)).toBeLessThanOrEqual(Math.abs(v) * 5e-3 + 1e-300);
        expect(s).not.toMatch(/^-0$|e\+|NaN/);
      }),
      { numRuns: 500 },
    );
  });
});
