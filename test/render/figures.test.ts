/**
 * The SVG figures as an API of their own (the language server draws hover pictures with them):
 * sizes, escaping, colour modes, degenerate input, and the numbers in the labels.
 */
import { describe, expect, it } from 'vitest';
import { solveBeam } from '../../src/core/beam';
import { buildSection, circle, plate, translate } from '../../src/core/section';
import type { Section } from '../../src/core/section';
import { beamDiagrams, sectionFigure, sectionWithTau, sparkline, tauFigure } from '../../src/render/figures';
import { matchSnapshot } from './helpers';

function section(parts: { part: ReturnType<typeof plate>['part']; hole?: boolean }[]): Section {
  const built = buildSection(parts.map((p) => ({ part: p.part!, hole: !!p.hole })));
  if (!built.section) throw new Error(JSON.stringify(built.problems));
  return built.section;
}

/** Welded I-girder 250 × 16 flanges on a 10 × 520 web (metres), stacked bottom to top. */
const girder = section([
  { part: plate(0.25, 0.016).part },
  { part: translate(plate(0.01, 0.52).part!, 0, 0.016) },
  { part: translate(plate(0.25, 0.016).part!, 0, 0.536) },
]);

/** A 200 × 300 plate with a 60 mm bolt hole at mid-height. */
const holed = section([{ part: plate(0.2, 0.3).part }, { part: translate(circle(0.06).part!, 0, 0.15), hole: true }]);

function sizeOf(svg: string): { width: number; height: number } {
  const m = /^<svg [^>]*width="(\d+)" height="(\d+)" viewBox="0 0 (\d+) (\d+)"/.exec(svg);
  expect(m, svg.slice(0, 200)).not.toBeNull();
  expect(m![1]).toBe(m![3]);
  expect(m![2]).toBe(m![4]);
  return { width: Number(m![1]), height: Number(m![2]) };
}

function wellFormed(svg: string): void {
  expect(svg.startsWith('<svg ')).toBe(true);
  expect(svg.endsWith('</svg>')).toBe(true);
  expect(svg).not.toMatch(/NaN|Infinity|undefined/);
  // No element may repeat an attribute (an XML error when the SVG is used as an image).
  for (const tag of svg.match(/<[a-z]+ [^>]*>/g) ?? []) {
    const names = [...tag.matchAll(/\s([a-z-]+)="/g)].map((m) => m[1]);
    expect(new Set(names).size, tag).toBe(names.length);
  }
  for (const tag of svg.match(/<[^>]+>/g) ?? []) {
    expect(tag).not.toMatch(/^<\/?(script|foreignObject|iframe|a)\b|\son[a-z]+=|javascript:|href=/i);
  }
}

describe('section figures', () => {
  it('draws the section to scale with a size, a viewBox and labelled axes', () => {
    const svg = sectionFigure(girder, { system: 'SI' });
    wellFormed(svg);
    const { width, height } = sizeOf(svg);
    expect(height).toBeGreaterThan(200);
    expect(width).toBeLessThan(400);
    expect(svg).toContain('>552<');
    expect(svg).toContain('>276<');
    expect(svg).toContain('>250 mm<');
    expect(svg).toContain('class="tl-fig-na"');
  });

  it('draws a hole dashed and cuts it out of the material', () => {
    const svg = sectionFigure(holed);
    wellFormed(svg);
    expect(svg).toContain('fill-rule="evenodd"');
    expect(svg).toMatch(/<path class="tl-fig-edge" d="M[^"]*A[^"]*" fill="none" stroke="currentColor" stroke-width="1" stroke-dasharray="3 2"\/>/);
  });

  it('labels tau_max and both sides of each flange junction, with a force', () => {
    // V = 82.2 kN on the girder: tau_max 16.8 MPa, 12.7 | 0.509 MPa at the junctions (as in the demo note's card).
    const svg = sectionWithTau(girder, 82_200, { system: 'SI' });
    wellFormed(svg);
    expect(svg).toContain('>τmax 16.8 MPa<');
    expect(svg).toContain('>12.7 | 0.509 MPa<');
    expect(svg).toContain('>τ (MPa)<');
  });

  it('shows the shape in multiples of V/A without a force', () => {
    // Closed form for a rectangle: tau_max = 3V/(2A).
    const rect = section([{ part: plate(0.1, 0.3).part }]);
    const svg = tauFigure(rect, undefined);
    wellFormed(svg);
    expect(svg).toContain('>τmax 1.50 V/A<');
    expect(svg).toContain('>τ (× V/A)<');
  });

  it('marks heights the note asks about', () => {
    const svg = sectionWithTau(holed, 10_000, { marks: [{ y: 0.05, label: 'y_bolt' }] });
    expect(svg).toMatch(/>y_bolt: [0-9.]+ MPa</);
  });

  it('escapes titles and labels', () => {
    const svg = sectionWithTau(girder, 1000, { title: '<script>alert(1)</script>', marks: [{ y: 0.1, label: '<img src=x onerror=alert(1)>' }] });
    wellFormed(svg);
    expect(svg).toContain('<title>&lt;script&gt;alert(1)&lt;/script&gt;</title>');
    expect(svg).toContain('&lt;img src=x onerror=alert(1)&gt;');
  });

  it('bakes colours for light and dark images, and follows the text colour otherwise', () => {
    const light = sectionWithTau(girder, 1000, { colors: 'light' });
    const dark = sectionWithTau(girder, 1000, { colors: 'dark' });
    const auto = sectionWithTau(girder, 1000, { colors: 'currentColor' });
    expect(light).toContain('color="#1f2733"');
    expect(dark).toContain('color="#e2e6eb"');
    expect(light).not.toContain('currentColor');
    expect(dark).not.toContain('currentColor');
    expect(auto).toContain('stroke="currentColor"');
  });

  it('a sparkline is small, sized, and marks a height', () => {
    const svg = sparkline(girder, 1000, { mark: 0.536 });
    wellFormed(svg);
    expect(sizeOf(svg)).toEqual({ width: 96, height: 24 });
    expect(svg).toContain('class="tl-fig-mark"');
  });

  it('gives a placeholder, not an exception, for a section that cannot be drawn', () => {
    const fake = { ...girder, depth: 0, area: 0 } as unknown as Section;
    for (const svg of [sectionFigure(fake), tauFigure(fake, 1), sectionWithTau(fake, 1), sparkline(fake, 1)]) wellFormed(svg);
  });

  it('matches the reviewed drawing of the girder', () => {
    matchSnapshot('figure-girder-section-tau.svg', sectionWithTau(girder, 82_200, { colors: 'light', system: 'SI' }));
  });
});

describe('beam diagrams', () => {
  // Simple span under uniform load, R = wL/2 each end, V = ±wL/2, M_max = wL²/8 at mid-span
  // (closed form; every beam-diagram table gives it): w = 10 kN/m, L = 6 m: 30 kN, 45 kN·m.
  const simple = solveBeam({ span: 6, supports: [{ kind: 'pin', x: 0 }, { kind: 'roller', x: 6 }], loads: [{ kind: 'udl', w: 10_000, x1: 0, x2: 6 }] }).beam!;

  it('labels the reactions, the shear at the supports and the extremes', () => {
    const svg = beamDiagrams(simple, { system: 'SI' });
    wellFormed(svg);
    expect(svg).toContain('>R = 30.0 kN<');
    expect(svg).toContain('>30.0 kN<');
    expect(svg).toContain('>-30.0 kN<');
    expect(svg).toContain('>45.0 kN·m<');
    expect(svg).toContain('>V (kN)<');
    expect(svg).toContain('>x (m)<');
    expect(sizeOf(svg).width).toBe(640);
  });

  it('draws a cantilever with its fixed end and the end moment', () => {
    // Cantilever with a tip load: V = P, M at the support = -PL (closed form). P = 5 kN, L = 2 m.
    const cantilever = solveBeam({ span: 2, supports: [{ kind: 'fixed', x: 0 }], loads: [{ kind: 'point', P: 5000, x: 2 }] }).beam!;
    const svg = beamDiagrams(cantilever);
    wellFormed(svg);
    expect(svg).toContain('>-10.0 kN·m<');
    expect(svg).toContain('M = ');
  });

  it('draws the envelope of several combinations, or one by name', () => {
    const beam = solveBeam({
      span: 10,
      supports: [{ kind: 'pin', x: 0 }, { kind: 'roller', x: 5 }, { kind: 'roller', x: 10 }],
      loads: [
        { kind: 'udl', w: 2000, x1: 0, x2: 10, group: 'dead' },
        { kind: 'udl', w: 3000, x1: 0, x2: 5, group: 'live' },
      ],
      combinations: [
        { name: 'A', factors: [{ group: 'dead', factor: 1.35 }, { group: 'live', factor: 1.5 }] },
        { name: 'B', factors: [{ group: 'dead', factor: 1 }] },
      ],
    }).beam!;
    const envelope = beamDiagrams(beam, { width: 500 });
    wellFormed(envelope);
    expect(envelope).toContain('envelope of 2 combinations');
    const one = beamDiagrams(beam, { combination: 'B' });
    wellFormed(one);
    expect(one).toContain('(B)');
  });
});
