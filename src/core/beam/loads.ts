/**
 * Loads in the one internal form the solver works with, and their exact resultants.
 * A udl is a line load with equal end intensities; every value keeps the public signs
 * (forces and intensities downward, couples clockwise).
 */

export interface PointForce {
  x: number;
  P: number;
}

export interface LineLoad {
  x1: number;
  x2: number;
  w1: number;
  w2: number;
}

export interface Couple {
  x: number;
  M: number;
}

export interface LoadSet {
  points: PointForce[];
  lines: LineLoad[];
  couples: Couple[];
}

export function emptyLoadSet(): LoadSet {
  return { points: [], lines: [], couples: [] };
}

/** Appends `factor` times every load of `source` to `target`. */
export function addScaled(target: LoadSet, source: LoadSet, factor: number): void {
  for (const p of source.points) target.points.push({ x: p.x, P: factor * p.P });
  for (const l of source.lines) target.lines.push({ x1: l.x1, x2: l.x2, w1: factor * l.w1, w2: factor * l.w2 });
  for (const c of source.couples) target.couples.push({ x: c.x, M: factor * c.M });
}

/**
 * Total downward force and its moment about x = 0 (clockwise positive, applied couples included).
 * Integrals are closed form: a linear intensity over [x1, x2] of length L carries
 * (w1 + w2)L/2 with moment about x1 equal to L²(w1 + 2w2)/6.
 */
export function loadResultants(loads: LoadSet): { force: number; momentAboutOrigin: number } {
  let force = 0;
  let moment = 0;
  for (const p of loads.points) {
    force += p.P;
    moment += p.P * p.x;
  }
  for (const l of loads.lines) {
    const length = l.x2 - l.x1;
    const resultant = 0.5 * (l.w1 + l.w2) * length;
    force += resultant;
    moment += resultant * l.x1 + (length * length * (l.w1 + 2 * l.w2)) / 6;
  }
  for (const c of loads.couples) moment += c.M;
  return { force, momentAboutOrigin: moment };
}

/** Sum of magnitudes, used only to scale "is this zero" tolerances. */
export function loadMagnitude(loads: LoadSet, span: number): number {
  let total = 0;
  for (const p of loads.points) total += Math.abs(p.P);
  for (const l of loads.lines) total += 0.5 * (Math.abs(l.w1) + Math.abs(l.w2)) * (l.x2 - l.x1);
  for (const c of loads.couples) total += Math.abs(c.M) / span;
  return total;
}
