/**
 * Shear and moment diagrams of a beam whose reactions are known, built by statics from the left
 * end as exact piecewise polynomials, with their extremes, zero-shear points and jumps, and the
 * functions that read them. Everything here works on plain data so that results survive structured
 * cloning (Float64Array coefficients do not survive JSON); {@link BeamDiagram} only adds methods.
 */

import { type LoadSet, loadMagnitude } from './loads';
import { SAME_SECTION_FRACTION } from './positions';
import type { SupportReactions } from './reactions';
import type {
  BeamDiagramData,
  CombinationFactor,
  DiagramJump,
  DiagramPiece,
  DiagramSamples,
  MomentPeak,
  Reaction,
  ShearPeak,
  Side,
  SupportKind,
  ZeroShear,
} from './types';

/**
 * Readings by x (shear at a support, reaction at x) match a section within this fraction of the
 * span. Positions were already gathered into sections at least this far apart (./positions.ts).
 */
export const LOOKUP_FRACTION = SAME_SECTION_FRACTION;
/** Breaks closer than this are one break; after gathering, only rounding can bring them this close. */
const MERGE_FRACTION = 1e-14;
/** Values below this fraction of the beam's force scale are rounding noise and read as zero. */
const ZERO_FRACTION = 1e-12;

export interface SupportPositions<Tag> {
  x: Float64Array;
  kind: SupportKind[];
  tag: (Tag | undefined)[];
}

export interface DiagramContent {
  pieces: DiagramPiece[];
  jumps: DiagramJump[];
  Vmax: ShearPeak;
  Mmax: MomentPeak;
  Mmin: MomentPeak;
  zeroShear: ZeroShear[];
  /** V and M just right of the right end; zero up to rounding when the reactions balance the loads. */
  closure: { V: number; M: number; forceScale: number };
}

/** Builds the diagrams of `loads` carried on supports with the given reactions. */
export function buildDiagram(
  span: number,
  supportX: Float64Array,
  reactions: SupportReactions,
  loads: LoadSet,
): DiagramContent {
  let forceScale = loadMagnitude(loads, span);
  for (let s = 0; s < supportX.length; s++) forceScale += Math.abs(reactions.R[s]!) + Math.abs(reactions.M[s]!) / span;
  // A floor far below any real force keeps the zero tests meaningful for subnormal inputs.
  forceScale = Math.max(forceScale, 1e-250);
  const zeroShear = ZERO_FRACTION * forceScale;
  const zeroMoment = zeroShear * span;
  const snapV = (v: number): number => (Math.abs(v) <= zeroShear ? 0 : v);
  const snapM = (m: number): number => (Math.abs(m) <= zeroMoment ? 0 : m);

  const breaks = mergedBreaks(span, supportX, loads);
  const breakCount = breaks.length;
  const pieceCount = breakCount - 1;
  const tolerance = MERGE_FRACTION * span;
  const indexOf = (x: number): number => nearestIndex(breaks, x);

  const shearJump = new Float64Array(breakCount);
  const momentJump = new Float64Array(breakCount);
  for (let s = 0; s < supportX.length; s++) {
    const k = indexOf(supportX[s]!);
    shearJump[k]! += reactions.R[s]!;
    momentJump[k]! -= reactions.M[s]!;
  }
  for (const p of loads.points) shearJump[indexOf(p.x)]! -= p.P;
  for (const c of loads.couples) momentJump[indexOf(c.x)]! += c.M;

  interface ActiveLine {
    x1: number;
    w1: number;
    slope: number;
    endIndex: number;
  }
  const startingAt: ActiveLine[][] = Array.from({ length: breakCount }, () => []);
  for (const l of loads.lines) {
    const startIndex = indexOf(l.x1);
    const endIndex = indexOf(l.x2);
    if (endIndex <= startIndex) {
      // Narrower than the merge tolerance: it acts as its resultant.
      shearJump[startIndex]! -= 0.5 * (l.w1 + l.w2) * (l.x2 - l.x1);
      continue;
    }
    startingAt[startIndex]!.push({ x1: l.x1, w1: l.w1, slope: (l.w2 - l.w1) / (l.x2 - l.x1), endIndex });
  }

  const pieces: DiagramPiece[] = new Array(pieceCount);
  const shearLeft = new Float64Array(breakCount);
  const momentLeft = new Float64Array(breakCount);
  let active: ActiveLine[] = [];
  for (let k = 0; k < pieceCount; k++) {
    active = active.filter((line) => line.endIndex > k);
    for (const line of startingAt[k]!) active.push(line);
    const x0 = breaks[k]!;
    const x1 = breaks[k + 1]!;
    let intensity = 0;
    let slope = 0;
    for (const line of active) {
      intensity += line.w1 + line.slope * (x0 - line.x1);
      slope += line.slope;
    }
    const V0 = snapV(shearLeft[k]! + shearJump[k]!);
    const M0 = snapM(momentLeft[k]! + momentJump[k]!);
    const shear = Float64Array.of(V0, -intensity, -slope / 2);
    const moment = Float64Array.of(M0, V0, -intensity / 2, -slope / 6);
    pieces[k] = { x0, x1, shear, moment };
    const length = x1 - x0;
    shearLeft[k + 1] = snapV(cubicValue(shear, length));
    momentLeft[k + 1] = snapM(cubicValue(moment, length));
  }
  const last = breakCount - 1;
  const closure = {
    V: shearLeft[last]! + shearJump[last]!,
    M: momentLeft[last]! + momentJump[last]!,
    forceScale,
  };

  const rightShear = (k: number): number => (k < pieceCount ? pieces[k]!.shear[0]! : 0);
  const rightMoment = (k: number): number => (k < pieceCount ? pieces[k]!.moment[0]! : 0);
  const jumps: DiagramJump[] = [];
  const shearJumps = new Uint8Array(breakCount);
  const momentJumps = new Uint8Array(breakCount);
  for (let k = 0; k < breakCount; k++) {
    const jump: DiagramJump = {
      x: breaks[k]!,
      shearLeft: shearLeft[k]!,
      shearRight: rightShear(k),
      momentLeft: momentLeft[k]!,
      momentRight: rightMoment(k),
    };
    const inShear = Math.abs(jump.shearRight - jump.shearLeft) > zeroShear;
    const inMoment = Math.abs(jump.momentRight - jump.momentLeft) > zeroMoment;
    if (inShear || inMoment) jumps.push(jump);
    // Sides are reported only inside the beam; outside it there is nothing to compare with.
    shearJumps[k] = inShear && k > 0 && k < last ? 1 : 0;
    momentJumps[k] = inMoment && k > 0 && k < last ? 1 : 0;
  }

  let Vmax: ShearPeak = { V: 0, x: 0 };
  const offerShear = (V: number, x: number, side?: Side): void => {
    if (Math.abs(V) > Math.abs(Vmax.V) * (1 + 1e-10) + zeroShear) Vmax = side ? { V, x, side } : { V, x };
  };
  let Mmax: MomentPeak | undefined;
  let Mmin: MomentPeak | undefined;
  const offerMoment = (M: number, x: number, side?: Side): void => {
    const margin = Math.abs(M) * 1e-10 + zeroMoment;
    if (!Mmax || M > Mmax.M + margin) Mmax = side ? { M, x, side } : { M, x };
    if (!Mmin || M < Mmin.M - margin) Mmin = side ? { M, x, side } : { M, x };
  };

  const zeros: ZeroShear[] = [];
  let openInterval: ZeroShear | undefined;
  for (let k = 0; k < pieceCount; k++) {
    const piece = pieces[k]!;
    const length = piece.x1 - piece.x0;
    const V0 = piece.shear[0]!;
    const c1 = piece.shear[1]!;
    const c2 = piece.shear[2]!;
    offerShear(V0, piece.x0, shearJumps[k] ? 'right' : undefined);
    offerMoment(piece.moment[0]!, piece.x0, momentJumps[k] ? 'right' : undefined);
    offerShear(shearLeft[k + 1]!, piece.x1, shearJumps[k + 1] ? 'left' : undefined);
    offerMoment(momentLeft[k + 1]!, piece.x1, momentJumps[k + 1] ? 'left' : undefined);
    if (c2 !== 0) {
      const t = -c1 / (2 * c2);
      if (t > 0 && t < length) offerShear(snapV(cubicValue(piece.shear, t)), piece.x0 + t);
    }

    if (k > 0 && shearLeft[k]! * V0 < 0) {
      const M = Math.abs(momentLeft[k]!) >= Math.abs(piece.moment[0]!) ? momentLeft[k]! : piece.moment[0]!;
      zeros.push({ x: piece.x0, kind: 'jump', M });
    }
    const flat = V0 === 0 && Math.abs(c1) * length <= zeroShear && Math.abs(c2) * length * length <= zeroShear;
    if (flat) {
      if (openInterval && openInterval.end === piece.x0) openInterval.end = piece.x1;
      else {
        openInterval = { x: piece.x0, kind: 'interval', end: piece.x1, M: piece.moment[0]! };
        zeros.push(openInterval);
      }
      continue;
    }
    for (const t of quadraticRootsIn(c2, c1, V0, length, tolerance)) {
      const x = piece.x0 + t;
      const M = snapM(cubicValue(piece.moment, t));
      offerMoment(M, x);
      if (x > tolerance && x < span - tolerance) zeros.push({ x, kind: 'crossing', M });
    }
  }

  return {
    pieces,
    jumps,
    Vmax,
    Mmax: Mmax ?? { M: 0, x: 0 },
    Mmin: Mmin ?? { M: 0, x: 0 },
    zeroShear: dedupeZeros(zeros, LOOKUP_FRACTION * span),
    closure,
  };
}

/** Every section where a load starts or stops or a concentrated action sits, merged and sorted. */
function mergedBreaks(span: number, supportX: Float64Array, loads: LoadSet): Float64Array {
  const raw: number[] = [0, span];
  for (const x of supportX) raw.push(x);
  for (const p of loads.points) raw.push(p.x);
  for (const c of loads.couples) raw.push(c.x);
  for (const l of loads.lines) raw.push(l.x1, l.x2);
  raw.sort((a, b) => a - b);
  const tolerance = MERGE_FRACTION * span;
  const merged: number[] = [];
  for (const x of raw) {
    const clamped = x < 0 ? 0 : x > span ? span : x;
    if (merged.length === 0 || clamped - merged[merged.length - 1]! > tolerance) merged.push(clamped);
  }
  merged[0] = 0;
  if (merged.length === 1) merged.push(span);
  merged[merged.length - 1] = span;
  return Float64Array.from(merged);
}

function nearestIndex(sorted: Float64Array, x: number): number {
  let lo = 0;
  let hi = sorted.length - 1;
  while (hi - lo > 1) {
    const mid = (lo + hi) >> 1;
    if (sorted[mid]! <= x) lo = mid;
    else hi = mid;
  }
  return Math.abs(sorted[hi]! - x) < Math.abs(x - sorted[lo]!) ? hi : lo;
}

export function cubicValue(c: Float64Array, t: number): number {
  let value = 0;
  for (let i = c.length - 1; i >= 0; i--) value = value * t + c[i]!;
  return value;
}

/**
 * Real roots of c2·t² + c1·t + c0 in [0, length], by the cancellation-free form of the quadratic
 * formula and one Newton step.
 */
export function quadraticRootsIn(c2: number, c1: number, c0: number, length: number, tolerance: number): number[] {
  const candidates: number[] = [];
  if (c2 === 0) {
    if (c1 !== 0) candidates.push(-c0 / c1);
  } else {
    let discriminant = c1 * c1 - 4 * c2 * c0;
    if (discriminant < 0 && discriminant > -1e-12 * c1 * c1) discriminant = 0;
    if (discriminant >= 0) {
      const q = -0.5 * (c1 + (c1 >= 0 ? 1 : -1) * Math.sqrt(discriminant));
      candidates.push(q / c2);
      if (q !== 0) candidates.push(c0 / q);
    }
  }
  const roots: number[] = [];
  const value = (t: number): number => c0 + t * (c1 + t * c2);
  for (let t of candidates) {
    const slope = c1 + 2 * c2 * t;
    if (slope !== 0) {
      // Near a double root the slope vanishes and a Newton step can throw t far away.
      const polished = t - value(t) / slope;
      if (Math.abs(value(polished)) < Math.abs(value(t))) t = polished;
    }
    if (!(t >= -tolerance && t <= length + tolerance)) continue;
    t = Math.min(Math.max(t, 0), length);
    if (!roots.some((r) => Math.abs(r - t) <= tolerance)) roots.push(t);
  }
  return roots.sort((a, b) => a - b);
}

function dedupeZeros(zeros: ZeroShear[], tolerance: number): ZeroShear[] {
  zeros.sort((a, b) => a.x - b.x);
  const kept: ZeroShear[] = [];
  for (const zero of zeros) {
    const previous = kept[kept.length - 1];
    if (previous && zero.x - (previous.end ?? previous.x) <= tolerance) {
      if (zero.kind !== 'interval') continue;
      if (previous.kind !== 'interval') kept.pop();
    }
    kept.push(zero);
  }
  return kept;
}

// ---------------------------------------------------------------------------------------------
// Reading a diagram. These accept the plain data, so they also work on cloned or parsed results.

type PieceHolder = Pick<BeamDiagramData, 'span' | 'pieces'>;

type Location = { at: 'outside' } | { at: 'inside'; piece: number } | { at: 'break'; index: number };

function locate(diagram: PieceHolder, x: number): Location {
  const { span, pieces } = diagram;
  const tolerance = LOOKUP_FRACTION * span;
  if (!Number.isFinite(x) || x < -tolerance || x > span + tolerance || pieces.length === 0) return { at: 'outside' };
  let lo = 0;
  let hi = pieces.length - 1;
  while (lo < hi) {
    const mid = (lo + hi + 1) >> 1;
    if (pieces[mid]!.x0 <= x) lo = mid;
    else hi = mid - 1;
  }
  const piece = pieces[lo]!;
  const toStart = Math.abs(x - piece.x0);
  const toEnd = Math.abs(piece.x1 - x);
  if (toStart <= tolerance && toStart <= toEnd) return { at: 'break', index: lo };
  if (toEnd <= tolerance) return { at: 'break', index: lo + 1 };
  return { at: 'inside', piece: lo };
}

function readAt(diagram: PieceHolder, x: number, side: Side | undefined, which: 'shear' | 'moment'): number {
  const where = locate(diagram, x);
  const { pieces } = diagram;
  if (where.at === 'outside') return 0;
  if (where.at === 'inside') {
    const piece = pieces[where.piece]!;
    return cubicValue(piece[which], x - piece.x0);
  }
  const k = where.index;
  const before = pieces[k - 1];
  const after = pieces[k];
  const left = before ? cubicValue(before[which], before.x1 - before.x0) : 0;
  const right = after ? after[which][0]! : 0;
  if (side === 'left') return left;
  if (side === 'right') return right;
  return Math.abs(right) > Math.abs(left) ? right : left;
}

/**
 * V at x. Where V jumps, `side` picks the value just left or right of x; without it the side with
 * the larger magnitude is returned (the left one on a tie), which is the value a design check
 * wants. Outside the beam (and for a non-finite x) V is 0.
 */
export function shearAt(diagram: PieceHolder, x: number, side?: Side): number {
  return readAt(diagram, x, side, 'shear');
}

/** M at x, with the same side rule as {@link shearAt} where an applied couple makes M jump. */
export function momentAt(diagram: PieceHolder, x: number, side?: Side): number {
  return readAt(diagram, x, side, 'moment');
}

/** The reaction of the support at x (within a billionth of the span), or undefined if none is there. */
export function reactionAt<Tag>(diagram: Pick<BeamDiagramData<Tag>, 'span' | 'reactions'>, x: number): Reaction<Tag> | undefined {
  const tolerance = LOOKUP_FRACTION * diagram.span;
  let best: Reaction<Tag> | undefined;
  for (const reaction of diagram.reactions) {
    const distance = Math.abs(reaction.x - x);
    if (distance <= tolerance && (!best || distance < Math.abs(best.x - x))) best = reaction;
  }
  return best;
}

/** Sections to draw at: n evenly spaced ones, the breakpoints and the extra points given. */
export function drawingSections(span: number, breaks: number[], extra: number[], n: number): number[] {
  const count = Number.isFinite(n) ? Math.min(Math.max(Math.floor(n), 2), 100_000) : 2;
  const tolerance = LOOKUP_FRACTION * span;
  const fixed = [...breaks, ...extra].filter((x) => x >= 0 && x <= span).sort((a, b) => a - b);
  const uniform: number[] = [];
  for (let i = 0; i < count; i++) uniform.push((span * i) / (count - 1));
  const all: number[] = [];
  let u = 0;
  for (const x of fixed) {
    while (u < uniform.length && uniform[u]! < x - tolerance) all.push(uniform[u++]!);
    while (u < uniform.length && uniform[u]! <= x + tolerance) u++;
    if (all.length === 0 || x - all[all.length - 1]! > tolerance) all.push(x);
  }
  while (u < uniform.length) all.push(uniform[u++]!);
  return all;
}

export function breakPositions(diagram: PieceHolder): number[] {
  const xs = diagram.pieces.map((p) => p.x0);
  if (diagram.pieces.length > 0) xs.push(diagram.pieces[diagram.pieces.length - 1]!.x1);
  return xs;
}

/** Diagram points for drawing; see {@link DiagramSamples} for the layout. */
export function sampleDiagram(
  diagram: PieceHolder & Pick<BeamDiagramData, 'zeroShear' | 'jumps'>,
  n: number,
): DiagramSamples {
  const extra: number[] = [];
  for (const zero of diagram.zeroShear) {
    extra.push(zero.x);
    if (zero.end !== undefined) extra.push(zero.end);
  }
  const sections = drawingSections(diagram.span, breakPositions(diagram), extra, n);
  const tolerance = LOOKUP_FRACTION * diagram.span;
  const xs: number[] = [];
  const V: number[] = [];
  const M: number[] = [];
  let nextJump = 0;
  for (const x of sections) {
    while (nextJump < diagram.jumps.length && diagram.jumps[nextJump]!.x < x - tolerance) nextJump++;
    const jump = diagram.jumps[nextJump];
    if (jump && Math.abs(jump.x - x) <= tolerance) {
      xs.push(x, x);
      V.push(jump.shearLeft, jump.shearRight);
      M.push(jump.momentLeft, jump.momentRight);
    } else {
      xs.push(x);
      V.push(shearAt(diagram, x));
      M.push(momentAt(diagram, x));
    }
  }
  return { x: Float64Array.from(xs), V: Float64Array.from(V), M: Float64Array.from(M) };
}

/**
 * One solved load set (a load case or a combination): plain data fields plus reading methods.
 * The methods delegate to {@link shearAt}, {@link momentAt}, {@link reactionAt} and
 * {@link sampleDiagram}, which also accept a cloned copy of the data.
 */
export class BeamDiagram<Tag = unknown> implements BeamDiagramData<Tag> {
  readonly name: string;
  readonly kind: 'group' | 'combination';
  readonly factors: CombinationFactor[];
  readonly span: number;
  readonly reactions: Reaction<Tag>[];
  readonly pieces: DiagramPiece[];
  readonly jumps: DiagramJump[];
  readonly Vmax: ShearPeak;
  readonly Mmax: MomentPeak;
  readonly Mmin: MomentPeak;
  readonly zeroShear: ZeroShear[];

  constructor(fields: BeamDiagramData<Tag>) {
    this.name = fields.name;
    this.kind = fields.kind;
    this.factors = fields.factors;
    this.span = fields.span;
    this.reactions = fields.reactions;
    this.pieces = fields.pieces;
    this.jumps = fields.jumps;
    this.Vmax = fields.Vmax;
    this.Mmax = fields.Mmax;
    this.Mmin = fields.Mmin;
    this.zeroShear = fields.zeroShear;
  }

  /** V at x; where V jumps, the side asked for, else the side with the larger magnitude. */
  shear(x: number, side?: Side): number {
    return shearAt(this, x, side);
  }

  /** M at x; where an applied couple makes M jump, the side asked for, else the larger magnitude. */
  moment(x: number, side?: Side): number {
    return momentAt(this, x, side);
  }

  reaction(x: number): Reaction<Tag> | undefined {
    return reactionAt(this, x);
  }

  sample(n: number): DiagramSamples {
    return sampleDiagram(this, n);
  }
}
