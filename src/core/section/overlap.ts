/**
 * Validation of how parts sit together, by polygon clipping. Circles are replaced by fine regular
 * polygons here only; the section properties never see these approximations. Each approximation is
 * chosen on the lenient side (a region is made slightly smaller when testing for overlap and
 * slightly larger when testing for containment), so tangent circles and holes drilled right at an
 * edge are never reported by mistake.
 */
import polygonClipping from 'polygon-clipping';
import type { MultiPolygon, Pair, Polygon as ClipPolygon, Ring } from 'polygon-clipping';
import type { Part, Primitive, SectionProblem } from './primitives';
import { extentOf, problem } from './primitives';

/** Segments of a circle's stand-in polygon; a multiple of 4 so its extreme points are vertices. */
const CIRCLE_SEGMENTS = 128;
/** Overlap (or protrusion) area below this fraction of the smaller area counts as touching. */
const RELATIVE_AREA_TOLERANCE = 1e-9;

export interface ValidationItem {
  part: Part;
  hole: boolean;
  tag?: unknown;
}

/** Maps metres to a frame centred on the section and scaled to about unit size, where clipping is best conditioned. */
interface Frame {
  x0: number;
  y0: number;
  scale: number;
}

type Size = 'small' | 'large';

function ring(shape: Primitive, frame: Frame, size: Size): Ring {
  const out: Pair[] = [];
  if (shape.kind === 'polygon') {
    for (let i = 0; i < shape.xs.length; i++) out.push([(shape.xs[i] - frame.x0) / frame.scale, (shape.ys[i] - frame.y0) / frame.scale]);
    return out;
  }
  const n = CIRCLE_SEGMENTS;
  const step = (2 * Math.PI) / n;
  // Inscribed: vertices on the circle. Circumscribed: edges tangent to it at the same extreme points.
  const r = size === 'small' ? shape.r : shape.r / Math.cos(step / 2);
  const phase = size === 'small' ? 0 : step / 2;
  const cx = (shape.cx - frame.x0) / frame.scale, cy = (shape.cy - frame.y0) / frame.scale, rs = r / frame.scale;
  for (let k = 0; k < n; k++) out.push([cx + rs * Math.cos(phase + k * step), cy + rs * Math.sin(phase + k * step)]);
  return out;
}

/** The material of one part: its solids (union) less its voids. */
function region(part: Part, frame: Frame, size: Size): MultiPolygon {
  const voidSize: Size = size === 'small' ? 'large' : 'small';
  const solids: ClipPolygon[] = [];
  const voids: ClipPolygon[] = [];
  for (const item of part) {
    if (item.sign > 0) solids.push([ring(item.shape, frame, size)]);
    else voids.push([ring(item.shape, frame, voidSize)]);
  }
  if (solids.length === 0) return [];
  let material: MultiPolygon = solids.length === 1 && voids.length === 0 ? [solids[0]] : polygonClipping.union(solids[0], ...solids.slice(1));
  if (voids.length) material = polygonClipping.difference(material, ...voids);
  return material;
}

function ringArea(r: Ring): number {
  let s = 0;
  const n = r.length;
  for (let i = 0; i < n; i++) {
    const [x1, y1] = r[i];
    const [x2, y2] = r[(i + 1) % n];
    s += x1 * y2 - x2 * y1;
  }
  return s / 2;
}

export function multiPolygonArea(mp: MultiPolygon): number {
  let a = 0;
  for (const poly of mp) {
    poly.forEach((r, i) => {
      const ra = Math.abs(ringArea(r));
      a += i === 0 ? ra : -ra;
    });
  }
  return a;
}

interface Box {
  minX: number;
  maxX: number;
  minY: number;
  maxY: number;
}

function boxOf(part: Part): Box {
  return extentOf(part, false);
}

/** Whether two boxes share an area (not just an edge), up to a tolerance in metres. */
function boxesOverlap(a: Box, b: Box, tol: number): boolean {
  return Math.min(a.maxX, b.maxX) - Math.max(a.minX, b.minX) > tol && Math.min(a.maxY, b.maxY) - Math.max(a.minY, b.minY) > tol;
}

/** Whether a counter-clockwise polygon is convex (collinear vertices allowed). */
function isConvex(xs: Float64Array, ys: Float64Array): boolean {
  const n = xs.length;
  for (let i = 0; i < n; i++) {
    const j = (i + 1) % n, k = (i + 2) % n;
    if ((xs[j] - xs[i]) * (ys[k] - ys[j]) - (ys[j] - ys[i]) * (xs[k] - xs[j]) < 0) return false;
  }
  return true;
}

/**
 * Whether `inner` lies inside the convex primitive `outer`, with `margin` to spare (a negative
 * margin lets it touch, or poke out by rounding). Exact geometry: no clipping needed.
 */
function convexContains(outer: Primitive, inner: Primitive, margin: number): boolean {
  if (outer.kind === 'circle') {
    const reach = outer.r - margin;
    if (inner.kind === 'circle') return Math.hypot(inner.cx - outer.cx, inner.cy - outer.cy) + inner.r <= reach;
    for (let i = 0; i < inner.xs.length; i++) if (Math.hypot(inner.xs[i] - outer.cx, inner.ys[i] - outer.cy) > reach) return false;
    return true;
  }
  const { xs, ys } = outer;
  const n = xs.length;
  for (let e = 0; e < n; e++) {
    const f = (e + 1) % n;
    const ex = xs[f] - xs[e], ey = ys[f] - ys[e];
    const len = Math.hypot(ex, ey);
    if (len === 0) continue;
    // Signed distance to the left of edge e (the inside of a counter-clockwise polygon).
    const inside = (px: number, py: number) => (ex * (py - ys[e]) - ey * (px - xs[e])) / len;
    if (inner.kind === 'circle') {
      if (inside(inner.cx, inner.cy) < inner.r + margin) return false;
    } else {
      for (let i = 0; i < inner.xs.length; i++) if (inside(inner.xs[i], inner.ys[i]) < margin) return false;
    }
  }
  return true;
}

/** The single solid primitive of a part when it is convex (a plate, a circle, the outside of a box or tube). */
function convexSolid(part: Part): Primitive | undefined {
  const solids = part.filter((p) => p.sign > 0);
  if (solids.length !== 1) return undefined;
  const s = solids[0].shape;
  return s.kind === 'circle' || isConvex(s.xs, s.ys) ? s : undefined;
}

/** An axis-aligned rectangle part with no voids, as its box. */
function rectangleOf(part: Part): Box | undefined {
  if (part.length !== 1 || part[0].sign < 0 || part[0].shape.kind !== 'polygon') return undefined;
  const { xs, ys } = part[0].shape;
  if (xs.length !== 4) return undefined;
  for (let i = 0; i < 4; i++) {
    const j = (i + 1) % 4;
    if (xs[i] !== xs[j] && ys[i] !== ys[j]) return undefined;
  }
  return boxOf(part);
}

/** Whether rectangles (given as indices into boxes) form one piece, joined along edges of positive length. */
function rectanglesConnected(boxes: Box[], tol: number): boolean {
  const n = boxes.length;
  const seen = new Uint8Array(n);
  const stack = [0];
  seen[0] = 1;
  let count = 1;
  const shareEdge = (a: Box, b: Box) => {
    const ox = Math.min(a.maxX, b.maxX) - Math.max(a.minX, b.minX);
    const oy = Math.min(a.maxY, b.maxY) - Math.max(a.minY, b.minY);
    return (ox > tol && Math.abs(oy) <= tol) || (oy > tol && Math.abs(ox) <= tol);
  };
  while (stack.length) {
    const i = stack.pop()!;
    for (let j = 0; j < n; j++) {
      if (!seen[j] && shareEdge(boxes[i], boxes[j])) {
        seen[j] = 1;
        count++;
        stack.push(j);
      }
    }
  }
  return count === n;
}

/**
 * Geometry problems of a list of parts: a part's voids outside its solids, overlapping solid
 * parts, holes not fully inside material, overlapping holes (all errors); material in more than
 * one piece (a warning). `areas` are the net areas of the parts, exact, in m².
 */
export function validateLayout(items: readonly ValidationItem[], areas: readonly number[]): SectionProblem[] {
  const problems: SectionProblem[] = [];
  const boxes = items.map((it) => boxOf(it.part));
  let minX = Infinity, maxX = -Infinity, minY = Infinity, maxY = -Infinity;
  for (const b of boxes) {
    minX = Math.min(minX, b.minX); maxX = Math.max(maxX, b.maxX);
    minY = Math.min(minY, b.minY); maxY = Math.max(maxY, b.maxY);
  }
  const scale = Math.max(maxX - minX, maxY - minY);
  const frame: Frame = { x0: (minX + maxX) / 2, y0: (minY + maxY) / 2, scale };
  const toFrameArea = (a: number) => a / (scale * scale);
  const boxTol = 1e-12 * scale;
  try {
    // A part's own voids must lie inside its own solids (guaranteed by the shape constructors; parts can also be built by hand).
    items.forEach((it, i) => {
      if (!it.part.some((p) => p.sign < 0)) return;
      const convex = convexSolid(it.part);
      if (convex && it.part.every((p) => p.sign > 0 || convexContains(convex, p.shape, -boxTol))) return;
      const voids = it.part.filter((p) => p.sign < 0).map((p) => [ring(p.shape, frame, 'small')] as ClipPolygon);
      const solids = it.part.filter((p) => p.sign > 0).map((p) => [ring(p.shape, frame, 'large')] as ClipPolygon);
      if (solids.length === 0) {
        problems.push(problem('section.void-outside', 'This part removes material but has none of its own.', it.tag));
        return;
      }
      const allVoids: MultiPolygon = voids.length === 1 ? [voids[0]] : polygonClipping.union(voids[0], ...voids.slice(1));
      const outside = multiPolygonArea(polygonClipping.difference(allVoids, ...solids));
      if (outside > RELATIVE_AREA_TOLERANCE * toFrameArea(Math.abs(areas[i]) || 1)) {
        problems.push(problem('section.void-outside', "This part's void is not inside its own material.", it.tag));
      }
    });
    if (problems.length) return problems;

    const solidIdx = items.map((_, i) => i).filter((i) => !items[i].hole);
    const holeIdx = items.map((_, i) => i).filter((i) => items[i].hole);
    const small = new Map<number, MultiPolygon>();
    const smallRegion = (i: number) => {
      let r = small.get(i);
      if (!r) small.set(i, (r = region(items[i].part, frame, 'small')));
      return r;
    };

    for (let jj = 0; jj < solidIdx.length; jj++) {
      const j = solidIdx[jj];
      for (let ii = 0; ii < jj; ii++) {
        const i = solidIdx[ii];
        if (!boxesOverlap(boxes[i], boxes[j], boxTol)) continue;
        const shared = multiPolygonArea(polygonClipping.intersection(smallRegion(i), smallRegion(j)));
        if (shared > RELATIVE_AREA_TOLERANCE * toFrameArea(Math.min(areas[i], areas[j]))) {
          problems.push(
            problem(
              'section.overlap',
              `This part overlaps part ${i + 1} by ${percent(shared, toFrameArea(Math.min(areas[i], areas[j])))} of the smaller one; solid parts may touch along an edge but not overlap (use hole to cut one out of another).`,
              items[j].tag,
            ),
          );
          break;
        }
      }
    }

    // Holes lying wholly inside one convex solid part, clear of its voids: decided exactly, without clipping.
    const convexSolids = new Map<number, Primitive | undefined>(solidIdx.map((i) => [i, convexSolid(items[i].part)]));
    const holeHost = (h: number, margin: number): number | undefined => {
      const own = items[h].part.filter((p) => p.sign > 0);
      for (const j of solidIdx) {
        const host = convexSolids.get(j);
        if (!host || !own.every((p) => convexContains(host, p.shape, margin))) continue;
        const voids = items[j].part.filter((p) => p.sign < 0);
        if (voids.every((v) => !boxesOverlap(boxOf([v]), boxes[h], -margin))) return j;
      }
      return undefined;
    };
    if (holeIdx.length) {
      let material: MultiPolygon | undefined;
      for (const h of holeIdx) {
        if (holeHost(h, -boxTol) !== undefined) continue;
        if (!material) {
          const large = solidIdx.map((i) => region(items[i].part, frame, 'large')).filter((r) => r.length > 0);
          material = large.length === 0 ? [] : large.length === 1 ? large[0] : polygonClipping.union(large[0], ...large.slice(1));
        }
        const hole = smallRegion(h);
        const outside = material.length ? multiPolygonArea(polygonClipping.difference(hole, material)) : multiPolygonArea(hole);
        const holeArea = toFrameArea(Math.abs(areas[h]));
        if (outside > RELATIVE_AREA_TOLERANCE * holeArea) {
          problems.push(
            problem(
              'section.hole-outside',
              `This hole is not fully inside the material: ${percent(outside, holeArea)} of it lies outside the solid parts or inside another void.`,
              items[h].tag,
            ),
          );
        }
      }
      for (let jj = 0; jj < holeIdx.length; jj++) {
        const j = holeIdx[jj];
        for (let ii = 0; ii < jj; ii++) {
          const i = holeIdx[ii];
          if (!boxesOverlap(boxes[i], boxes[j], boxTol)) continue;
          const a = items[i].part, b = items[j].part;
          if (a.length === 1 && b.length === 1 && a[0].shape.kind === 'circle' && b[0].shape.kind === 'circle') {
            const ca = a[0].shape, cb = b[0].shape;
            if (Math.hypot(ca.cx - cb.cx, ca.cy - cb.cy) >= ca.r + cb.r - boxTol) continue;
          }
          const shared = multiPolygonArea(polygonClipping.intersection(smallRegion(i), smallRegion(j)));
          if (shared > RELATIVE_AREA_TOLERANCE * toFrameArea(Math.min(Math.abs(areas[i]), Math.abs(areas[j])))) {
            problems.push(problem('section.hole-overlap', `This hole overlaps hole ${holeIdx.indexOf(i) + 1}; draw them as one hole or move them apart.`, items[j].tag));
            break;
          }
        }
      }
    }
    if (problems.length) return problems;

    // One piece? Only worth asking when there is more than one part or a hole could cut a part in two.
    // Rectangles joined edge to edge (a welded or glued built-up member), with any holes strictly inside one
    // convex part, are one piece; only other layouts need the union.
    const rectangles = solidIdx.map((i) => rectangleOf(items[i].part));
    const simple =
      rectangles.every((r) => r !== undefined) &&
      rectanglesConnected(rectangles as Box[], boxTol) &&
      holeIdx.every((h) => holeHost(h, 1e-9 * scale) !== undefined) &&
      holeIdx.every((h, k) => holeIdx.slice(0, k).every((g) => !boxesOverlap(boxes[g], boxes[h], -1e-9 * scale)));
    if (items.length > 1 && !simple) {
      const solidRegions = solidIdx.map((i) => smallRegion(i)).filter((r) => r.length > 0);
      const holeRegions = holeIdx.map((i) => smallRegion(i)).filter((r) => r.length > 0);
      let net: MultiPolygon = solidRegions.length === 1 ? solidRegions[0] : polygonClipping.union(solidRegions[0], ...solidRegions.slice(1));
      if (holeRegions.length) net = polygonClipping.difference(net, ...holeRegions);
      if (net.length > 1) {
        problems.push(
          problem(
            'section.disconnected',
            `The material is in ${net.length} separate pieces; tau = VQ/(It) treats them as one beam, which holds only if they are connected elsewhere.`,
            undefined,
            'warning',
          ),
        );
      }
    } else if (items[0].part.filter((p) => p.sign > 0).length > 1 && region(items[0].part, frame, 'small').length > 1) {
      problems.push(problem('section.disconnected', 'The material is in separate pieces.', items[0].tag, 'warning'));
    }
  } catch {
    problems.push(
      problem(
        'section.check-incomplete',
        'The check that parts do not overlap could not be completed for this geometry; results assume the parts do not overlap.',
        undefined,
        'warning',
      ),
    );
  }
  return problems;
}

function percent(part: number, whole: number): string {
  const p = (100 * part) / whole;
  return p >= 0.1 ? `${Number(p.toPrecision(3))} %` : 'a small fraction';
}
