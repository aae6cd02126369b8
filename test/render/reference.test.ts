/**
 * Reference cases rendered as cards: the sheet must show the published (or closed-form) answer, to
 * the three significant figures it prints, in the hand-calculation row, the properties table and
 * the figure labels. Each case names its source (see shared/design/REFERENCES.md).
 */
import { describe, expect, it } from 'vitest';
import { matchSnapshot, outline, parseShown, readCards, renderWithResult } from './helpers';

/** Textbook answers are rounded: ±0.5 % (REFERENCES.md §6). */
function nearPublished(value: number, published: number, tolerance = 0.005): void {
  expect(Math.abs(value - published) / Math.abs(published), `${value} vs published ${published}`).toBeLessThanOrEqual(tolerance);
}

function lastStep(steps: string[]): string {
  return steps[steps.length - 1]!.replace(/^= /, '');
}

function quantityOf(text: string): { n: number; unit: string } {
  const [n, ...u] = text.split(' ');
  return { n: parseShown(n!), unit: u.join(' ') };
}

describe('shear flow and nail force, built-up plank beam', () => {
  // Beer, Johnston & DeWolf, Mechanics of Materials, Example 6.01 (4th ed. numbering):
  // q = 3704 N/m, force per nail 92.6 N with nails at 25 mm and V = 500 N.
  const note = [
    '```shear Nailed plank beam',
    'section B: three 20 x 100 mm planks',
    '  plate 100 mm x 20 mm',
    '  plate 20 mm x 100 mm',
    '  plate 100 mm x 20 mm',
    'V = 500 N',
    'q = flow(B, V, 120 mm)',
    'F = q * 25 mm',
    '```',
  ].join('\n');
  const { html, result } = renderWithResult(note);
  const rows = readCards(html)[0]!.rows;

  it('shows q = VQ/I with Q and I of the section put in, and the published q', () => {
    const q = rows.find((r) => r.line === 6)!;
    expect(q.steps[1]).toBe('= q(B, V, 120 mm)'.replace('q(B, V, 120 mm)', 'flow(B, V, 120 mm)'));
    expect(q.steps[2]).toBe('= V Q / I');
    expect(q.steps[3]).toBe('= 500 N × 120000 mm³ / 16.2×10⁶ mm⁴');
    const shown = quantityOf(lastStep(q.steps));
    expect(shown.unit).toBe('kN/m');
    nearPublished(shown.n * 1000, 3704);
    nearPublished(result.blocks[0]!.results[2]!.value!.kind === 'quantity' ? (result.blocks[0]!.results[2]!.value as { si: number }).si : NaN, 3704, 1e-3);
  });

  it('shows the published force per nail', () => {
    const f = rows.find((r) => r.line === 7)!;
    expect(lastStep(f.steps)).toBe('92.6 N');
  });

  it('marks the cut height on the section figure', () => {
    const q = rows.find((r) => r.line === 6)!;
    expect(q.figures).toBe(1);
    expect(q.html).toContain('>120 mm: 0.185 | 0.0370 MPa<');
  });
});

describe('T-beam, largest shear stress (US units)', () => {
  // Gere, Mechanics of Materials, 7th ed., Problem 5.10-13: tau_max = 2221 psi.
  const note = [
    '```shear T-beam',
    'section T: tee of two plates',
    '  plate 0.5 in x 6.2 in',
    '  plate 10 in x 0.8 in',
    'V = 5300 lbf',
    't = tau_max(T, V)',
    '```',
  ].join('\n');
  const { html, result } = renderWithResult(note);
  const row = readCards(html)[0]!.rows.find((r) => r.line === 5)!;

  it('matches the published value and says where it occurs', () => {
    const v = result.blocks[0]!.results[2]!.value as { si: number };
    nearPublished(v.si / 6894.757293168361, 2221);
    expect(lastStep(row.steps)).toBe('2.22 ksi');
    expect(row.notes[0]).toBe('Largest stress at the neutral axis, y = 5.62 in.');
  });
});

describe('T-section, stress on both sides of the web-flange junction', () => {
  // Mott, Applied Strength of Materials, Example 8.5: tau in the web at the junction 0.809 MPa
  // (with the book's rounded I; 0.808 MPa exact). The flange side, 0.154 MPa, is [C] in REFERENCES.md E2.
  const note = [
    '```shear Mott T',
    'section T: web 38 x 200, flange 200 x 50',
    '  plate 38 mm x 200 mm',
    '  plate 200 mm x 50 mm',
    'V = 5400 N',
    't_web = tau(T, V, 200 mm)',
    '```',
  ].join('\n');
  const { html, result } = renderWithResult(note);
  const row = readCards(html)[0]!.rows.find((r) => r.line === 5)!;

  it('shows the web value and the flange value of the jump', () => {
    const v = result.blocks[0]!.results[2]!.value as { si: number };
    nearPublished(v.si / 1e6, 0.809);
    expect(lastStep(row.steps)).toBe('0.808 MPa');
    expect(row.notes.join(' ')).toContain('τ = 0.808 MPa just below (t = 38.0 mm) and 0.154 MPa just above (t = 200 mm)');
  });

  it('labels the jump in the tau diagram with both sides', () => {
    expect(row.html).toContain('0.808 | 0.154 MPa');
  });

  it('matches its reviewed outline', () => {
    matchSnapshot('reference-mott-tee.txt', outline(readCards(html)));
  });
});

describe('shape factors tau_max/(V/A) shown in the section properties', () => {
  const cases: { name: string; source: string; parts: string[]; k: string; y: string }[] = [
    // Closed form: Q(NA) = b h²/8, I = b h³/12, t = b gives tau_max = 3V/(2A) at mid-depth (exact).
    { name: 'rectangle', source: 'closed form 3V/(2A)', parts: ['  plate 100 mm x 300 mm'], k: '1.50', y: '150 mm' },
    // Gere, Mechanics of Materials, 7th ed., Solution 5.9-1: tau_max = 4V/(3A) for a solid circle.
    { name: 'circle', source: 'Gere 7e Solution 5.9-1', parts: ['  circle 200 mm'], k: '1.33', y: '100 mm' },
    // Pytel & Singer, Strength of Materials, 4th ed., Prob. 573: 3V/(bh) = 1.5 V/A at mid-height, not at the centroid.
    { name: 'triangle', source: 'Pytel & Singer 4e Prob. 573', parts: ['  polygon (0, 0) (100, 0) (50, 150) mm'], k: '1.50', y: '75.0 mm' },
    // Pytel & Singer, Strength of Materials, 4th ed., Prob. 574: 9/8 V/A at h/8 from the neutral axis.
    { name: 'diamond', source: 'Pytel & Singer 4e Prob. 574', parts: ['  polygon (0, 100) (60, 0) (120, 100) (60, 200) mm'], k: '1.125', y: '75.0 mm' },
  ];
  for (const c of cases) {
    it(`${c.name} (${c.source})`, () => {
      const { html } = renderWithResult(['```shear', `section S: ${c.name}`, ...c.parts, '```'].join('\n'));
      const row = readCards(html)[0]!.rows[0]!;
      // Shown to 3 significant figures: the published factor must round to what is printed.
      const m = /^τmax = ([0-9.]+) V\/A at y = (.*)$/.exec(row.props['Peak shear stress']!)!;
      expect(Math.abs(Number(m[1]) - Number(c.k))).toBeLessThanOrEqual(0.0051);
      expect(m[2]).toBe(c.y);
      expect(row.html).toContain(`τmax ${m[1]} V/A`);
    });
  }
});

describe('two equal spans under uniform load', () => {
  // Hicks (ed.), Civil Engineering Formulas, Table 2.1: R = 3wL/8, 10wL/8, 3wL/8 and shear 5wL/8
  // either side of the middle support. w = 10 kN/m, L = 5 m: 18.75, 62.5, 18.75 kN; 31.25 kN.
  const note = ['```shear Two spans', 'beam B: 10 m', '  pin at 0 m', '  roller at 5 m', '  roller at 10 m', '  udl 10 kN/m', 'V = B.Vmax', '```'].join('\n');
  const { html } = renderWithResult(note);
  const rows = readCards(html)[0]!.rows;
  const beam = rows.find((r) => r.kind === 'beam')!;

  it('lists the reactions and the largest shear', () => {
    expect(beam.props['Largest shear Vmax']).toBe('31.3 kN');
    const cells = [...beam.html.matchAll(/<tr><td>([^<]*)<\/td><td>([^<]*)<\/td><\/tr>/g)].map((m) => [m[1], m[2]]);
    expect(cells).toEqual([
      ['0 m', '18.8 kN'],
      ['5.00 m', '62.5 kN'],
      ['10.0 m', '18.8 kN'],
    ]);
  });

  it('labels the support reactions and the shear either side of the middle support in the diagram', () => {
    expect(beam.figures).toBe(1);
    expect(beam.html).toContain('R = 62.5 kN');
    expect(beam.html).toContain('>31.3 kN<');
    expect(beam.html).toContain('>-31.3 kN<');
  });

  it('matches its reviewed outline', () => {
    matchSnapshot('reference-two-spans.txt', outline(readCards(html)));
  });
});
