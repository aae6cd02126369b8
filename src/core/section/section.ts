/**
 * The cross-section engine: section properties, the material width t(y), the first moment Q(y)
 * and the elementary shear stress tau = V·Q/(I·t), all in closed form.
 *
 * The section is cut into horizontal slabs at every height where a polygon has a vertex or a
 * circle has its top, bottom or centre. Inside a slab the polygon material is a width that varies
 * linearly with height (for a counter-clockwise polygon the chord is the sum over the edges crossing
 * the height of +x for upward edges and -x for downward ones), plus whole circular chords
 * 2·sqrt(r² − v²). Every integral is then a polynomial (exact by Simpson's rule, which is exact up to
 * cubics) or a closed-form arcsine antiderivative.
 *
 * Heights are measured upward from the section's lowest point; x stays in the caller's frame.
 * Internally x is taken relative to the middle of the section's extent and y relative to its
 * bottom, so a section placed far from the origin gives the same I and tau.
 */
import {
  type Part,
  type Primitive,
  type SectionProblem,
  extentOf,
  formatLength,
  makeCircle,
  makePolygon,
  polygonArea,
  problem,
} from './primitives';
import { brent, cubicRootsInUnit } from './roots';
import { validateLayout } from './overlap';

export interface SectionInput {
  part: Part;
  /** A hole subtracts the part's material from the parts it lies in. */
  hole: boolean;
  /** Handed back on every problem about this part (e.g. its source line). */
  tag?: unknown;
}

export interface BuildResult {
  /** Present unless an error-severity problem was found. */
  section?: Section;
  /** Errors (no section) and warnings (the section is usable but the engineer should look). */
  problems: SectionProblem[];
}

/** A value at a height, or the problem that prevents it (then value is 0). */
export interface Reading {
  value: number;
  problem?: SectionProblem;
}

export interface WidthReading {
  /** Material width just below the height, and just above it; equal where the width is continuous. */
  below: number;
  above: number;
  problem?: SectionProblem;
}

export interface TauReading {
  /** tau on the governing (narrower, non-zero) side, in V's unit per m². */
  value: number;
  /** The width used. */
  width: number;
  firstMoment: number;
  side: 'below' | 'above' | 'both';
  problem?: SectionProblem;
}

export interface TauSides {
  /** tau just below and just above the height; absent on a side without material. */
  below?: number;
  above?: number;
  widthBelow: number;
  widthAbove: number;
  firstMoment: number;
  problem?: SectionProblem;
}

export interface TauMaxLocation {
  y: number;
  width: number;
  firstMoment: number;
}

export interface TauMaxResult {
  /** The largest tau over the depth (with the sign of V), 0 when a problem prevents it. */
  value: number;
  /** The same per unit V: max of Q/(I·t), in 1/m². */
  perV: number;
  /** Every height where the maximum is reached (a diamond has two). */
  locations: TauMaxLocation[];
  problem?: SectionProblem;
}

export interface TauProfile {
  /** Heights, ascending; a height where the width jumps appears twice (below, then above). */
  y: Float64Array;
  /** tau for V = 1 (1/m²); 0 where there is no material. */
  tauPerV: Float64Array;
  width: Float64Array;
}

export interface Breakpoint {
  y: number;
  widthBelow: number;
  widthAbove: number;
  firstMoment: number;
}

export interface OutlineItem {
  sign: 1 | -1;
  /** In the section's frame: caller's x, y from the section's lowest point. */
  shape: Primitive;
  /** Index of the part in the list given to buildSection. */
  part: number;
  tag?: unknown;
}

export interface PartSummary {
  index: number;
  tag?: unknown;
  hole: boolean;
  /** Area of the part's own material (positive also for a hole: the area it removes). */
  area: number;
  /** Height of the part's centroid, and of its bottom and top, from the section's lowest point. */
  centroidY: number;
  bottom: number;
  top: number;
  /** area·(centroidY − yc): the first moment about the neutral axis of the material this part adds (or, for a hole, removes); what a fastener holding this part on carries with q = V·Q/I. */
  firstMoment: number;
}

export interface Section {
  readonly area: number;
  /** Centroid x in the caller's frame. */
  readonly centroidX: number;
  /** Centroid height yc above the lowest point: the neutral axis for bending about the horizontal axis. */
  readonly centroidY: number;
  /** Second moment of area about the horizontal centroidal axis. */
  readonly I: number;
  /** Second moment about the vertical centroidal axis. */
  readonly Iy: number;
  /** Product of area about the centroidal axes. */
  readonly Ixy: number;
  readonly depth: number;
  readonly width: number;
  /** y of the lowest point in the caller's frame (heights are measured from here). */
  readonly bottom: number;
  /** x of the leftmost point in the caller's frame. */
  readonly left: number;
  /** Warnings found when building (the section is usable). */
  readonly problems: readonly SectionProblem[];
  outline(): OutlineItem[];
  parts(): PartSummary[];
  heightProblem(y: number): SectionProblem | undefined;
  widthAt(y: number): WidthReading;
  firstMoment(y: number): Reading;
  shearFlow(V: number, y: number): Reading;
  tau(V: number, y: number): TauReading;
  tauSides(V: number, y: number): TauSides;
  tauMax(V: number): TauMaxResult;
  profile(n?: number): TauProfile;
  breakpoints(): Breakpoint[];
}

/** Heights closer than this fraction of the depth are one height (rounding in stacked dimensions). */
const HEIGHT_MERGE = 1e-11;
/**
 * A queried height within this fraction of the depth of a breakpoint or an edge is taken to be on it,
 * so a height typed in other units (a junction at 6.2 in) lands on the junction the geometry has
 * (one rounding away) and reads its governing side.
 */
const HEIGHT_SNAP = HEIGHT_MERGE;
/** Widths below this fraction of the widest chord are no material (cancellation noise). */
const WIDTH_ZERO = 1e-10;
/**
 * Candidate maxima within this relative distance of the largest are reported as ties (a diamond's
 * two peaks). It must be far below the fall-off of a parabolic peak a hair away from its top, which
 * is how a breakpoint next to the neutral axis looks.
 */
const TIE = 1e-12;
/** Tied candidates closer than this fraction of the depth are one location. */
const SAME_LOCATION = 1e-7;
/** Sub-intervals used to bracket the roots of d(Q/t)/dy on slabs that contain circular arcs. */
const ARC_BRACKETS = 32;
/** The smallest double with full precision; below it (subnormal numbers) digits are lost. */
const SMALLEST_NORMAL = 2 ** -1022;

export function buildSection(inputs: readonly SectionInput[]): BuildResult {
  try {
    return build(inputs);
  } catch (err) {
    // Nothing below is expected to throw; this keeps the promise that bad input never escapes as an exception.
    return { problems: [problem('section.check-incomplete', `The section could not be built: ${err instanceof Error ? err.message : String(err)}.`)] };
  }
}

interface Flat {
  sign: 1 | -1;
  shape: Primitive;
  part: number;
}

function build(inputs: readonly SectionInput[]): BuildResult {
  if (!Array.isArray(inputs) || inputs.length === 0) {
    return { problems: [problem('section.empty', 'The section has no parts.')] };
  }
  const problems: SectionProblem[] = [];
  const cleaned: SectionInput[] = [];
  inputs.forEach((input) => {
    const tag = input?.tag;
    if (!input || !Array.isArray(input.part) || input.part.length === 0) {
      problems.push(problem('section.zero-area', 'This part has no material.', tag));
      return;
    }
    const part: { sign: 1 | -1; shape: Primitive }[] = [];
    for (const item of input.part) {
      const s = item?.shape;
      const sign = item?.sign === -1 ? -1 : 1;
      if (s?.kind === 'polygon') {
        const made = makePolygon(s.xs, s.ys, tag);
        if (made.polygon) part.push({ sign, shape: made.polygon });
        problems.push(...made.problems);
      } else if (s?.kind === 'circle') {
        const made = makeCircle(s.cx, s.cy, s.r, tag);
        if (made.circle) part.push({ sign, shape: made.circle });
        problems.push(...made.problems);
      } else {
        problems.push(problem('section.zero-area', 'A part contains something that is neither a polygon nor a circle.', tag));
      }
    }
    cleaned.push({ part, hole: !!input.hole, tag });
  });
  if (problems.length) return { problems };

  const areas = cleaned.map((c) => c.part.reduce((a, p) => a + p.sign * primitiveArea(p.shape), 0));
  cleaned.forEach((c, i) => {
    if (!(areas[i] > 0)) problems.push(problem('section.zero-area', 'This part has no net area: its voids remove all of its material.', c.tag));
  });
  if (!cleaned.some((c) => !c.hole)) problems.push(problem('section.empty', 'The section has only holes and no solid parts.'));
  if (problems.length) return { problems };

  const layout = validateLayout(cleaned, areas);
  if (layout.some((p) => p.severity === 'error')) return { problems: layout };

  const flat: Flat[] = [];
  cleaned.forEach((c, i) => {
    for (const p of c.part) flat.push({ sign: (c.hole ? -p.sign : p.sign) as 1 | -1, shape: p.shape, part: i });
  });
  const netArea = areas.reduce((a, x, i) => a + (cleaned[i].hole ? -x : x), 0);
  const solidArea = areas.reduce((a, x, i) => a + (cleaned[i].hole ? 0 : x), 0);
  if (!(netArea > 1e-12 * solidArea)) {
    return { problems: [...layout, problem('section.zero-area', 'The holes remove all of the material: the section has no area.')] };
  }
  const section = new ShearSection(flat, cleaned);
  // Finite dimensions can still overflow (parts 1e300 m apart) or underflow (I of a 1e-100 m plate) in the
  // properties; no section is handed out whose area, centroid or second moments are not usable numbers.
  const properties = [section.area, section.centroidX, section.centroidY, section.I, section.Iy, section.Ixy, section.depth, section.width];
  if (!properties.every(Number.isFinite)) {
    return {
      problems: [
        ...layout,
        problem('section.not-finite', 'This section is too large to compute: its area, centroid or second moments of area exceed the largest number that can be represented. Check the dimensions, their units and how far apart the parts are placed.'),
      ],
    };
  }
  // Below the smallest normal double, floats keep too few digits (a 1e-80 m plate's I came out 0.2 % off).
  if (!(section.area >= SMALLEST_NORMAL) || !(section.I >= SMALLEST_NORMAL)) {
    return {
      problems: [
        ...layout,
        problem('section.not-finite', 'This section is too small to compute: its area or second moment of area is below the smallest number that can be represented to full precision. Check the dimensions and their units.'),
      ],
    };
  }
  return { section, problems: [...layout, ...section.problems] };
}

/** The problem for a tau, shear flow or tau_max that is finite in truth but too large for a double. */
function tooLarge(): SectionProblem {
  return problem('section.not-finite', "The result is too large to represent. Check the shear force, the section's dimensions and their units.");
}

/**
 * V·Q/(I·t), with t = 1 for shear flow. The products can overflow, or lose digits below the
 * smallest normal double, while the quotient itself is representable, so the quotients are taken
 * first in that case; the caller turns a result that is still not finite into a problem.
 */
function shearRatio(V: number, Q: number, I: number, t: number): number {
  const force = V * Q, stiffness = I * t;
  const direct = force / stiffness;
  const safe = Number.isFinite(direct) && stiffness >= SMALLEST_NORMAL && (force === 0 || Math.abs(force) >= SMALLEST_NORMAL);
  return safe ? direct : V * (Q / I / t);
}

function primitiveArea(s: Primitive): number {
  return s.kind === 'circle' ? Math.PI * s.r * s.r : polygonArea(s.xs, s.ys);
}

/**
 * Antiderivatives over a circle of radius r of chord(v)·v^k, chord = 2·sqrt(r² − v²), for k = 0, 1, 2.
 * asin(v/r) is taken as atan2(v, sqrt(r² − v²)) with the same square root as the algebraic term:
 * near the ends of the circle the two terms then cancel consistently, where asin(v/r) would turn
 * the rounding of v/r into errors of order sqrt(machine epsilon).
 */
function arc0(v: number, r: number): number {
  const root = Math.sqrt(Math.max(0, (r - v) * (r + v)));
  return v * root + r * r * Math.atan2(v, root);
}
function arc1(v: number, r: number): number {
  const s = Math.max(0, (r - v) * (r + v));
  return (-2 / 3) * s * Math.sqrt(s);
}
function arc2(v: number, r: number): number {
  const root = Math.sqrt(Math.max(0, (r - v) * (r + v)));
  return (v * (2 * v * v - r * r) * root) / 4 + ((r * r * r * r) / 4) * Math.atan2(v, root);
}

class ShearSection implements Section {
  readonly area: number;
  readonly centroidX: number;
  readonly centroidY: number;
  readonly I: number;
  readonly Iy: number;
  readonly Ixy: number;
  readonly depth: number;
  readonly width: number;
  readonly bottom: number;
  readonly left: number;
  readonly problems: SectionProblem[] = [];

  /** Slab boundaries, ascending, H[0] = 0, H[n] = depth. */
  private readonly H: Float64Array;
  /** Polygon width at the bottom and top of each slab. */
  private readonly wb: Float64Array;
  private readonly wt: Float64Array;
  /** Circles crossing each slab: indices circleAt[circleStart[k] .. circleStart[k+1]) into circleData (sign, cy, r). */
  private readonly circleStart: Int32Array;
  private readonly circleAt: Int32Array;
  private readonly circleData: Float64Array;
  /** Heights where a circle starts or ends (the width's slope is unbounded there). */
  private readonly circleEnd: Uint8Array;
  /** Q at each boundary accumulated from the top, and from the bottom. */
  private readonly Qtop: Float64Array;
  private readonly Qbot: Float64Array;
  private readonly widthZero: number;
  private readonly pinches: number[] = [];
  private readonly xRef: number;
  private readonly flat: Flat[];
  private readonly inputs: SectionInput[];
  private maxCache?: { perV: number; locations: TauMaxLocation[]; problem?: SectionProblem };
  private breakCache?: Breakpoint[];

  constructor(flat: Flat[], inputs: SectionInput[]) {
    this.flat = flat;
    this.inputs = inputs;
    const { minX, maxX, minY } = extentOf(flat, true);
    this.bottom = minY;
    this.left = minX;
    this.width = maxX - minX;
    this.xRef = (minX + maxX) / 2;
    const xRef = this.xRef;

    // Primitives in the working frame: x from the middle of the extent, y from the bottom.
    type Poly = { sign: number; xs: Float64Array; ys: Float64Array };
    type Circ = { sign: number; cx: number; cy: number; r: number };
    const polys: Poly[] = [];
    const circs: Circ[] = [];
    const raw: number[] = [];
    for (const { sign, shape: s } of flat) {
      if (s.kind === 'circle') {
        const c = { sign, cx: s.cx - xRef, cy: s.cy - minY, r: s.r };
        circs.push(c);
        raw.push(c.cy - c.r, c.cy, c.cy + c.r);
      } else {
        const xs = new Float64Array(s.xs.length), ys = new Float64Array(s.ys.length);
        for (let i = 0; i < xs.length; i++) {
          xs[i] = s.xs[i] - xRef;
          ys[i] = s.ys[i] - minY;
          raw.push(ys[i]);
        }
        polys.push({ sign, xs, ys });
      }
    }
    raw.sort((a, b) => a - b);
    const span = Math.max(raw[raw.length - 1], Number.MIN_VALUE);
    const merge = HEIGHT_MERGE * span;
    const heights: number[] = [Math.max(0, raw[0])];
    for (const h of raw) if (h - heights[heights.length - 1] > merge) heights.push(h);
    const H = (this.H = Float64Array.from(heights));
    const nS = H.length - 1;
    this.depth = H[nS];
    const nearest = (y: number): number => {
      let lo = 0, hi = nS;
      while (hi - lo > 1) {
        const mid = (lo + hi) >> 1;
        if (H[mid] <= y) lo = mid; else hi = mid;
      }
      return y - H[lo] <= H[hi] - y ? lo : hi;
    };

    // Polygon widths per slab: each edge adds ±x(y) over the slabs it spans.
    const wb = (this.wb = new Float64Array(nS));
    const wt = (this.wt = new Float64Array(nS));
    for (const p of polys) {
      const n = p.xs.length;
      const idx = new Int32Array(n);
      for (let i = 0; i < n; i++) {
        idx[i] = nearest(p.ys[i]);
        p.ys[i] = H[idx[i]];
      }
      for (let i = 0; i < n; i++) {
        const j = (i + 1) % n;
        const ia = idx[i], ib = idx[j];
        if (ia === ib) continue;
        const dir = ib > ia ? 1 : -1;
        const lowV = ib > ia ? i : j, highV = ib > ia ? j : i;
        const k0 = Math.min(ia, ib), k1 = Math.max(ia, ib);
        const xl = p.xs[lowV], yl = p.ys[lowV], xh = p.xs[highV], yh = p.ys[highV];
        const slope = (xh - xl) / (yh - yl);
        const s = p.sign * dir;
        for (let k = k0; k < k1; k++) {
          const xBottom = k === k0 ? xl : xl + (H[k] - yl) * slope;
          const xTop = k + 1 === k1 ? xh : xl + (H[k + 1] - yl) * slope;
          wb[k] += s * xBottom;
          wt[k] += s * xTop;
        }
      }
    }

    // Circles per slab.
    const circleEnd = (this.circleEnd = new Uint8Array(nS + 1));
    const circleData = (this.circleData = new Float64Array(3 * circs.length));
    const ranges: [number, number][] = [];
    const counts = new Int32Array(nS + 1);
    circs.forEach((c, i) => {
      circleData[3 * i] = c.sign;
      circleData[3 * i + 1] = c.cy;
      circleData[3 * i + 2] = c.r;
      const k0 = nearest(c.cy - c.r), k1 = nearest(c.cy + c.r);
      circleEnd[k0] = 1;
      circleEnd[k1] = 1;
      ranges.push([k0, k1]);
      for (let k = k0; k < k1; k++) counts[k + 1]++;
    });
    for (let k = 0; k < nS; k++) counts[k + 1] += counts[k];
    this.circleStart = counts;
    const circleAt = (this.circleAt = new Int32Array(counts[nS]));
    const fill = counts.slice(0, nS);
    ranges.forEach(([k0, k1], i) => {
      for (let k = k0; k < k1; k++) circleAt[fill[k]++] = i;
    });

    // Properties from the same width function that Q uses, so that ∫Q dy = I holds to rounding.
    let area = 0, moment = 0;
    const mid = this.depth / 2;
    for (let k = 0; k < nS; k++) {
      area += this.slabIntegral(k, H[k], H[k + 1], 0, 0);
      moment += this.slabIntegral(k, H[k], H[k + 1], mid, 1);
    }
    this.area = area;
    const yc = (this.centroidY = mid + moment / area);
    let I = 0;
    const J = new Float64Array(nS);
    for (let k = 0; k < nS; k++) {
      I += this.slabIntegral(k, H[k], H[k + 1], yc, 2);
      J[k] = this.slabIntegral(k, H[k], H[k + 1], yc, 1);
    }
    this.I = I;
    const Qtop = (this.Qtop = new Float64Array(nS + 1));
    const Qbot = (this.Qbot = new Float64Array(nS + 1));
    for (let k = nS - 1; k >= 0; k--) Qtop[k] = Qtop[k + 1] + J[k];
    for (let k = 0; k < nS; k++) Qbot[k + 1] = Qbot[k] - J[k];

    // Horizontal-axis-free properties straight from the primitives.
    let sx = 0, sy = 0, sxx = 0, sxy = 0, sa = 0;
    for (const c of circs) {
      const a = Math.PI * c.r * c.r;
      const dy = c.cy - yc;
      sa += c.sign * a;
      sx += c.sign * a * c.cx;
      sy += c.sign * a * dy;
      sxx += c.sign * (a * c.r * c.r / 4 + a * c.cx * c.cx);
      sxy += c.sign * a * c.cx * dy;
    }
    for (const p of polys) {
      const n = p.xs.length;
      for (let i = 0; i < n; i++) {
        const j = (i + 1) % n;
        const x1 = p.xs[i], y1 = p.ys[i] - yc, x2 = p.xs[j], y2 = p.ys[j] - yc;
        const cross = x1 * y2 - x2 * y1;
        sa += (p.sign * cross) / 2;
        sx += (p.sign * (x1 + x2) * cross) / 6;
        sy += (p.sign * (y1 + y2) * cross) / 6;
        sxx += (p.sign * (x1 * x1 + x1 * x2 + x2 * x2) * cross) / 12;
        sxy += (p.sign * (x1 * y2 + 2 * x1 * y1 + 2 * x2 * y2 + x2 * y1) * cross) / 24;
      }
    }
    const cx = sx / sa;
    this.centroidX = xRef + cx;
    this.Iy = sxx - sa * cx * cx;
    this.Ixy = sxy - cx * sy;

    let widest = 0;
    for (let k = 0; k < nS; k++) {
      widest = Math.max(widest, Math.abs(this.rawWidth(k, H[k])), Math.abs(this.rawWidth(k, H[k + 1])), Math.abs(this.rawWidth(k, (H[k] + H[k + 1]) / 2)));
    }
    this.widthZero = WIDTH_ZERO * widest;

    // A height inside the depth where the width closes to zero with material on that side leaves tau unbounded.
    const Qscale = Math.max(Math.abs(this.QAt(yc)), Number.MIN_VALUE);
    for (let k = 1; k < nS; k++) {
      const below = this.width1(k - 1, H[k]), above = this.width1(k, H[k]);
      const closesBelow = below === 0 && this.width1(k - 1, (H[k - 1] + H[k]) / 2) > 0;
      const closesAbove = above === 0 && this.width1(k, (H[k] + H[k + 1]) / 2) > 0;
      if ((closesBelow || closesAbove) && this.QAt(H[k]) > 1e-9 * Qscale) this.pinches.push(H[k]);
    }
    if (this.pinches.length) {
      this.problems.push(
        problem(
          'section.pinch',
          `The material narrows to nothing at ${this.pinches.map((h) => `y = ${formatLength(h)}`).join(', ')}: the parts only touch there, and tau = VQ/(It) has no finite maximum.`,
          undefined,
          'warning',
        ),
      );
    }
  }

  // ---- width and integrals in one slab -------------------------------------------------------

  /** Width of slab k's material at y (y within the slab, ends included), without clamping. */
  private rawWidth(k: number, y: number): number {
    const H = this.H;
    const L = H[k + 1] - H[k];
    let w = this.wb[k] + (this.wt[k] - this.wb[k]) * ((y - H[k]) / L);
    for (let i = this.circleStart[k]; i < this.circleStart[k + 1]; i++) {
      const c = this.circleAt[i];
      const sign = this.circleData[3 * c], cy = this.circleData[3 * c + 1], r = this.circleData[3 * c + 2];
      const v = y - cy;
      w += sign * 2 * Math.sqrt(Math.max(0, (r - v) * (r + v)));
    }
    return w;
  }

  /** Width of slab k at y, with cancellation noise read as no material. */
  private width1(k: number, y: number): number {
    const w = this.rawWidth(k, y);
    return w > this.widthZero ? w : 0;
  }

  /** d(width)/dy in slab k at an interior height. */
  private widthSlope(k: number, y: number): number {
    const H = this.H;
    let s = (this.wt[k] - this.wb[k]) / (H[k + 1] - H[k]);
    for (let i = this.circleStart[k]; i < this.circleStart[k + 1]; i++) {
      const c = this.circleAt[i];
      const sign = this.circleData[3 * c], cy = this.circleData[3 * c + 1], r = this.circleData[3 * c + 2];
      const v = y - cy;
      s += (sign * -2 * v) / Math.sqrt(Math.max(Number.MIN_VALUE, (r - v) * (r + v)));
    }
    return s;
  }

  /** ∫ from y1 to y2 of t(s)·(s − ref)^power ds inside slab k, power 0, 1 or 2; exact. */
  private slabIntegral(k: number, y1: number, y2: number, ref: number, power: 0 | 1 | 2): number {
    if (y2 === y1) return 0;
    const H = this.H;
    const L = H[k + 1] - H[k];
    const wAt = (y: number) => this.wb[k] + (this.wt[k] - this.wb[k]) * ((y - H[k]) / L);
    const lever = (y: number) => (power === 0 ? 1 : power === 1 ? y - ref : (y - ref) * (y - ref));
    const ym = (y1 + y2) / 2;
    // Simpson's rule: exact here, the integrand being a polynomial of degree at most 3.
    let sum = ((y2 - y1) / 6) * (wAt(y1) * lever(y1) + 4 * wAt(ym) * lever(ym) + wAt(y2) * lever(y2));
    for (let i = this.circleStart[k]; i < this.circleStart[k + 1]; i++) {
      const c = this.circleAt[i];
      const sign = this.circleData[3 * c], cy = this.circleData[3 * c + 1], r = this.circleData[3 * c + 2];
      const v1 = Math.max(-r, Math.min(r, y1 - cy)), v2 = Math.max(-r, Math.min(r, y2 - cy));
      const d = cy - ref;
      const i0 = arc0(v2, r) - arc0(v1, r);
      let value: number;
      if (power === 0) value = i0;
      else {
        const i1 = arc1(v2, r) - arc1(v1, r);
        value = power === 1 ? i1 + d * i0 : arc2(v2, r) - arc2(v1, r) + 2 * d * i1 + d * d * i0;
      }
      sum += sign * value;
    }
    return sum;
  }

  /** Index of the slab holding y (the lower one at a boundary, except at the bottom). */
  private slabOf(y: number): number {
    const H = this.H;
    let lo = 0, hi = H.length - 1;
    while (hi - lo > 1) {
      const mid = (lo + hi) >> 1;
      if (H[mid] < y) lo = mid; else hi = mid;
    }
    return lo;
  }

  /** Q(y) for y in [0, depth], integrated from whichever end of the section is on y's side of the neutral axis. */
  private QAt(y: number, k = this.slabOf(y)): number {
    const H = this.H, yc = this.centroidY;
    const q = y >= yc ? this.Qtop[k + 1] + this.slabIntegral(k, y, H[k + 1], yc, 1) : this.Qbot[k] - this.slabIntegral(k, H[k], y, yc, 1);
    // Q is never negative (it is the moment of the material beyond the cut about the centroid); clear rounding noise.
    return q > 0 ? q : 0;
  }

  /** Index of the boundary at y, or -1. */
  private boundaryAt(y: number): number {
    const H = this.H;
    const k = this.slabOf(y);
    if (H[k] === y) return k;
    if (H[k + 1] === y) return k + 1;
    return -1;
  }

  private sides(y: number): { below: number; above: number } {
    const H = this.H, nS = H.length - 1;
    const b = this.boundaryAt(y);
    if (b < 0) {
      const w = this.width1(this.slabOf(y), y);
      return { below: w, above: w };
    }
    return { below: b > 0 ? this.width1(b - 1, H[b]) : 0, above: b < nS ? this.width1(b, H[b]) : 0 };
  }

  /** The height snapped onto a nearby breakpoint or edge, or a problem. */
  private place(y: number): { y: number; problem?: SectionProblem } {
    if (typeof y !== 'number' || !Number.isFinite(y)) {
      return { y: 0, problem: problem('section.bad-height', 'The height must be a finite length.') };
    }
    const H = this.H, depth = this.depth;
    const tol = HEIGHT_SNAP * depth;
    if (y < -tol || y > depth + tol) {
      return {
        y: 0,
        problem: problem(
          'section.outside',
          `Height y = ${formatLength(y)} is outside the section, which spans y = 0 to ${formatLength(depth)} measured up from its lowest point.`,
        ),
      };
    }
    const k = this.slabOf(Math.max(0, Math.min(depth, y)));
    if (Math.abs(y - H[k]) <= tol) return { y: H[k] };
    if (Math.abs(y - H[k + 1]) <= tol) return { y: H[k + 1] };
    return { y };
  }

  /**
   * The problem with a height that has no material on either side, if it is inside the depth: a gap
   * or a point where parts only touch. The lowest and highest points of a section (the tip of a
   * circle or a diamond) are not a problem: Q is zero there and so is tau.
   */
  private noMaterial(y: number): SectionProblem | undefined {
    if (y === 0 || y === this.depth) return undefined;
    return problem('section.no-material', `There is no material across height y = ${formatLength(y)}: the parts do not meet there, so tau is undefined.`);
  }

  private forceProblem(V: number): SectionProblem | undefined {
    return typeof V === 'number' && Number.isFinite(V) ? undefined : problem('section.bad-force', 'The shear force must be a finite number.');
  }

  // ---- public queries --------------------------------------------------------------------------

  heightProblem(y: number): SectionProblem | undefined {
    const at = this.place(y);
    if (at.problem) return at.problem;
    const s = this.sides(at.y);
    if (s.below === 0 && s.above === 0) return this.noMaterial(at.y);
    return undefined;
  }

  widthAt(y: number): WidthReading {
    const at = this.place(y);
    if (at.problem) return { below: 0, above: 0, problem: at.problem };
    return this.sides(at.y);
  }

  firstMoment(y: number): Reading {
    const at = this.place(y);
    if (at.problem) return { value: 0, problem: at.problem };
    return { value: this.QAt(at.y) };
  }

  shearFlow(V: number, y: number): Reading {
    const bad = this.forceProblem(V);
    if (bad) return { value: 0, problem: bad };
    const at = this.place(y);
    if (at.problem) return { value: 0, problem: at.problem };
    const value = shearRatio(V, this.QAt(at.y), this.I, 1);
    return Number.isFinite(value) ? { value } : { value: 0, problem: tooLarge() };
  }

  tauSides(V: number, y: number): TauSides {
    const bad = this.forceProblem(V);
    const at = this.place(y);
    const prob = bad ?? at.problem;
    if (prob) return { widthBelow: 0, widthAbove: 0, firstMoment: 0, problem: prob };
    const s = this.sides(at.y);
    const Q = this.QAt(at.y);
    const out: TauSides = { widthBelow: s.below, widthAbove: s.above, firstMoment: Q };
    if (s.below > 0) out.below = shearRatio(V, Q, this.I, s.below);
    if (s.above > 0) out.above = shearRatio(V, Q, this.I, s.above);
    if (!Number.isFinite(out.below ?? 0) || !Number.isFinite(out.above ?? 0)) {
      return { widthBelow: s.below, widthAbove: s.above, firstMoment: Q, problem: tooLarge() };
    }
    if (s.below === 0 && s.above === 0) {
      const none = this.noMaterial(at.y);
      if (none) out.problem = none;
    }
    return out;
  }

  tau(V: number, y: number): TauReading {
    const sides = this.tauSides(V, y);
    if (sides.problem) return { value: 0, width: 0, firstMoment: sides.firstMoment, side: 'both', problem: sides.problem };
    const { widthBelow: wB, widthAbove: wA } = sides;
    // The tip of a circle or a diamond at the very bottom or top: no width, no first moment, no stress.
    if (wB === 0 && wA === 0) return { value: 0, width: 0, firstMoment: 0, side: 'both' };
    let width: number, side: TauReading['side'];
    if (wB > 0 && wA > 0) {
      const same = Math.abs(wB - wA) <= this.widthZero;
      width = Math.min(wB, wA);
      side = same ? 'both' : wB < wA ? 'below' : 'above';
    } else if (wB > 0) {
      width = wB;
      side = 'below';
    } else {
      width = wA;
      side = 'above';
    }
    const value = shearRatio(V, sides.firstMoment, this.I, width);
    if (!Number.isFinite(value)) return { value: 0, width: 0, firstMoment: sides.firstMoment, side: 'both', problem: tooLarge() };
    return { value, width, firstMoment: sides.firstMoment, side };
  }

  tauMax(V: number): TauMaxResult {
    const bad = this.forceProblem(V);
    if (bad) return { value: 0, perV: 0, locations: [], problem: bad };
    const m = (this.maxCache ??= this.findMax());
    if (m.problem) return { value: 0, perV: 0, locations: [], problem: m.problem };
    const value = V * m.perV;
    if (!Number.isFinite(value) || !Number.isFinite(m.perV)) return { value: 0, perV: 0, locations: [], problem: tooLarge() };
    return { value, perV: m.perV, locations: m.locations.map((l) => ({ ...l })) };
  }

  /**
   * The maximum of Q/(I·t) over the depth. Candidates: both sides of every boundary, and every
   * stationary point inside a slab, where d/dy(Q/t) = 0, i.e. t²·(y − yc) + Q·t' = 0 (using
   * dQ/dy = −t·(y − yc)). On a polygon slab that is a cubic in y, solved in closed form; on an arc
   * slab its sign changes are bracketed and solved by Brent's method. The neutral axis is always a
   * candidate as well (it is the stationary point of every section symmetric about it).
   */
  private findMax(): { perV: number; locations: TauMaxLocation[]; problem?: SectionProblem } {
    if (this.pinches.length) {
      return {
        perV: 0,
        locations: [],
        problem: problem(
          'section.pinch',
          `tau has no finite maximum: the material narrows to nothing at ${this.pinches.map((h) => `y = ${formatLength(h)}`).join(', ')} where the parts only touch.`,
        ),
      };
    }
    const H = this.H, nS = H.length - 1, yc = this.centroidY;
    const candidates: { y: number; f: number; width: number; Q: number }[] = [];
    const consider = (y: number, width: number, Q: number) => {
      if (width > 0) candidates.push({ y, f: Q / width, width, Q });
    };
    for (let b = 0; b <= nS; b++) {
      const Q = this.QAt(H[b], Math.min(b, nS - 1));
      if (b > 0) consider(H[b], this.width1(b - 1, H[b]), Q);
      if (b < nS) consider(H[b], this.width1(b, H[b]), Q);
    }
    const interior = (k: number, y: number) => {
      if (y > H[k] && y < H[k + 1]) consider(y, this.width1(k, y), this.QAt(y, k));
    };
    for (let k = 0; k < nS; k++) {
      const y0 = H[k], L = H[k + 1] - y0;
      interior(k, yc);
      if (this.circleStart[k + 1] === this.circleStart[k]) {
        const wb = this.wb[k], beta = (this.wt[k] - wb) / L, c = y0 - yc;
        const Q0 = this.QAt(y0, k);
        const p0 = wb * wb * c + beta * Q0;
        const p1 = wb * wb + wb * beta * c;
        const p2 = 1.5 * wb * beta + 0.5 * beta * beta * c;
        const p3 = (2 / 3) * beta * beta;
        for (const z of cubicRootsInUnit(p0, p1 * L, p2 * L * L, p3 * L * L * L)) interior(k, y0 + L * z);
      } else {
        const g = (y: number) => {
          const t = this.rawWidth(k, y);
          return t * t * (y - yc) + this.QAt(y, k) * this.widthSlope(k, y);
        };
        // Brackets: the slab ends and Chebyshev nodes between them, which crowd toward the ends where an
        // arc's width changes fastest. At an arc's own end t' is unbounded; only the sign of g is needed there.
        const gSafe = (y: number) => {
          const v = g(y);
          return Number.isFinite(v) ? v : Number.isNaN(v) ? 0 : Math.sign(v) * Number.MAX_VALUE;
        };
        let prevY = y0, prevG = gSafe(y0);
        for (let j = 0; j <= ARC_BRACKETS; j++) {
          const y = j < ARC_BRACKETS ? y0 + (L * (1 - Math.cos(((j + 0.5) * Math.PI) / ARC_BRACKETS))) / 2 : H[k + 1];
          const gy = gSafe(y);
          if (gy === 0) interior(k, y);
          else if (prevG !== 0 && gy > 0 !== prevG > 0) interior(k, brent(gSafe, prevY, y, prevG, gy));
          prevY = y;
          prevG = gy;
        }
      }
    }
    let best = 0;
    for (const c of candidates) best = Math.max(best, c.f);
    const groups: (typeof candidates)[number][] = [];
    const sameHeight = SAME_LOCATION * this.depth;
    for (const c of candidates.filter((c) => c.f >= best * (1 - TIE)).sort((a, b) => a.y - b.y)) {
      const last = groups[groups.length - 1];
      if (last && c.y - last.y <= sameHeight) {
        if (c.f > last.f) groups[groups.length - 1] = c;
      } else groups.push(c);
    }
    return { perV: best / this.I, locations: groups.map((c) => ({ y: c.y, width: c.width, firstMoment: c.Q })) };
  }

  profile(n = 101): TauProfile {
    const count = Number.isFinite(n) ? Math.max(2, Math.min(100_000, Math.floor(n))) : 101;
    const depth = this.depth, I = this.I;
    const breaks = this.breakpointList();
    const peaks = (this.maxCache ??= this.findMax()).locations;
    const cap = count + 2 * breaks.length + peaks.length;
    const ys = new Float64Array(cap), taus = new Float64Array(cap), widths = new Float64Array(cap);
    let m = 0;
    const emit = (y: number, width: number, Q: number) => {
      ys[m] = y;
      widths[m] = width;
      taus[m] = width > 0 ? shearRatio(1, Q, I, width) : 0;
      m++;
    };
    // Merge three ascending lists: breakpoints (both sides, so jumps draw as jumps), the peaks, even samples.
    let ib = 0, ip = 0;
    let lastExact = -Infinity;
    const flushTo = (limit: number) => {
      for (;;) {
        const yb = ib < breaks.length ? breaks[ib].y : Infinity;
        const yp = ip < peaks.length ? peaks[ip].y : Infinity;
        if (ib === breaks.length && ip === peaks.length) return;
        if (Math.min(yb, yp) > limit) return;
        if (yp < yb) {
          emit(yp, peaks[ip].width, peaks[ip].firstMoment);
          lastExact = yp;
          ip++;
          continue;
        }
        const b = breaks[ib++];
        emit(b.y, b.widthBelow, b.firstMoment);
        while (ip < peaks.length && peaks[ip].y === b.y) emit(b.y, peaks[ip].width, peaks[ip++].firstMoment);
        emit(b.y, b.widthAbove, b.firstMoment);
        lastExact = b.y;
      }
    };
    const tol = HEIGHT_SNAP * depth;
    for (let i = 0; i < count; i++) {
      const y = i === count - 1 ? depth : (depth * i) / (count - 1);
      flushTo(y);
      const next = Math.min(ib < breaks.length ? breaks[ib].y : Infinity, ip < peaks.length ? peaks[ip].y : Infinity);
      if (y - lastExact <= tol || next - y <= tol) continue;
      const k = this.slabOf(y);
      emit(y, this.width1(k, y), this.QAt(y, k));
    }
    flushTo(Infinity);
    return { y: ys.subarray(0, m), tauPerV: taus.subarray(0, m), width: widths.subarray(0, m) };
  }

  breakpoints(): Breakpoint[] {
    return this.breakpointList().map((b) => ({ ...b }));
  }

  private breakpointList(): Breakpoint[] {
    if (this.breakCache) return this.breakCache;
    const H = this.H, nS = H.length - 1;
    const out: Breakpoint[] = [];
    for (let b = 0; b <= nS; b++) {
      const below = b > 0 ? this.width1(b - 1, H[b]) : 0;
      const above = b < nS ? this.width1(b, H[b]) : 0;
      let keep = b === 0 || b === nS || this.circleEnd[b] === 1 || Math.abs(below - above) > this.widthZero;
      if (!keep) {
        const sb = (this.wt[b - 1] - this.wb[b - 1]) / (H[b] - H[b - 1]);
        const sa = (this.wt[b] - this.wb[b]) / (H[b + 1] - H[b]);
        keep = Math.abs(sb - sa) > 1e-9 * Math.max(1, Math.abs(sb), Math.abs(sa));
      }
      if (keep) out.push({ y: H[b], widthBelow: below, widthAbove: above, firstMoment: this.QAt(H[b], Math.min(b, nS - 1)) });
    }
    return (this.breakCache = out);
  }

  outline(): OutlineItem[] {
    const dy = this.bottom;
    return this.flat.map((f) => {
      const s = f.shape;
      const shape: Primitive =
        s.kind === 'circle'
          ? { kind: 'circle', cx: s.cx, cy: s.cy - dy, r: s.r }
          : { kind: 'polygon', xs: Float64Array.from(s.xs), ys: s.ys.map((y) => y - dy) };
      const tag = this.inputs[f.part].tag;
      return tag === undefined ? { sign: f.sign, shape, part: f.part } : { sign: f.sign, shape, part: f.part, tag };
    });
  }

  parts(): PartSummary[] {
    const dy = this.bottom, yc = this.centroidY;
    return this.inputs.map((input, index) => {
      let a = 0, m = 0, lo = Infinity, hi = -Infinity;
      for (const { sign, shape: s } of input.part) {
        if (s.kind === 'circle') {
          const ac = Math.PI * s.r * s.r;
          a += sign * ac;
          m += sign * ac * (s.cy - dy);
          if (sign > 0) { lo = Math.min(lo, s.cy - s.r - dy); hi = Math.max(hi, s.cy + s.r - dy); }
        } else {
          const n = s.xs.length;
          for (let i = 0; i < n; i++) {
            const j = (i + 1) % n;
            const y1 = s.ys[i] - dy, y2 = s.ys[j] - dy;
            const cross = (s.xs[i] - this.xRef) * y2 - (s.xs[j] - this.xRef) * y1;
            a += (sign * cross) / 2;
            m += (sign * (y1 + y2) * cross) / 6;
            if (sign > 0) { lo = Math.min(lo, y1); hi = Math.max(hi, y1); }
          }
        }
      }
      const centroidY = m / a;
      const summary: PartSummary = {
        index,
        hole: input.hole,
        area: a,
        centroidY,
        bottom: Math.max(0, lo),
        top: Math.min(this.depth, hi),
        firstMoment: a * (centroidY - yc),
      };
      if (input.tag !== undefined) summary.tag = input.tag;
      return summary;
    });
  }
}
