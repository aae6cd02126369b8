/**
 * Number formatting for results: a fixed number of significant figures (3 by default), no float
 * noise (5.999999 reads 6.00), no "-0", and powers of ten in steps of three for very large or
 * very small magnitudes (693×10⁶ mm⁴), as an engineer writes them.
 */
import { superscript } from './units';

export interface FormatOptions {
  significantFigures?: number;
}

export function formatNumber(value: number, options: FormatOptions = {}): string {
  const sig = clampSig(options.significantFigures);
  if (!Number.isFinite(value)) return value > 0 ? '∞' : value < 0 ? '-∞' : 'not a number';
  if (value === 0) return '0';
  let rounded = Number(value.toPrecision(sig));
  // 1.7976931348623157e308 rounds past the largest double: keep the value itself.
  if (!Number.isFinite(rounded)) rounded = value;
  if (rounded === 0) return '0';
  const exp = Math.floor(Math.log10(Math.abs(rounded)));
  if (exp >= 6 || exp < -3) {
    const eng = Math.floor(exp / 3) * 3;
    const mantissa = Number(`${rounded.toExponential(sig - 1)}`.replace(/e([+-]\d+)$/, (_m, e: string) => `e${Number(e) - eng}`));
    return `${fixed(mantissa, sig)}×10${superscript(eng)}`;
  }
  return fixed(rounded, sig);
}

function fixed(value: number, sig: number): string {
  const exp = Math.floor(Math.log10(Math.abs(Number(value.toPrecision(sig)))));
  const decimals = Math.max(0, sig - 1 - exp);
  return value.toFixed(Math.min(decimals, 20));
}

function clampSig(s: number | undefined): number {
  if (s === undefined || !Number.isFinite(s)) return 3;
  return Math.min(10, Math.max(1, Math.round(s)));
}

/** ASCII form of a formatted number (− → -, ×10ⁿ → e n), for plain-text outputs. */
export function asciiNumber(text: string): string {
  return text
    .replace(/−/g, '-')
    .replace(/×10([⁻⁰¹²³⁴⁵⁶⁷⁸⁹]+)/, (_m, p: string) => 'e' + p.replace(/[⁻⁰¹²³⁴⁵⁶⁷⁸⁹]/g, (c) => '-0123456789'['⁻⁰¹²³⁴⁵⁶⁷⁸⁹'.indexOf(c)]!));
}
