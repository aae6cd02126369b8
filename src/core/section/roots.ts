/**
 * Root finding for the stationary points of Q(y)/t(y). On a polygon slab the condition is a cubic,
 * solved in closed form; the closed-form roots are then confirmed and polished inside the monotone
 * pieces of the cubic (whose ends come from the closed-form roots of its derivative), so a nearly
 * degenerate cubic cannot lose or invent a root in the interval. On slabs with circular arcs the
 * condition is transcendental and a bracketed Brent solve is used.
 */

/** Real roots of a x² + b x + c, without cancellation; a = 0 degrades to the linear case. */
export function quadraticRoots(a: number, b: number, c: number): number[] {
  if (a === 0) {
    if (b === 0) return [];
    return [-c / b];
  }
  const disc = b * b - 4 * a * c;
  if (disc < 0) return [];
  if (disc === 0) return [-b / (2 * a)];
  const q = -0.5 * (b + Math.sign(b || 1) * Math.sqrt(disc));
  const r1 = q / a;
  const r2 = q !== 0 ? c / q : -r1;
  return r1 < r2 ? [r1, r2] : [r2, r1];
}

/** Real roots of a x³ + b x² + c x + d in closed form (Cardano or the trigonometric form). */
export function cubicRoots(a: number, b: number, c: number, d: number): number[] {
  if (a === 0) return quadraticRoots(b, c, d);
  const B = b / a, C = c / a, D = d / a;
  const p = C - (B * B) / 3;
  const q = (2 * B * B * B) / 27 - (B * C) / 3 + D;
  const shift = -B / 3;
  const disc = (q * q) / 4 + (p * p * p) / 27;
  if (!Number.isFinite(disc)) return quadraticRoots(b, c, d);
  if (disc > 0) {
    const s = Math.sqrt(disc);
    const u = Math.cbrt(-q / 2 - Math.sign(q || 1) * s);
    const t = u !== 0 ? u - p / (3 * u) : 0;
    return [t + shift];
  }
  if (p === 0) return [shift];
  const m = 2 * Math.sqrt(-p / 3);
  const arg = Math.max(-1, Math.min(1, (3 * q) / (p * m)));
  const theta = Math.acos(arg) / 3;
  const roots = [0, 1, 2].map((k) => m * Math.cos(theta - (2 * Math.PI * k) / 3) + shift);
  return roots.sort((x, y) => x - y);
}

function cubicAt(c0: number, c1: number, c2: number, c3: number, z: number): number {
  return ((c3 * z + c2) * z + c1) * z + c0;
}

/**
 * The roots in [0, 1] of c3 z³ + c2 z² + c1 z + c0, each to machine precision. Each monotone piece
 * of [0, 1] holds at most one root; it is taken from the closed form when that lands inside the
 * piece with a consistent sign, and polished by safeguarded Newton steps.
 */
export function cubicRootsInUnit(c0: number, c1: number, c2: number, c3: number): number[] {
  const scale = Math.max(Math.abs(c0), Math.abs(c1), Math.abs(c2), Math.abs(c3));
  if (!(scale > 0) || !Number.isFinite(scale)) return [];
  c0 /= scale; c1 /= scale; c2 /= scale; c3 /= scale;
  const closed = cubicRoots(c3, c2, c1, c0);
  const cuts = [0];
  for (const z of quadraticRoots(3 * c3, 2 * c2, c1)) if (z > 0 && z < 1) cuts.push(z);
  cuts.push(1);
  cuts.sort((x, y) => x - y);
  const roots: number[] = [];
  for (let i = 0; i + 1 < cuts.length; i++) {
    const lo = cuts[i], hi = cuts[i + 1];
    const flo = cubicAt(c0, c1, c2, c3, lo), fhi = cubicAt(c0, c1, c2, c3, hi);
    if (flo === 0) { roots.push(lo); continue; }
    if (fhi === 0) { if (i + 2 === cuts.length) roots.push(hi); continue; }
    if (flo > 0 === fhi > 0) continue;
    let guess = (lo + hi) / 2;
    for (const z of closed) if (z > lo && z < hi) guess = z;
    roots.push(safeNewton((z) => cubicAt(c0, c1, c2, c3, z), (z) => (3 * c3 * z + 2 * c2) * z + c1, lo, hi, flo, guess));
  }
  return roots;
}

/** Newton's method kept inside a sign-changing bracket, falling back to bisection when it strays. */
function safeNewton(f: (z: number) => number, df: (z: number) => number, lo: number, hi: number, flo: number, guess: number): number {
  let a = lo, b = hi;
  const aNegative = flo < 0;
  let z = guess;
  for (let it = 0; it < 100; it++) {
    const fz = f(z);
    if (fz === 0) return z;
    if (fz < 0 === aNegative) a = z; else b = z;
    const step = fz / df(z);
    let next = z - step;
    if (!(next > a && next < b)) next = (a + b) / 2;
    if (Math.abs(next - z) <= 4 * Number.EPSILON * Math.max(1, Math.abs(z)) || b - a <= 4 * Number.EPSILON) return next;
    z = next;
  }
  return z;
}

/** Brent's method on a bracket [a, b] with f(a), f(b) of opposite sign, to machine precision. */
export function brent(f: (x: number) => number, a: number, b: number, fa: number, fb: number): number {
  if (fa === 0) return a;
  if (fb === 0) return b;
  let c = a, fc = fa, d = b - a, e = d;
  for (let it = 0; it < 200; it++) {
    if (fb > 0 === fc > 0) {
      c = a; fc = fa; d = b - a; e = d;
    }
    if (Math.abs(fc) < Math.abs(fb)) {
      a = b; b = c; c = a;
      fa = fb; fb = fc; fc = fa;
    }
    const tol = 2 * Number.EPSILON * Math.abs(b) + 1e-300;
    const m = (c - b) / 2;
    if (Math.abs(m) <= tol || fb === 0) return b;
    if (Math.abs(e) >= tol && Math.abs(fa) > Math.abs(fb)) {
      let p: number, q: number;
      const s = fb / fa;
      if (a === c) {
        p = 2 * m * s;
        q = 1 - s;
      } else {
        const qa = fa / fc, r = fb / fc;
        p = s * (2 * m * qa * (qa - r) - (b - a) * (r - 1));
        q = (qa - 1) * (r - 1) * (s - 1);
      }
      if (p > 0) q = -q; else p = -p;
      if (2 * p < Math.min(3 * m * q - Math.abs(tol * q), Math.abs(e * q))) {
        e = d;
        d = p / q;
      } else {
        d = m; e = m;
      }
    } else {
      d = m; e = m;
    }
    a = b; fa = fb;
    b += Math.abs(d) > tol ? d : m > 0 ? tol : -tol;
    fb = f(b);
  }
  return b;
}
