/**
 * Outside checks of the section engine against published values. Each check names its source as
 * given in the project's reference list (shared design notes, REFERENCES.md): closed forms (§1) at
 * 1e-9, textbook worked examples (§2) at ±0.5 % (books round to 3 significant figures), and steel
 * tables (§3) with the fillet allowance explained where it is used.
 */
import { describe, expect, it } from 'vitest';
import {
  type Part,
  type Section,
  box,
  buildSection,
  channel,
  circle,
  isection,
  plate,
  polygon,
  tee,
  topOf,
  translate,
  tube,
} from '../../src/core/section';

const IN = 0.0254;
const LBF = 4.4482216152605;
const PSI = LBF / (IN * IN);
const MM = 1e-3;

function must<T>(r: { part?: T; problems: unknown[] }): T {
  if (!r.part) throw new Error(`shape refused: ${JSON.stringify(r.problems)}`);
  return r.part;
}

function section(...items: (Part | { part: Part; hole: true })[]): Section {
  const built = buildSection(items.map((it) => (Array.isArray(it) ? { part: it as Part, hole: false } : (it as { part: Part; hole: true }))));
  if (!built.section) throw new Error(`section refused: ${JSON.stringify(built.problems)}`);
  expect(built.problems).toEqual([]);
  return built.section;
}

/** Parts stacked bottom to top, each centred on x = 0, the way a note writes them without `at`. */
function stack(...parts: Part[]): Part[] {
  const placed: Part[] = [];
  for (const p of parts) placed.push(translate(p, 0, topOf(placed)));
  return placed;
}

function expectRel(actual: number, expected: number, tol: number) {
  expect(Number.isFinite(actual)).toBe(true);
  expect(Math.abs(actual - expected)).toBeLessThanOrEqual(tol * Math.abs(expected));
}

const TEXTBOOK = 0.005;
const EXACT = 1e-9;

describe('§1 closed-form shear-stress factors k = tau_max / (V/A)', () => {
  it('rectangle: parabolic profile, 3/2 V/A at the neutral axis, zero at the edges', () => {
    // Source: Beer, Johnston & DeWolf, Example 6.02 (REFERENCES E9) takes tau_max = 1.5 V/(bh) for a rectangle [R];
    // the profile is the closed form of REFERENCES §1 [C]; E15 rectangle values [C].
    const b = 0.1, h = 0.2, V = 10_000;
    const s = section(must(plate(b, h)));
    const A = b * h;
    const max = s.tauMax(V);
    expectRel(max.value, (1.5 * V) / A, EXACT);
    expect(max.locations).toHaveLength(1);
    expectRel(max.locations[0].y, h / 2, EXACT);
    for (const yFromNA of [-0.1, -0.075, -0.05, -0.025, 0, 0.025, 0.05, 0.075, 0.1]) {
      const expected = ((6 * V) / (b * h ** 3)) * (h ** 2 / 4 - yFromNA ** 2);
      const got = s.tau(V, h / 2 + yFromNA).value;
      expect(Math.abs(got - expected)).toBeLessThanOrEqual(EXACT * max.value);
    }
    expect(s.tau(V, 0).value).toBe(0);
    expect(s.tau(V, h).value).toBe(0);
    // E15 (REFERENCES §2, [C]): 100 x 200 mm, V = 10 kN: 0.750, 0.703, 0.5625, 0.328, 0 MPa at 0, 25, 50, 75, 100 mm from the NA.
    const printed = [0.75, 0.703, 0.5625, 0.328, 0];
    [0, 25, 50, 75, 100].forEach((mm, i) => {
      const mpa = s.tau(V, h / 2 + mm * MM).value / 1e6;
      expect(Math.abs(mpa - printed[i])).toBeLessThanOrEqual(0.0005 + 1e-12);
    });
  });

  it('solid circle: 4/3 V/A at the neutral axis', () => {
    // Source: REFERENCES §1 (Gere, Mechanics of Materials 7e, Solution 5.9-1 uses 4V/3A) [R].
    const s = section(must(circle(0.3)));
    const A = Math.PI * 0.15 ** 2;
    expectRel(s.area, A, EXACT);
    expectRel(s.I, (Math.PI * 0.15 ** 4) / 4, EXACT);
    const max = s.tauMax(1);
    expectRel(max.value * A, 4 / 3, EXACT);
    expect(max.locations.map((l) => l.y)).toEqual([expect.closeTo(0.15, 12)]);
  });

  it('thick tube: (4/3)(R² + Rr + r²)/(R² + r²), 1.9963 for R = 1, r = 0.9', () => {
    // Source: REFERENCES §1 thick-tube row: formula from memory (Gere §5.9), value 1.9963 [C].
    const s = section(must(tube(2, 0.1)));
    const R = 1, r = 0.9;
    const k = s.tauMax(1).value * s.area;
    expectRel(k, ((4 / 3) * (R * R + R * r + r * r)) / (R * R + r * r), EXACT);
    expect(k).toBeCloseTo(1.9963, 4);
  });

  it('thin tube approaches 2 V/A', () => {
    // Source: the thin-wall limit r -> R of the thick-tube formula (REFERENCES §1, Gere §5.9, from memory) is 2 [C];
    // E15 tube 6.366 MPa [C].
    const s = section(must(tube(2, 0.001)));
    const k = s.tauMax(1).value * s.area;
    const R = 1, r = 0.999;
    expectRel(k, ((4 / 3) * (R * R + R * r + r * r)) / (R * R + r * r), EXACT);
    expect(Math.abs(k - 2)).toBeLessThan(1e-3);
    // E15: mean radius 100 mm, t = 5 mm, V = 10 kN: thin-wall 2V/A = 6.366 MPa; the gross section differs by far less than 0.5 %.
    const e15 = section(must(tube(205 * MM, 5 * MM)));
    expectRel(e15.tauMax(10_000).value / 1e6, 6.366, TEXTBOOK);
  });

  it('isosceles triangle: 3/2 V/A at mid-height, 4/3 V/A at the centroid', () => {
    // Source: REFERENCES §1 triangle row (Pytel & Singer, Strength of Materials 4e, Prob. 573: 3V/bh at mid-altitude) [R];
    // centroid value and profile tau(y) = 12 V y (h − y)/(b h³) from the apex [C].
    const b = 0.3, h = 0.45, V = 1;
    const s = section(must(polygon([[0, 0], [b, 0], [b / 2, h]])));
    const A = (b * h) / 2;
    const max = s.tauMax(V);
    expectRel(max.value * A, 1.5, EXACT);
    expect(max.locations).toHaveLength(1);
    expectRel(max.locations[0].y, h / 2, 1e-8);
    expectRel(s.centroidY, h / 3, EXACT);
    expectRel(s.tau(V, h / 3).value * A, 4 / 3, EXACT);
    for (const fromApex of [0.05, 0.1, 0.2, 0.3, 0.4]) {
      expectRel(s.tau(V, h - fromApex).value, (12 * V * fromApex * (h - fromApex)) / (b * h ** 3), EXACT);
    }
  });

  it('diamond: 9/8 V/A at h/8 either side of the neutral axis, V/A at it', () => {
    // Source: REFERENCES §1 rhombus row (Pytel & Singer Prob. 574: maximum h/8 above and below the NA) [R]; 9/8 [M] and [C].
    const b = 0.2, h = 0.4;
    const s = section(must(polygon([[0, 0], [b / 2, h / 2], [0, h], [-b / 2, h / 2]])));
    const A = (b * h) / 2;
    const max = s.tauMax(1);
    expectRel(max.value * A, 9 / 8, EXACT);
    expect(max.locations).toHaveLength(2);
    expectRel(max.locations[0].y, h / 2 - h / 8, 1e-8);
    expectRel(max.locations[1].y, h / 2 + h / 8, 1e-8);
    expectRel(s.tau(1, h / 2).value * A, 1, EXACT);
  });

  it('thin square box approaches 9/4; the gross box matches its own closed form', () => {
    // Source: REFERENCES §1 thin-walled box row, square box k = 9/4, and E15 box 19.44 MPa [C, derived].
    const B = 1, t = 1e-4;
    const s = section(must(box(B, B, t)));
    const Q = (B * B * B) / 8 - ((B - 2 * t) * (B - 2 * t) ** 2) / 8;
    const I = (B ** 4 - (B - 2 * t) ** 4) / 12;
    expectRel(s.I, I, 1e-8);
    expectRel(s.tauMax(1).value, Q / (I * 2 * t), 1e-8);
    expect(Math.abs(s.tauMax(1).value * s.area - 9 / 4)).toBeLessThan(1e-3);
    // E15: centreline 200 x 300, t = 10 mm, V = 100 kN, thin-walled tau_max = 19.44 MPa; the gross section (210 x 310 outside) is within 1 % (REFERENCES §6).
    const e15 = section(must(box(210 * MM, 310 * MM, 10 * MM)));
    expectRel(e15.tauMax(100_000).value / 1e6, 19.44, 0.01);
  });

  it('I-section plate model: tau_max and the web value at the junction', () => {
    // Source: REFERENCES §1 I/W-shape row (standard three-plate formulas) [M], checked against AISC Qw [R+C].
    const d = 0.5, bf = 0.2, tf = 0.016, tw = 0.01, V = 250_000;
    const s = section(must(isection({ d, bf, tf, tw })));
    const I = (bf * d ** 3 - (bf - tw) * (d - 2 * tf) ** 3) / 12;
    expectRel(s.I, I, EXACT);
    const Qna = (bf * tf * (d - tf)) / 2 + (tw * (d / 2 - tf) ** 2) / 2;
    expectRel(s.tauMax(V).value, (V * Qna) / (I * tw), EXACT);
    const junction = s.tauSides(V, d - tf);
    expectRel(junction.below!, (V * bf * tf * (d - tf)) / (2 * I * tw), EXACT);
    expectRel(junction.above!, (V * bf * tf * (d - tf)) / (2 * I * bf), EXACT);
    expect(s.tau(V, d - tf).side).toBe('below');
  });
});

describe('§2 textbook worked examples', () => {
  it('E1: T-beam, tau_max = 2221 psi', () => {
    // Source: Gere, Mechanics of Materials 7th ed., Problem 5.10-13 (REFERENCES E1) [R+C].
    const s = section(must(tee({ d: 7 * IN, bf: 10 * IN, tf: 0.8 * IN, tw: 0.5 * IN })));
    const V = 5300 * LBF;
    expectRel((s.depth - s.centroidY) / IN, 1.377, TEXTBOOK);
    expectRel(s.centroidY / IN, 5.623, TEXTBOOK);
    expectRel(s.I / IN ** 4, 37.726, TEXTBOOK);
    expectRel(s.tauMax(V).value / PSI, 2221, TEXTBOOK);
    expectRel(s.tauMax(V).locations[0].y, s.centroidY, EXACT);
    // Extra [C]: at the web-flange junction Q = 7.820 in³, web 2197 psi, flange 109.9 psi.
    const j = s.tauSides(V, 6.2 * IN);
    expectRel(j.firstMoment / IN ** 3, 7.82, TEXTBOOK);
    expectRel(j.below! / PSI, 2197, TEXTBOOK);
    expectRel(j.above! / PSI, 109.9, TEXTBOOK);
  });

  it('E2: T-section built from two stacked plates, web side 0.808/0.809 MPa, flange side 0.154, NA 0.832', () => {
    // Source: Mott, Applied Strength of Materials, Example 8.5 (REFERENCES E2) [R+C].
    const s = section(...stack(must(plate(38 * MM, 200 * MM)), must(plate(200 * MM, 50 * MM))));
    const V = 5400;
    expectRel(s.centroidY / MM, 171, TEXTBOOK);
    expectRel(s.I / MM ** 4, 9.484e7, TEXTBOOK);
    expectRel(s.firstMoment(200 * MM).value / MM ** 3, 540_000, TEXTBOOK);
    const web = s.tau(V, 200 * MM);
    expect(web.side).toBe('below');
    expectRel(web.value / 1e6, 0.809, TEXTBOOK);
    expectRel(web.value / 1e6, 0.808, TEXTBOOK);
    expectRel(s.tauSides(V, 200 * MM).above! / 1e6, 0.154, TEXTBOOK);
    expectRel(s.tauMax(V).value / 1e6, 0.832, TEXTBOOK);
  });

  it('E3: nailed three-plank beam, q = 3704 N/m, 92.6 N per nail', () => {
    // Source: Beer, Johnston & DeWolf, Mechanics of Materials (4th ed. numbering), Example 6.01 (REFERENCES E3) [R+C].
    const s = section(...stack(must(plate(100 * MM, 20 * MM)), must(plate(20 * MM, 100 * MM)), must(plate(100 * MM, 20 * MM))));
    expectRel(s.I, 16.2e-6, TEXTBOOK);
    expectRel(s.firstMoment(120 * MM).value, 120e-6, TEXTBOOK);
    const q = s.shearFlow(500, 120 * MM).value;
    expectRel(q, 3704, TEXTBOOK);
    expectRel(q * 25 * MM, 92.6, TEXTBOOK);
    // The lower joint carries the same flow by symmetry.
    expectRel(s.shearFlow(500, 20 * MM).value, q, EXACT);
  });

  it('E4: glued beam, 725 kPa in the upper joint and 608 kPa in the lower', () => {
    // Source: Beer, Johnston & DeWolf, Sample Problem 6.1 (REFERENCES E4): inputs [R]; printed answers from memory [M];
    // recomputed 724/609 kPa with the exact I [C]. NA 0.812 MPa [C].
    const s = section(...stack(must(plate(60 * MM, 20 * MM)), must(plate(20 * MM, 80 * MM)), must(plate(100 * MM, 20 * MM))));
    const V = 1500;
    expectRel(s.centroidY / MM, 68.33, TEXTBOOK);
    expectRel(s.I, 8.63e-6, TEXTBOOK);
    expectRel(s.tau(V, 100 * MM).value / 1e3, 725, TEXTBOOK); // from memory
    expectRel(s.tau(V, 20 * MM).value / 1e3, 608, TEXTBOOK); // from memory
    expect(s.tau(V, 100 * MM).width).toBeCloseTo(20 * MM, 12);
    expectRel(s.tauMax(V).value / 1e6, 0.812, TEXTBOOK);
  });

  it('E5: nailed box beam, V_max = 10.7 kN from the nail capacity', () => {
    // Source: Gere, Mechanics of Materials 7th ed., Problem 5.11-4 (REFERENCES E5) [R+C].
    const s = section(must(plate(260 * MM, 310 * MM)), { part: translate(must(plate(160 * MM, 260 * MM)), 0, 25 * MM), hole: true });
    expectRel(s.I / MM ** 4, 411.125e6, EXACT);
    const Q = s.firstMoment(285 * MM).value;
    expectRel(Q / MM ** 3, 926.25e3, EXACT);
    const f = (2 * 1200) / (100 * MM);
    expectRel((f * s.I) / Q / 1e3, 10.7, TEXTBOOK);
  });

  it('E6: plywood-web box, nail spacing 2.77 in at 200 lb and 1.85 in at 300 lb (first moment of the flange part)', () => {
    // Source: Gere, Mechanics of Materials 7th ed., Problem 5.11-7 (REFERENCES E6) [R+C].
    const web = 0.1875 * IN, h = 8 * IN, inner = 3 * IN;
    const xWeb = (inner + web) / 2;
    const s = section(
      translate(must(plate(web, h)), -xWeb, 0),
      translate(must(plate(web, h)), xWeb, 0),
      translate(must(plate(inner, 0.75 * IN)), 0, 0),
      translate(must(plate(inner, 0.75 * IN)), 0, h - 0.75 * IN),
    );
    expectRel(s.I / IN ** 4, 75.3438, TEXTBOOK);
    const Qflange = s.parts()[3].firstMoment;
    expectRel(Qflange / IN ** 3, 8.1563, TEXTBOOK);
    const spacing = (V: number) => (2 * 30 * LBF * s.I) / (V * LBF * Qflange) / IN;
    expectRel(spacing(200), 2.77, TEXTBOOK);
    expectRel(spacing(300), 1.85, TEXTBOOK);
  });

  it('E7: welded plate girder, 1994 lb/in in each fillet weld', () => {
    // Source: Gere, Mechanics of Materials 7th ed., Problem 5.11-3 (REFERENCES E7) [R+C].
    const s = section(...stack(must(plate(20 * IN, 1 * IN)), must(plate((5 / 16) * IN, 60 * IN)), must(plate(20 * IN, 1 * IN))));
    expectRel(s.I / IN ** 4, 4.284e4, TEXTBOOK);
    expectRel(s.firstMoment(61 * IN).value / IN ** 3, 610, EXACT);
    const perWeld = s.shearFlow(280_000 * LBF, 61 * IN).value / 2;
    expectRel(perWeld / (LBF / IN), 1994, TEXTBOOK);
  });

  it('E8(a): I-section with bolted cover plates, bolt spacing 96.1 mm', () => {
    // Source: Hibbeler, Mechanics of Materials, Ch. 7 shear-flow problem (REFERENCES E8 a) [R+C].
    const s = section(...stack(must(plate(0.2, 0.02)), must(isection({ d: 0.3, bf: 0.2, tf: 0.01, tw: 0.01 })), must(plate(0.2, 0.02))));
    expectRel(s.I, 0.3075e-3, TEXTBOOK);
    expectRel(s.firstMoment(0.32).value, 0.64e-3, EXACT);
    const q = s.shearFlow(300_000, 0.32).value;
    expectRel((2 * 30_000) / q / MM, 96.1, TEXTBOOK);
  });

  it('E9 (6.02): timber rectangle 3.5 x 14.55 in, tau_max = 0.1325 ksi', () => {
    // Source: Beer, Johnston & DeWolf, Example 6.02 (REFERENCES E9) [R+C].
    const s = section(must(plate(3.5 * IN, 14.55 * IN)));
    expectRel(s.tauMax(4500 * LBF).value / (1000 * PSI), 0.1325, TEXTBOOK);
  });

  it('E11: channel, I_x = 0.243 x 10^6 mm^4', () => {
    // Source: Mott, Applied Strength of Materials, Example 7-10 (REFERENCES E11) [R+C].
    const s = section(must(channel({ d: 54 * MM, bf: 42 * MM, tf: 4 * MM, tw: 4 * MM })));
    expectRel(s.I / MM ** 4, (42 * 54 ** 3) / 12 - (38 * 46 ** 3) / 12, EXACT);
    expectRel(s.I / MM ** 4, 0.243e6, TEXTBOOK);
  });
});

/**
 * Rows of the AISC Shapes Database v16.0 (American Institute of Steel Construction; copied from the
 * project's reference subset): d, bf, tw, tf, kdes in inches; tabulated Ix in in⁴ and Qw in in³.
 */
const W_SHAPES: [name: string, d: number, bf: number, tw: number, tf: number, kdes: number, Ix: number, Qw: number][] = [
  ['W8X31', 8.0, 8.0, 0.285, 0.435, 0.829, 110, 15.0],
  ['W10X33', 9.73, 7.96, 0.29, 0.435, 0.935, 171, 18.9],
  ['W12X26', 12.2, 6.49, 0.23, 0.38, 0.68, 204, 18.3],
  ['W14X22', 13.7, 5.0, 0.23, 0.335, 0.735, 199, 16.1],
  ['W14X90', 14.0, 14.5, 0.44, 0.71, 1.31, 999, 77.1],
  ['W18X35', 17.7, 6.0, 0.3, 0.425, 0.827, 510, 32.7],
  ['W18X50', 18.0, 7.5, 0.355, 0.57, 0.972, 800, 49.9],
  ['W21X44', 20.7, 6.5, 0.35, 0.45, 0.95, 843, 46.8],
  ['W24X62', 23.7, 7.04, 0.43, 0.59, 1.09, 1550, 75.3],
  ['W24X68', 23.7, 8.97, 0.415, 0.585, 1.09, 1830, 87.0],
  ['W27X94', 26.9, 10.0, 0.49, 0.745, 1.34, 3270, 137],
  ['W30X99', 29.7, 10.5, 0.52, 0.67, 1.32, 3990, 154],
  ['W33X130', 33.1, 11.5, 0.58, 0.855, 1.56, 6710, 230],
  ['W36X150', 35.9, 12.0, 0.625, 0.94, 1.69, 9040, 287],
  ['W40X167', 38.6, 11.8, 0.65, 1.03, 2.21, 11600, 336],
  ['W44X335', 44.0, 15.9, 1.03, 1.77, 2.56, 31100, 805],
  ['W16X26', 15.7, 5.5, 0.25, 0.345, 0.747, 301, 21.6],
  ['W12X14', 11.9, 3.97, 0.2, 0.225, 0.525, 88.6, 8.49],
];

/** AISC Shapes Database v16.0 channel rows: d, bf, tw, tf (average), tabulated Ix (in⁴), Qw (in³). */
const C_SHAPES: [name: string, d: number, bf: number, tw: number, tf: number, Ix: number, Qw: number][] = [
  ['C15X50', 15.0, 3.72, 0.716, 0.65, 404, 34.1],
  ['C15X33.9', 15.0, 3.4, 0.4, 0.65, 315, 25.2],
  ['C12X30', 12.0, 3.17, 0.51, 0.501, 162, 16.8],
  ['C12X20.7', 12.0, 2.94, 0.282, 0.501, 129, 12.7],
  ['C10X30', 10.0, 3.03, 0.673, 0.436, 103, 13.3],
  ['C10X15.3', 10.0, 2.6, 0.24, 0.436, 67.3, 7.92],
  ['C8X11.5', 8.0, 2.26, 0.22, 0.39, 32.5, 4.79],
  ['C6X8.2', 6.0, 1.92, 0.2, 0.343, 13.1, 2.57],
  ['C4X5.4', 4.0, 1.58, 0.184, 0.296, 3.85, 1.13],
];

/** The plate-model error of Ix listed in REFERENCES §3.4 for the rows it tabulates [C]. */
const PLATE_ERROR_34: Record<string, number> = {
  W8X31: -1.55, W10X33: -2.63, W12X26: -1.45, W14X90: -1.6, W18X50: -1.08, W24X68: -1.77, W44X335: -0.98,
};

/** One unit in the last of 3 significant figures of a tabulated value. */
function lastDigit(value: number): number {
  return 10 ** (Math.floor(Math.log10(Math.abs(value))) - 2);
}

/** A rolled I-shape as one polygon with its four root fillets drawn as fine arcs (each arc a 32-segment chord line). */
function filletedI(d: number, bf: number, tf: number, tw: number, r: number): Part {
  const pts: [number, number][] = [];
  const arc = (cx: number, cy: number, a0: number, a1: number) => {
    for (let i = 0; i <= 32; i++) {
      const a = a0 + ((a1 - a0) * i) / 32;
      pts.push([cx + r * Math.cos(a), cy + r * Math.sin(a)]);
    }
  };
  const b = bf / 2, w = tw / 2;
  pts.push([-b, 0], [b, 0], [b, tf]);
  arc(w + r, tf + r, -Math.PI / 2, -Math.PI);
  arc(w + r, d - tf - r, Math.PI, Math.PI / 2);
  pts.push([b, d - tf], [b, d], [-b, d], [-b, d - tf]);
  arc(-w - r, d - tf - r, Math.PI / 2, 0);
  arc(-w - r, tf + r, 0, -Math.PI / 2);
  pts.push([-b, tf]);
  return must(polygon(pts));
}

describe('§3 rolled shapes', () => {
  it.each(W_SHAPES)('%s: plate-model I below the tabulated I by the fillet share; fillet model within 1 %; Q at mid-depth = Qw', (name, d, bf, tw, tf, kdes, Ix, Qw) => {
    // Source: AISC Shapes Database v16.0 (tabulated Ix includes the four root fillets; Qw is the plate-model first
    // moment at mid-depth). The three-plate model leaves out the fillets, which only add material, so its I is
    // lower: by 1–2.6 % for the rows REFERENCES §3.4 tabulates (checked to its printed 0.01 %), and by up to 3.5 %
    // for the light W14X22, whose root radius is large for its flanges [C]. With the fillets drawn in (r = kdes − tf,
    // REFERENCES §3.1) the model lands within 1 % of the table for every row (0.5 % for the §3.4 rows).
    const s = section(must(isection({ d: d * IN, bf: bf * IN, tf: tf * IN, tw: tw * IN })));
    const plateI = s.I / IN ** 4;
    const error = (plateI / Ix - 1) * 100;
    expect(error).toBeLessThan(0);
    expect(error).toBeGreaterThan(-3.6);
    if (name in PLATE_ERROR_34) {
      expect(Math.abs(error - PLATE_ERROR_34[name])).toBeLessThanOrEqual(0.01);
      expect(error).toBeGreaterThan(-3);
    }
    const filleted = section(filletedI(d * IN, bf * IN, tf * IN, tw * IN, (kdes - tf) * IN));
    const filletError = Math.abs(filleted.I / IN ** 4 / Ix - 1);
    expect(filletError).toBeLessThan(name in PLATE_ERROR_34 ? 0.005 : 0.01);
    // Qw to ±1 in the last printed digit (REFERENCES §6 tolerance for 3-figure tables).
    expect(Math.abs(s.firstMoment(s.depth / 2).value / IN ** 3 - Qw)).toBeLessThanOrEqual(lastDigit(Qw) + 1e-9);
  });

  it.each(C_SHAPES)('%s: plate-model channel I within 1 % of the table, Q at mid-depth = Qw', (_name, d, bf, tw, tf, Ix, Qw) => {
    // Source: AISC Shapes Database v16.0. The channels have sloped flanges (tf is their average) and root fillets; the
    // two effects nearly cancel in Ix: the plate model is within 1 % for these rows [C, computed here].
    const s = section(must(channel({ d: d * IN, bf: bf * IN, tf: tf * IN, tw: tw * IN })));
    expect(Math.abs(s.I / IN ** 4 / Ix - 1)).toBeLessThan(0.01);
    expect(Math.abs(s.firstMoment(s.depth / 2).value / IN ** 3 - Qw)).toBeLessThanOrEqual(lastDigit(Qw) + 1e-9);
  });

  it.each([
    // Source: SCI "Blue Book" P363 (REFERENCES §3.2): h, b, tw, tf, root radius r (mm), tabulated I (cm⁴); plate error from §3.4 [C].
    ['UB 305x165x40', 303.4, 165.0, 6.0, 10.2, 8.9, 8500, 0.03],
    ['UB 533x210x92', 533.1, 209.3, 10.1, 15.6, 12.7, 55200, 0.03],
    ['UC 305x305x97', 307.9, 305.3, 9.9, 15.4, 15.2, 22200, 0.03],
    // IPE/HE rows are from memory (EN 10365 tables, REFERENCES §3.3 [M]); their larger root radii allow 6 %.
    ['IPE 300 (from memory)', 300, 150, 7.1, 10.7, 15, 8356, 0.06],
    ['HEA 300 (from memory)', 290, 300, 8.5, 14, 27, 18260, 0.06],
  ] as const)('%s: plate model low within the stated band, fillet model within 0.5 %', (_name, h, b, tw, tf, r, Icm4, band) => {
    const s = section(must(isection({ d: h * MM, bf: b * MM, tf: tf * MM, tw: tw * MM })));
    const plateI = s.I / 1e-8;
    expect(plateI).toBeLessThan(Icm4);
    expect(plateI).toBeGreaterThan(Icm4 * (1 - band));
    const filleted = section(filletedI(h * MM, b * MM, tf * MM, tw * MM, r * MM));
    expectRel(filleted.I / 1e-8, Icm4, 0.005);
  });
});
