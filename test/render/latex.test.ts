/**
 * Formulas: how names and expressions become LaTeX, and the KaTeX settings every formula is
 * rendered with (trust off, bounded expansion, errors as escaped text).
 */
import { describe, expect, it } from 'vitest';
import { extractBlocks } from '../../src/core/blocks';
import { parseBlock } from '../../src/core/statements';
import { exprLatex, formattedLatex, nameLatex } from '../../src/render/latex';
import { clearFormulaCache, KATEX_SETTINGS, renderFormula } from '../../src/render/math';

function exprOf(line: string) {
  const block = extractBlocks('```shear\n' + line + '\n```\n')[0]!;
  const st = parseBlock(block).statements[0]!;
  if (st.kind !== 'assign') throw new Error('not an assignment');
  return st.expr;
}

describe('names', () => {
  it.each([
    ['V', 'V'],
    ['t_max', 't_{\\mathrm{max}}'],
    ['tau_allow', '\\tau_{\\mathrm{allow}}'],
    ['f_v', 'f_{v}'],
    ['tau', '\\tau'],
    ['G2', 'G_{2}'],
    ['weld_capacity', '\\mathit{weld}_{\\mathrm{capacity}}'],
    ['a_b_c', '\\mathit{a\\_b\\_c}'],
  ])('%s → %s', (name, latex) => {
    expect(nameLatex(name)).toBe(latex);
  });

  it('keeps only letters, digits and underscores', () => {
    expect(nameLatex('x}\\href{javascript:alert(1)}{y')).not.toMatch(/[{}\\]href|javascript:/);
  });
});

describe('expressions', () => {
  const unit = (n: string) => ['mm', 'kN', 'm', 'MPa'].includes(n);
  it('writes division as a fraction and keeps written parentheses', () => {
    expect(exprLatex(exprOf('x = (a + b) / 2'), { substitute: false, system: 'SI' })).toBe('\\dfrac{a + b}{2}');
    expect(exprLatex(exprOf('x = (a + b) * 2'), { substitute: false, system: 'SI' })).toBe('\\left(a + b\\right) \\cdot 2');
  });
  it('reads a unit written after a number as part of the number', () => {
    expect(exprLatex(exprOf('w = 0.55 kN/mm'), { substitute: false, system: 'SI', isUnit: unit })).toBe('0.55\\,\\mathrm{kN}/\\mathrm{mm}');
  });
  it('names members and functions in the trade notation', () => {
    expect(exprLatex(exprOf('t = tau_max(G2, V) * G2.depth / B1.Vmax'), { substitute: false, system: 'SI' })).toBe(
      '\\dfrac{\\tau_{\\max}\\left(G_{2},\\,V\\right) \\cdot h_{\\mathrm{G2}}}{V_{\\max,\\mathrm{B1}}}',
    );
  });
  it('reads only its own symbol tables: members and calls named after prototype keys stay names', () => {
    for (const line of ['x = B.constructor', 'x = B.valueOf', 'x = toString(a)', 'x = B.__proto__']) {
      const latex = exprLatex(exprOf(line), { substitute: false, system: 'SI' });
      expect(latex, line).not.toMatch(/native code|function|\[object/);
    }
  });

  it('formats the core\'s number text', () => {
    expect(formattedLatex('692×10⁶ mm⁴')).toBe('692\\times 10^{6}\\,\\mathrm{mm^{4}}');
    expect(formattedLatex('63.7 kN/m')).toBe('63.7\\,\\mathrm{kN/m}');
    expect(formattedLatex('23.5 kip·ft')).toBe('23.5\\,\\mathrm{kip{\\cdot}ft}');
    expect(formattedLatex('1.2×10⁻³ m')).toBe('1.2\\times 10^{-3}\\,\\mathrm{m}');
  });
});

describe('KaTeX settings', () => {
  it('never trusts, bounds expansion and sizes, and does not throw', () => {
    expect(KATEX_SETTINGS.trust).toBe(false);
    expect(KATEX_SETTINGS.throwOnError).toBe(false);
    expect(KATEX_SETTINGS.maxExpand).toBeLessThanOrEqual(1000);
    expect(Number.isFinite(KATEX_SETTINGS.maxSize)).toBe(true);
    expect(KATEX_SETTINGS.strict).not.toBe('error');
  });

  const hostile = [
    '\\href{javascript:alert(1)}{x}',
    '\\url{https://example.invalid/}',
    '\\includegraphics{https://example.invalid/x.png}',
    '\\htmlData{onload=alert(1)}{x}',
    '\\htmlClass{x" onclick="alert(1)}{x}',
    '\\htmlStyle{background:url(https://example.invalid/)}{x}',
    '\\htmlId{x}{y}',
    '\\def\\a{\\a\\a}\\a',
    '\\def\\b{xxxxxxxxxx}\\edef\\c{\\b\\b\\b\\b\\b\\b\\b\\b}\\edef\\d{\\c\\c\\c\\c\\c\\c\\c\\c}\\edef\\e{\\d\\d\\d\\d\\d\\d\\d\\d}\\e',
    '\\rule{5000em}{5000em}',
    '</span><script>alert(1)</script>',
  ];
  it.each(hostile)('renders %s without links, script, handlers or runaway size', (latex) => {
    clearFormulaCache();
    const t0 = Date.now();
    const rendered = renderFormula(latex, latex);
    expect(Date.now() - t0).toBeLessThan(2000);
    // The accessible text is the one attribute carrying note text: escaped, so it cannot end early.
    const label = /aria-label="([^"]*)"/.exec(rendered)![1]!;
    expect(label).not.toMatch(/[<>"]/);
    const html = rendered.replace(/aria-label="[^"]*"/, '');
    expect(html).not.toMatch(/<a\s|href=|<script|\son[a-z]+="|<img|javascript:[^<"]*"/i);
    expect(html.length).toBeLessThan(20000);
    for (const tag of html.match(/<[^>]+>/g) ?? []) expect(tag).not.toMatch(/\son[a-z]+=|data-[a-z]+=/i);
  });
});
