/**
 * Support reactions. Statically determinate beams (two pin/roller supports, or one fixed support
 * alone) are solved by equilibrium. Every other stable beam is solved by the direct stiffness
 * method for a prismatic Euler–Bernoulli beam: nodes at the beam ends and supports only, and each
 * load enters as the exact fixed-end (work-equivalent) forces of its element, obtained by
 * integrating the load against the element's Hermite cubics in closed form. For a prismatic
 * element those cubics are the exact deflected shapes of a unit end displacement, so by reciprocity
 * the fixed-end forces, and hence the reactions, are exact (to rounding) for point, partial uniform,
 * partial linearly varying and couple loads. EI is uniform and cancels, so it is taken as 1.
 *
 * An overhang (the free piece between a beam end and the nearest support) is statically
 * determinate: its loads reach the support as their resultant force and couple, and it adds no
 * stiffness. It is therefore condensed out by statics rather than given free end DOFs, whose
 * stiffness 12/L³ would swamp the rest of the matrix when the overhang is short (a support 1 µm
 * from the end of a 10 m beam left the equations unable to balance).
 */

import { type LoadSet, loadResultants } from './loads';

export interface SupportModel {
  /** Support positions, strictly increasing. */
  x: Float64Array;
  fixed: boolean[];
}

export interface SupportReactions {
  /** Upward force at each support, N. */
  R: Float64Array;
  /** Counterclockwise couple at each support, N·m (zero unless fixed). */
  M: Float64Array;
}

export interface ReactionSolver {
  readonly method: 'equilibrium' | 'stiffness';
  reactions(loads: LoadSet): SupportReactions;
}

/** Solver for a determinate support layout, or undefined when the layout is not determinate. */
export function equilibriumSolver(supports: SupportModel): ReactionSolver | undefined {
  const count = supports.x.length;
  const fixedCount = supports.fixed.filter(Boolean).length;
  if (count === 1 && fixedCount === 1) {
    const xf = supports.x[0]!;
    return {
      method: 'equilibrium',
      reactions(loads) {
        const { force, momentAboutOrigin } = loadResultants(loads);
        return { R: Float64Array.of(force), M: Float64Array.of(momentAboutOrigin - force * xf) };
      },
    };
  }
  if (count === 2 && fixedCount === 0) {
    const a = supports.x[0]!;
    const b = supports.x[1]!;
    const spacing = b - a;
    return {
      method: 'equilibrium',
      reactions(loads) {
        const { force, momentAboutOrigin } = loadResultants(loads);
        return {
          R: Float64Array.of((force * b - momentAboutOrigin) / spacing, (momentAboutOrigin - force * a) / spacing),
          M: new Float64Array(2),
        };
      },
    };
  }
  return undefined;
}

const HALF_BANDWIDTH = 3;

/**
 * Stiffness solver for any support layout that restrains the beam; undefined when the stiffness
 * matrix is singular (a mechanism). The factorisation is done once and reused for every load set.
 */
export function stiffnessSolver(span: number, supports: SupportModel): ReactionSolver | undefined {
  const nodeList: number[] = [];
  if (supports.x.length === 0 || supports.x[0]! > 0) nodeList.push(0);
  for (const x of supports.x) nodeList.push(x);
  if (nodeList[nodeList.length - 1]! < span) nodeList.push(span);
  const nodes = Float64Array.from(nodeList);
  const nodeCount = nodes.length;
  const elementCount = nodeCount - 1;
  if (elementCount < 1) return undefined;

  // Global DOFs: 2·node = deflection (up), 2·node + 1 = rotation (counterclockwise).
  const dofCount = 2 * nodeCount;
  const freeIndex = new Int32Array(dofCount).fill(-1);
  const supportNode = new Int32Array(supports.x.length);
  const restrained = new Uint8Array(dofCount);
  const firstSupportNode = nodeList[0] === supports.x[0] ? 0 : 1;
  for (let s = 0; s < supports.x.length; s++) {
    const node = s + firstSupportNode;
    supportNode[s] = node;
    restrained[2 * node] = 1;
    if (supports.fixed[s]) restrained[2 * node + 1] = 1;
  }
  // Overhang elements: the first when the beam starts before its first support, the last when it ends after its last.
  const leftOverhang = firstSupportNode === 1;
  const rightOverhang = supports.x.length === 0 || nodes[nodeCount - 1]! > supports.x[supports.x.length - 1]!;
  const isOverhang = (e: number): boolean => (e === 0 && leftOverhang) || (e === elementCount - 1 && rightOverhang);
  if (supports.x.length > 0) {
    // The free end of an overhang takes no part in the equations.
    if (leftOverhang) restrained[0] = restrained[1] = 1;
    if (rightOverhang) restrained[dofCount - 2] = restrained[dofCount - 1] = 1;
  }
  let freeCount = 0;
  for (let d = 0; d < dofCount; d++) if (!restrained[d]) freeIndex[d] = freeCount++;

  const lengths = new Float64Array(elementCount);
  for (let e = 0; e < elementCount; e++) lengths[e] = nodes[e + 1]! - nodes[e]!;

  const width = HALF_BANDWIDTH + 1;
  const band = new Float64Array(freeCount * width);
  const local = new Float64Array(16);
  for (let e = 0; e < elementCount; e++) {
    if (isOverhang(e)) continue;
    elementStiffness(lengths[e]!, local);
    for (let a = 0; a < 4; a++) {
      const i = freeIndex[2 * e + a]!;
      if (i < 0) continue;
      for (let b = 0; b < 4; b++) {
        const j = freeIndex[2 * e + b]!;
        if (j < 0 || j > i) continue;
        band[i * width + (i - j)]! += local[a * 4 + b]!;
      }
    }
  }
  if (!choleskyBanded(band, freeCount, width)) return undefined;

  return {
    method: 'stiffness',
    reactions(loads) {
      const elementLoads = new Float64Array(4 * elementCount);
      assembleElementLoads(loads, nodes, lengths, elementLoads);
      // An overhang's loads reach its support as their resultant, taken straight from the loads
      // (its work-equivalent end loads would carry a large couple as large cancelling forces).
      if (leftOverhang) overhangLoads(loads, nodes, 0, 1, elementLoads);
      if (rightOverhang) overhangLoads(loads, nodes, elementCount - 1, elementCount - 1, elementLoads);

      const rhs = new Float64Array(freeCount);
      for (let e = 0; e < elementCount; e++) {
        for (let a = 0; a < 4; a++) {
          const i = freeIndex[2 * e + a]!;
          if (i >= 0) rhs[i]! += elementLoads[4 * e + a]!;
        }
      }
      solveBanded(band, freeCount, width, rhs);
      const displacement = new Float64Array(dofCount);
      for (let d = 0; d < dofCount; d++) {
        const i = freeIndex[d]!;
        if (i >= 0) displacement[d] = rhs[i]!;
      }

      // Nodal force each support must supply: Σ over elements of (k·d − equivalent load).
      const nodal = new Float64Array(dofCount);
      for (let e = 0; e < elementCount; e++) {
        const stiff = !isOverhang(e);
        if (stiff) elementStiffness(lengths[e]!, local);
        for (let a = 0; a < 4; a++) {
          let endForce = -elementLoads[4 * e + a]!;
          if (stiff) for (let b = 0; b < 4; b++) endForce += local[a * 4 + b]! * displacement[2 * e + b]!;
          nodal[2 * e + a]! += endForce;
        }
      }
      const R = new Float64Array(supports.x.length);
      const M = new Float64Array(supports.x.length);
      for (let s = 0; s < supports.x.length; s++) {
        R[s] = nodal[2 * supportNode[s]!]!;
        M[s] = supports.fixed[s] ? nodal[2 * supportNode[s]! + 1]! : 0;
      }
      return { R, M };
    },
  };
}

function elementStiffness(L: number, out: Float64Array): void {
  const k1 = 12 / (L * L * L);
  const k2 = 6 / (L * L);
  const k3 = 4 / L;
  const k4 = 2 / L;
  out.set([k1, k2, -k1, k2, k2, k3, -k2, k4, -k1, -k2, k1, -k2, k2, k4, -k2, k3]);
}

/**
 * Hermite cubics of an element of length L in s = ξ/L, as power coefficients [s⁰, s¹, s², s³]:
 * deflection and rotation at the left end, deflection and rotation at the right end.
 */
function hermiteCoefficients(L: number): number[][] {
  return [
    [1, 0, -3, 2],
    [0, L, -2 * L, L],
    [0, 0, 3, -2],
    [0, 0, -L, L],
  ];
}

/**
 * Work-equivalent nodal loads (upward / counterclockwise positive) of every load, per element.
 * These are the negatives of the fixed-end forces.
 */
function assembleElementLoads(loads: LoadSet, nodes: Float64Array, lengths: Float64Array, out: Float64Array): void {
  const elementCount = lengths.length;
  for (const p of loads.points) {
    const e = elementAt(nodes, p.x);
    const L = lengths[e]!;
    const s = clampUnit((p.x - nodes[e]!) / L);
    const shapes = hermiteCoefficients(L);
    for (let a = 0; a < 4; a++) out[4 * e + a]! -= p.P * polyValue(shapes[a]!, s);
  }
  for (const c of loads.couples) {
    const e = elementAt(nodes, c.x);
    const L = lengths[e]!;
    const s = clampUnit((c.x - nodes[e]!) / L);
    const shapes = hermiteCoefficients(L);
    // A clockwise couple M does work −M·θ; θ = dv/dξ = (1/L)·dN/ds.
    for (let a = 0; a < 4; a++) out[4 * e + a]! -= (c.M * polySlope(shapes[a]!, s)) / L;
  }
  for (const l of loads.lines) {
    const slope = (l.w2 - l.w1) / (l.x2 - l.x1);
    for (let e = elementAt(nodes, l.x1); e < elementCount; e++) {
      const left = nodes[e]!;
      const right = nodes[e + 1]!;
      if (left >= l.x2) break;
      const a = Math.max(l.x1, left);
      const b = Math.min(l.x2, right);
      if (!(b > a)) continue;
      const L = lengths[e]!;
      const wa = l.w1 + slope * (a - l.x1);
      const wb = l.w1 + slope * (b - l.x1);
      const shapes = hermiteCoefficients(L);
      const sa = (a - left) / L;
      const h = (b - a) / L;
      for (let i = 0; i < 4; i++) out[4 * e + i]! -= L * integrateLinearTimesCubic(shapes[i]!, sa, h, wa, wb);
    }
  }
}

/**
 * Replaces the work-equivalent loads of overhang element e by the resultant of the loads it carries,
 * as an upward force and a counterclockwise couple at its support node (e or e + 1). Points and
 * couples belong to the element elementAt assigns them to, as in assembleElementLoads.
 */
function overhangLoads(loads: LoadSet, nodes: Float64Array, e: number, supportNode: number, out: Float64Array): void {
  const left = nodes[e]!, right = nodes[e + 1]!, about = nodes[supportNode]!;
  let force = 0, couple = 0;
  for (const p of loads.points) {
    if (elementAt(nodes, p.x) !== e) continue;
    force -= p.P;
    couple -= (p.x - about) * p.P;
  }
  for (const c of loads.couples) if (elementAt(nodes, c.x) === e) couple -= c.M;
  for (const l of loads.lines) {
    const a = Math.max(l.x1, left), b = Math.min(l.x2, right);
    if (!(b > a)) continue;
    const slope = (l.w2 - l.w1) / (l.x2 - l.x1);
    const wa = l.w1 + slope * (a - l.x1), wb = l.w1 + slope * (b - l.x1);
    const length = b - a, resultant = 0.5 * (wa + wb) * length;
    force -= resultant;
    couple -= resultant * (a - about) + (length * length * (wa + 2 * wb)) / 6;
  }
  out.fill(0, 4 * e, 4 * e + 4);
  const at = 4 * e + 2 * (supportNode - e);
  out[at] = force;
  out[at + 1] = couple;
}

/**
 * ∫ w(s)·N(s) ds over [sa, sa + h] with w linear from wa to wb and N cubic, in closed form.
 * N is re-expanded about sa so that every term is a positive power of h (no cancellation for
 * narrow loads).
 */
export function integrateLinearTimesCubic(n: number[], sa: number, h: number, wa: number, wb: number): number {
  const [n0, n1, n2, n3] = n as [number, number, number, number];
  const d0 = n0 + sa * (n1 + sa * (n2 + sa * n3));
  const d1 = n1 + sa * (2 * n2 + 3 * sa * n3);
  const d2 = n2 + 3 * sa * n3;
  const d3 = n3;
  const uniform = h * (d0 + h * (d1 / 2 + h * (d2 / 3 + (h * d3) / 4)));
  const rising = h * (d0 / 2 + h * (d1 / 3 + h * (d2 / 4 + (h * d3) / 5)));
  return wa * uniform + (wb - wa) * rising;
}

function polyValue(c: number[], s: number): number {
  return c[0]! + s * (c[1]! + s * (c[2]! + s * c[3]!));
}

function polySlope(c: number[], s: number): number {
  return c[1]! + s * (2 * c[2]! + 3 * s * c[3]!);
}

function clampUnit(s: number): number {
  return s < 0 ? 0 : s > 1 ? 1 : s;
}

/** Index of the element containing x (the left one at an interior node). */
function elementAt(nodes: Float64Array, x: number): number {
  let lo = 0;
  let hi = nodes.length - 2;
  while (lo < hi) {
    const mid = (lo + hi + 1) >> 1;
    if (nodes[mid]! < x) lo = mid;
    else hi = mid - 1;
  }
  return lo;
}

/** In-place banded Cholesky (lower band, row-major, width = half bandwidth + 1). */
function choleskyBanded(band: Float64Array, n: number, width: number): boolean {
  const hb = width - 1;
  for (let i = 0; i < n; i++) {
    for (let j = Math.max(0, i - hb); j <= i; j++) {
      let sum = band[i * width + (i - j)]!;
      for (let k = Math.max(0, i - hb); k < j; k++) sum -= band[i * width + (i - k)]! * band[j * width + (j - k)]!;
      if (i === j) {
        const original = band[i * width]!;
        if (!(sum > 1e-12 * original) || !Number.isFinite(sum)) return false;
        band[i * width] = Math.sqrt(sum);
      } else {
        band[i * width + (i - j)] = sum / band[j * width]!;
      }
    }
  }
  return true;
}

function solveBanded(band: Float64Array, n: number, width: number, rhs: Float64Array): void {
  const hb = width - 1;
  for (let i = 0; i < n; i++) {
    let sum = rhs[i]!;
    for (let k = Math.max(0, i - hb); k < i; k++) sum -= band[i * width + (i - k)]! * rhs[k]!;
    rhs[i] = sum / band[i * width]!;
  }
  for (let i = n - 1; i >= 0; i--) {
    let sum = rhs[i]!;
    for (let k = i + 1; k <= Math.min(n - 1, i + hb); k++) sum -= band[k * width + (k - i)]! * rhs[k]!;
    rhs[i] = sum / band[i * width]!;
  }
}
