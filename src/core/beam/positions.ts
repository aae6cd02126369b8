/**
 * Positions closer together than a billionth of the span are one section. Units conversions and
 * arithmetic in a note leave positions like 6 m and 5.999999999999999 m that the engineer means to
 * be the same; treating them as one section keeps loads on a support on that support, and keeps
 * every diagram piece long enough that reading V "just left of x" is unambiguous.
 */

export const SAME_SECTION_FRACTION = 1e-9;

/** Rank of a position when a cluster picks the one that stands for it: ends, then supports, then loads. */
export const ANCHOR = { load: 0, support: 1, end: 2 } as const;
export type Anchor = (typeof ANCHOR)[keyof typeof ANCHOR];

interface Cluster {
  first: number;
  last: number;
  representative: number;
  anchor: Anchor;
}

/**
 * Groups positions within `tolerance` of each other and returns a function giving the position
 * that stands for each one: a beam end if one is in its group, else a support, else the smallest.
 * Representatives end up more than `tolerance` apart, so a reading at any x matches at most one.
 */
export function sectionSnapper(positions: { x: number; anchor: Anchor }[], tolerance: number): (x: number) => number {
  const sorted = [...positions].sort((a, b) => a.x - b.x);
  let clusters: Cluster[] = [];
  for (const p of sorted) {
    const current = clusters[clusters.length - 1];
    if (current && p.x - current.first <= tolerance) {
      current.last = p.x;
      if (p.anchor > current.anchor) {
        current.anchor = p.anchor;
        current.representative = p.x;
      }
    } else clusters.push({ first: p.x, last: p.x, representative: p.x, anchor: p.anchor });
  }
  for (let merged = true; merged; ) {
    merged = false;
    const next: Cluster[] = [];
    for (const c of clusters) {
      const previous = next[next.length - 1];
      if (previous && c.representative - previous.representative <= tolerance) {
        previous.last = c.last;
        if (c.anchor > previous.anchor) {
          previous.anchor = c.anchor;
          previous.representative = c.representative;
        }
        merged = true;
      } else next.push({ ...c });
    }
    clusters = next;
  }
  return (x: number): number => {
    let lo = 0;
    let hi = clusters.length - 1;
    while (lo < hi) {
      const mid = (lo + hi + 1) >> 1;
      if (clusters[mid]!.first <= x) lo = mid;
      else hi = mid - 1;
    }
    const cluster = clusters[lo];
    return cluster && x >= cluster.first && x <= cluster.last ? cluster.representative : x;
  };
}
