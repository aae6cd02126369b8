/**
 * Shape constructors. Each returns a part placed at its reference point: the horizontal centre of
 * its bounding box at x = 0 and its bottom at y = 0, so "plate B x H at X, Y" is
 * translate(plate(B, H).part, X, Y). The one exception is `polygon`, which keeps the absolute
 * coordinates the engineer wrote. Dimensions are in metres; bad dimensions come back as problems.
 */
import {
  type Part,
  type SectionProblem,
  type SignedPrimitive,
  extentOf,
  formatLength,
  makeCircle,
  makePolygon,
  problem,
} from './primitives';

export interface ShapeResult {
  part?: Part;
  problems: SectionProblem[];
}

export interface Bounds {
  minX: number;
  maxX: number;
  minY: number;
  maxY: number;
}

type Named = [name: string, value: number];

/** Every dimension must be a finite number greater than zero. */
function positive(shape: string, dims: Named[], tag: unknown): SectionProblem[] {
  const out: SectionProblem[] = [];
  for (const [name, value] of dims) {
    if (typeof value !== 'number' || !Number.isFinite(value)) {
      out.push(problem('section.not-finite', `The ${shape}'s ${name} is not a finite number.`, tag));
    } else if (!(value > 0)) {
      out.push(problem('section.bad-dimension', `The ${shape}'s ${name} must be greater than zero (got ${formatLength(value)}).`, tag));
    }
  }
  return out;
}

function proportion(message: string, tag: unknown): SectionProblem {
  return problem('section.bad-proportion', message, tag);
}

function polygonPart(xs: number[], ys: number[], tag: unknown): ShapeResult {
  const made = makePolygon(xs, ys, tag);
  return made.polygon ? { part: [{ sign: 1, shape: made.polygon }], problems: [] } : { problems: made.problems };
}

function rectangle(x0: number, y0: number, x1: number, y1: number): number[][] {
  return [[x0, x1, x1, x0], [y0, y0, y1, y1]];
}

/** A solid rectangle b wide and h tall. */
export function plate(b: number, h: number, tag?: unknown): ShapeResult {
  const bad = positive('plate', [['width', b], ['height', h]], tag);
  if (bad.length) return { problems: bad };
  const [xs, ys] = rectangle(-b / 2, 0, b / 2, h);
  return polygonPart(xs, ys, tag);
}

/** A solid circle of diameter d. */
export function circle(d: number, tag?: unknown): ShapeResult {
  const bad = positive('circle', [['diameter', d]], tag);
  if (bad.length) return { problems: bad };
  const made = makeCircle(0, d / 2, d / 2, tag);
  return made.circle ? { part: [{ sign: 1, shape: made.circle }], problems: [] } : { problems: made.problems };
}

/** A circular tube of outside diameter d and wall t. */
export function tube(d: number, t: number, tag?: unknown): ShapeResult {
  const bad = positive('tube', [['outside diameter', d], ['wall thickness', t]], tag);
  if (bad.length) return { problems: bad };
  if (t >= d / 2) {
    return {
      problems: [proportion(`The tube's wall (${formatLength(t)}) must be thinner than its outside radius (${formatLength(d / 2)}); use circle for a solid bar.`, tag)],
    };
  }
  const r = d / 2;
  return {
    part: [
      { sign: 1, shape: { kind: 'circle', cx: 0, cy: r, r } },
      { sign: -1, shape: { kind: 'circle', cx: 0, cy: r, r: r - t } },
    ],
    problems: [],
  };
}

/** A rectangular hollow box b wide, h tall, with a uniform wall t. */
export function box(b: number, h: number, t: number, tag?: unknown): ShapeResult {
  const bad = positive('box', [['width', b], ['height', h], ['wall thickness', t]], tag);
  if (bad.length) return { problems: bad };
  if (2 * t >= Math.min(b, h)) {
    return {
      problems: [proportion(`The box's wall (${formatLength(t)}) must be less than half its smaller outside dimension (${formatLength(Math.min(b, h))}); use plate for a solid section.`, tag)],
    };
  }
  const outer = makePolygon(...(rectangle(-b / 2, 0, b / 2, h) as [number[], number[]]), tag);
  const inner = makePolygon(...(rectangle(-b / 2 + t, t, b / 2 - t, h - t) as [number[], number[]]), tag);
  if (!outer.polygon || !inner.polygon) return { problems: [...outer.problems, ...inner.problems] };
  return { part: [{ sign: 1, shape: outer.polygon }, { sign: -1, shape: inner.polygon }], problems: [] };
}

export interface FlangedDimensions {
  /** Overall depth. */
  d: number;
  /** Flange width. */
  bf: number;
  /** Flange thickness. */
  tf: number;
  /** Web thickness. */
  tw: number;
}

function flangedChecks(shape: string, dims: FlangedDimensions, flanges: 1 | 2, tag: unknown): SectionProblem[] {
  const bad = positive(shape, [['depth d', dims.d], ['flange width bf', dims.bf], ['flange thickness tf', dims.tf], ['web thickness tw', dims.tw]], tag);
  if (bad.length) return bad;
  const out: SectionProblem[] = [];
  if (flanges * dims.tf >= dims.d) {
    out.push(
      proportion(
        flanges === 2
          ? `The ${shape}'s two flanges (2 × ${formatLength(dims.tf)}) leave no web inside its depth d = ${formatLength(dims.d)}.`
          : `The ${shape}'s flange (${formatLength(dims.tf)}) leaves no web inside its depth d = ${formatLength(dims.d)}.`,
        tag,
      ),
    );
  }
  if (dims.tw >= dims.bf) {
    out.push(proportion(`The ${shape}'s web (${formatLength(dims.tw)}) must be thinner than its flange is wide (${formatLength(dims.bf)}).`, tag));
  }
  return out;
}

/** A doubly symmetric I-section of plates (no root fillets). */
export function isection(dims: FlangedDimensions, tag?: unknown): ShapeResult {
  const bad = flangedChecks('I-section', dims, 2, tag);
  if (bad.length) return { problems: bad };
  const { d, bf, tf, tw } = dims;
  const b = bf / 2, w = tw / 2;
  const xs = [-b, b, b, w, w, b, b, -b, -b, -w, -w, -b];
  const ys = [0, 0, tf, tf, d - tf, d - tf, d, d, d - tf, d - tf, tf, tf];
  return polygonPart(xs, ys, tag);
}

/** A tee with its flange on top and its web standing below, centred. */
export function tee(dims: FlangedDimensions, tag?: unknown): ShapeResult {
  const bad = flangedChecks('tee', dims, 1, tag);
  if (bad.length) return { problems: bad };
  const { d, bf, tf, tw } = dims;
  const b = bf / 2, w = tw / 2;
  const xs = [-w, w, w, b, b, -b, -b, -w];
  const ys = [0, 0, d - tf, d - tf, d, d, d - tf, d - tf];
  return polygonPart(xs, ys, tag);
}

/** A channel with its web on the left and both flanges pointing right. */
export function channel(dims: FlangedDimensions, tag?: unknown): ShapeResult {
  const bad = flangedChecks('channel', dims, 2, tag);
  if (bad.length) return { problems: bad };
  const { d, bf, tf, tw } = dims;
  const l = -bf / 2, r = bf / 2, web = l + tw;
  const xs = [l, r, r, web, web, r, r, l];
  const ys = [0, 0, tf, tf, d - tf, d - tf, d, d];
  return polygonPart(xs, ys, tag);
}

export interface AngleDimensions {
  /** Length of the vertical leg (overall height). */
  d: number;
  /** Length of the horizontal leg (overall width). */
  b: number;
  /** Leg thickness. */
  t: number;
}

/** An angle with its vertical leg on the left and its horizontal leg along the bottom. */
export function angle(dims: AngleDimensions, tag?: unknown): ShapeResult {
  const bad = positive('angle', [['vertical leg d', dims.d], ['horizontal leg b', dims.b], ['thickness t', dims.t]], tag);
  if (bad.length) return { problems: bad };
  const { d, b, t } = dims;
  if (t >= Math.min(d, b)) {
    return { problems: [proportion(`The angle's thickness (${formatLength(t)}) must be less than both legs (${formatLength(d)} and ${formatLength(b)}).`, tag)] };
  }
  const l = -b / 2, r = b / 2;
  const xs = [l, r, r, l + t, l + t, l];
  const ys = [0, 0, t, t, d, d];
  return polygonPart(xs, ys, tag);
}

/** A polygon through the given points, in absolute coordinates (it is not re-centred). */
export function polygon(points: ReadonlyArray<readonly [number, number]>, tag?: unknown): ShapeResult {
  const xs = points.map((p) => p[0]);
  const ys = points.map((p) => p[1]);
  return polygonPart(xs, ys, tag);
}

/** The same part moved by (dx, dy). */
export function translate(part: Part, dx: number, dy: number): Part {
  return part.map((item): SignedPrimitive => {
    const s = item.shape;
    if (s.kind === 'circle') return { sign: item.sign, shape: { kind: 'circle', cx: s.cx + dx, cy: s.cy + dy, r: s.r } };
    const xs = new Float64Array(s.xs.length);
    const ys = new Float64Array(s.ys.length);
    for (let i = 0; i < xs.length; i++) {
      xs[i] = s.xs[i] + dx;
      ys[i] = s.ys[i] + dy;
    }
    return { sign: item.sign, shape: { kind: 'polygon', xs, ys } };
  });
}

/** The bounding box of a part's solid primitives (its voids lie inside them). */
export function bounds(part: Part): Bounds {
  const b = extentOf(part, true);
  if (b.minX > b.maxX) return { minX: 0, maxX: 0, minY: 0, maxY: 0 };
  return b;
}

/** The height of the top of the given parts, 0 when there are none: where the next stacked part sits. */
export function topOf(parts: readonly Part[]): number {
  let top = -Infinity;
  for (const p of parts) if (p.some((item) => item.sign > 0)) top = Math.max(top, bounds(p).maxY);
  return Number.isFinite(top) ? top : 0;
}
