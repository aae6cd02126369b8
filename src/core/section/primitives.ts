/**
 * Geometric primitives of a cross-section: simple polygons and circles, in metres, y upward.
 *
 * A part (a plate, a tube, a rolled shape) is a list of signed primitives: +1 adds material, -1
 * removes it. Every integral the section engine takes is linear in the primitives, so a tube is
 * exactly "outer circle minus inner circle" and a box "outer rectangle minus inner rectangle".
 */

export interface Polygon {
  readonly kind: 'polygon';
  /** Vertex coordinates, counter-clockwise, without a repeated closing vertex. */
  readonly xs: Float64Array;
  readonly ys: Float64Array;
}

export interface Circle {
  readonly kind: 'circle';
  readonly cx: number;
  readonly cy: number;
  readonly r: number;
}

export type Primitive = Polygon | Circle;

export interface SignedPrimitive {
  /** +1 solid material, -1 a void inside the same part. */
  readonly sign: 1 | -1;
  readonly shape: Primitive;
}

/** A part of a section: signed primitives whose voids lie inside its solids. */
export type Part = readonly SignedPrimitive[];

export type SectionProblemCode =
  | 'section.not-finite'
  | 'section.bad-dimension'
  | 'section.bad-proportion'
  | 'section.too-few-vertices'
  | 'section.too-many-vertices'
  | 'section.zero-area'
  | 'section.self-intersecting'
  | 'section.empty'
  | 'section.void-outside'
  | 'section.overlap'
  | 'section.hole-outside'
  | 'section.hole-overlap'
  | 'section.check-incomplete'
  | 'section.disconnected'
  | 'section.pinch'
  | 'section.outside'
  | 'section.no-material'
  | 'section.bad-height'
  | 'section.bad-force';

/**
 * A problem with the geometry or with a query. Errors mean no result was produced; warnings come
 * with a usable result that the engineer should still look at. `tag` is whatever the caller attached
 * to the offending part (typically its source line), handed back untouched.
 */
export interface SectionProblem {
  readonly code: SectionProblemCode;
  readonly severity: 'error' | 'warning';
  readonly message: string;
  readonly tag?: unknown;
}

/** Polygons larger than this are refused: a note is untrusted input and checks are quadratic at worst. */
export const MAX_POLYGON_VERTICES = 4096;

export function problem(
  code: SectionProblemCode,
  message: string,
  tag?: unknown,
  severity: 'error' | 'warning' = 'error',
): SectionProblem {
  return tag === undefined ? { code, severity, message } : { code, severity, message, tag };
}

/** A length for a message, in millimetres with 4 significant figures (engines work in metres). */
export function formatLength(metres: number): string {
  if (!Number.isFinite(metres)) return String(metres);
  const mm = metres * 1000;
  // The largest lengths overflow on the way to millimetres; they are shown in metres instead.
  if (!Number.isFinite(mm)) return `${metres.toExponential(3)} m`;
  const text = Math.abs(mm) >= 1e6 || (mm !== 0 && Math.abs(mm) < 1e-3) ? mm.toExponential(3) : String(Number(mm.toPrecision(4)));
  return `${text} mm`;
}

export interface PolygonResult {
  polygon?: Polygon;
  problems: SectionProblem[];
}

/**
 * A validated simple polygon. Accepts either orientation and returns it counter-clockwise;
 * repeated consecutive vertices and a repeated closing vertex are dropped. Refuses non-finite
 * coordinates, fewer than 3 distinct vertices, zero area and self-intersection (including edges
 * that touch or fold back on themselves).
 */
export function makePolygon(xs: ArrayLike<number>, ys: ArrayLike<number>, tag?: unknown): PolygonResult {
  if (xs.length !== ys.length) {
    return { problems: [problem('section.too-few-vertices', 'A polygon needs an x and a y for every vertex.', tag)] };
  }
  for (let i = 0; i < xs.length; i++) {
    if (!Number.isFinite(xs[i]) || !Number.isFinite(ys[i])) {
      return { problems: [problem('section.not-finite', `Polygon vertex ${i + 1} has a coordinate that is not a finite number.`, tag)] };
    }
  }
  if (xs.length > MAX_POLYGON_VERTICES) {
    return {
      problems: [problem('section.too-many-vertices', `A polygon may have at most ${MAX_POLYGON_VERTICES} vertices; this one has ${xs.length}.`, tag)],
    };
  }
  const px: number[] = [];
  const py: number[] = [];
  for (let i = 0; i < xs.length; i++) {
    const x = xs[i], y = ys[i];
    const n = px.length;
    if (n > 0 && px[n - 1] === x && py[n - 1] === y) continue;
    px.push(x);
    py.push(y);
  }
  while (px.length > 1 && px[0] === px[px.length - 1] && py[0] === py[py.length - 1]) {
    px.pop();
    py.pop();
  }
  const n = px.length;
  if (n < 3) {
    return { problems: [problem('section.too-few-vertices', `A polygon needs at least 3 distinct vertices; this one has ${n}.`, tag)] };
  }
  let minX = Infinity, maxX = -Infinity, minY = Infinity, maxY = -Infinity;
  for (let i = 0; i < n; i++) {
    minX = Math.min(minX, px[i]); maxX = Math.max(maxX, px[i]);
    minY = Math.min(minY, py[i]); maxY = Math.max(maxY, py[i]);
  }
  // Shoelace relative to the first vertex: well conditioned far from the origin.
  let twiceArea = 0;
  for (let i = 1; i < n - 1; i++) {
    twiceArea += (px[i] - px[0]) * (py[i + 1] - py[0]) - (px[i + 1] - px[0]) * (py[i] - py[0]);
  }
  const boxArea = (maxX - minX) * (maxY - minY);
  if (!(boxArea > 0) || allOnOneLine(px, py)) {
    return { problems: [problem('section.zero-area', 'The polygon encloses no area: its vertices lie on one line.', tag)] };
  }
  const crossing = findSelfIntersection(px, py);
  if (crossing !== undefined) {
    return {
      problems: [
        problem(
          'section.self-intersecting',
          `The polygon's outline crosses or touches itself (edges ${crossing[0] + 1} and ${crossing[1] + 1}); list the vertices in order around the boundary.`,
          tag,
        ),
      ],
    };
  }
  if (Math.abs(twiceArea) / 2 <= 1e-12 * boxArea) {
    return { problems: [problem('section.zero-area', 'The polygon encloses no area.', tag)] };
  }
  if (twiceArea < 0) {
    px.reverse();
    py.reverse();
  }
  return { polygon: { kind: 'polygon', xs: Float64Array.from(px), ys: Float64Array.from(py) }, problems: [] };
}

/** Whether every vertex lies on the line through the first vertex and the one farthest from it. */
function allOnOneLine(px: number[], py: number[]): boolean {
  let far = 0, farD = 0;
  for (let i = 1; i < px.length; i++) {
    const d = (px[i] - px[0]) ** 2 + (py[i] - py[0]) ** 2;
    if (d > farD) [far, farD] = [i, d];
  }
  const ux = px[far] - px[0], uy = py[far] - py[0];
  for (let i = 1; i < px.length; i++) {
    if (Math.abs(ux * (py[i] - py[0]) - uy * (px[i] - px[0])) > 1e-12 * farD) return false;
  }
  return true;
}

export interface CircleResult {
  circle?: Circle;
  problems: SectionProblem[];
}

export function makeCircle(cx: number, cy: number, r: number, tag?: unknown): CircleResult {
  if (!Number.isFinite(cx) || !Number.isFinite(cy) || !Number.isFinite(r)) {
    return { problems: [problem('section.not-finite', 'A circle needs a finite centre and radius.', tag)] };
  }
  if (!(r > 0)) {
    return { problems: [problem('section.bad-dimension', `A circle needs a diameter greater than zero (got ${formatLength(2 * r)}).`, tag)] };
  }
  return { circle: { kind: 'circle', cx, cy, r }, problems: [] };
}

function orient(ax: number, ay: number, bx: number, by: number, cx: number, cy: number): number {
  const d = (bx - ax) * (cy - ay) - (by - ay) * (cx - ax);
  return d > 0 ? 1 : d < 0 ? -1 : 0;
}

function onSegment(ax: number, ay: number, bx: number, by: number, px: number, py: number): boolean {
  return Math.min(ax, bx) <= px && px <= Math.max(ax, bx) && Math.min(ay, by) <= py && py <= Math.max(ay, by);
}

function segmentsTouch(
  ax: number, ay: number, bx: number, by: number,
  cx: number, cy: number, dx: number, dy: number,
): boolean {
  const o1 = orient(ax, ay, bx, by, cx, cy);
  const o2 = orient(ax, ay, bx, by, dx, dy);
  const o3 = orient(cx, cy, dx, dy, ax, ay);
  const o4 = orient(cx, cy, dx, dy, bx, by);
  if (o1 !== o2 && o3 !== o4) return true;
  if (o1 === 0 && onSegment(ax, ay, bx, by, cx, cy)) return true;
  if (o2 === 0 && onSegment(ax, ay, bx, by, dx, dy)) return true;
  if (o3 === 0 && onSegment(cx, cy, dx, dy, ax, ay)) return true;
  if (o4 === 0 && onSegment(cx, cy, dx, dy, bx, by)) return true;
  return false;
}

/**
 * The first pair of edges that cross or touch, other than neighbours meeting at their shared
 * vertex; neighbours that fold back along each other also count. Edges are swept in order of their
 * lowest point so only edges sharing a height band are compared.
 */
function findSelfIntersection(px: number[], py: number[]): [number, number] | undefined {
  const n = px.length;
  // Neighbouring edges folding back: collinear with opposite directions.
  for (let i = 0; i < n; i++) {
    const a = (i + n - 1) % n, b = i, c = (i + 1) % n;
    const cross = (px[b] - px[a]) * (py[c] - py[b]) - (py[b] - py[a]) * (px[c] - px[b]);
    const dot = (px[b] - px[a]) * (px[c] - px[b]) + (py[b] - py[a]) * (py[c] - py[b]);
    if (cross === 0 && dot < 0) return [a, b];
  }
  if (n === 3) return undefined;
  const order = Array.from({ length: n }, (_, i) => i);
  const lo = (e: number) => Math.min(py[e], py[(e + 1) % n]);
  const hi = (e: number) => Math.max(py[e], py[(e + 1) % n]);
  order.sort((e, f) => lo(e) - lo(f));
  const active: number[] = [];
  for (const e of order) {
    const eLo = lo(e);
    for (let k = active.length - 1; k >= 0; k--) {
      if (hi(active[k]) < eLo) active.splice(k, 1);
    }
    const e1 = (e + 1) % n;
    for (const f of active) {
      const f1 = (f + 1) % n;
      if (f1 === e || e1 === f) continue; // neighbours share a vertex by construction
      if (segmentsTouch(px[e], py[e], px[e1], py[e1], px[f], py[f], px[f1], py[f1])) {
        return e < f ? [e, f] : [f, e];
      }
    }
    active.push(e);
  }
  return undefined;
}

/** Signed area of a polygon given as coordinate arrays (positive when counter-clockwise). */
export function polygonArea(xs: ArrayLike<number>, ys: ArrayLike<number>): number {
  const n = xs.length;
  let s = 0;
  for (let i = 1; i < n - 1; i++) {
    s += (xs[i] - xs[0]) * (ys[i + 1] - ys[0]) - (xs[i + 1] - xs[0]) * (ys[i] - ys[0]);
  }
  return s / 2;
}

/** The extent of signed primitives: of the solid ones only, or of all; infinite bounds when there are none. */
export function extentOf(items: readonly { sign: number; shape: Primitive }[], solidOnly: boolean): { minX: number; maxX: number; minY: number; maxY: number } {
  let minX = Infinity, maxX = -Infinity, minY = Infinity, maxY = -Infinity;
  for (const { sign, shape: s } of items) {
    if (solidOnly && sign < 0) continue;
    if (s.kind === 'circle') {
      minX = Math.min(minX, s.cx - s.r); maxX = Math.max(maxX, s.cx + s.r);
      minY = Math.min(minY, s.cy - s.r); maxY = Math.max(maxY, s.cy + s.r);
    } else {
      for (let i = 0; i < s.xs.length; i++) {
        minX = Math.min(minX, s.xs[i]!); maxX = Math.max(maxX, s.xs[i]!);
        minY = Math.min(minY, s.ys[i]!); maxY = Math.max(maxY, s.ys[i]!);
      }
    }
  }
  return { minX, maxX, minY, maxY };
}
