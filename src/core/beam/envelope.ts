/**
 * The envelope over the combinations: which combination governs, overall and at a section.
 * Functions take plain data so they also work on a cloned result.
 */

import {
  LOOKUP_FRACTION,
  breakPositions,
  drawingSections,
  momentAt,
  shearAt,
} from './diagram';
import type {
  BeamDiagramData,
  BeamEnvelope,
  EnvelopeSamples,
  GoverningValue,
  MomentPeak,
  ReactionEnvelope,
  ShearPeak,
  Side,
} from './types';

type Combinations<Tag> = { span: number; combinations: BeamDiagramData<Tag>[] };

const TIE = 1e-10;

export function buildEnvelope<Tag>(combinations: BeamDiagramData<Tag>[]): BeamEnvelope<Tag> {
  const first = combinations[0]!;
  let Vmax: ShearPeak & { combination: string } = { ...first.Vmax, combination: first.name };
  let Mmax: MomentPeak & { combination: string } = { ...first.Mmax, combination: first.name };
  let Mmin: MomentPeak & { combination: string } = { ...first.Mmin, combination: first.name };
  for (const c of combinations.slice(1)) {
    if (Math.abs(c.Vmax.V) > Math.abs(Vmax.V) * (1 + TIE)) Vmax = { ...c.Vmax, combination: c.name };
    if (c.Mmax.M > Mmax.M + Math.abs(Mmax.M) * TIE) Mmax = { ...c.Mmax, combination: c.name };
    if (c.Mmin.M < Mmin.M - Math.abs(Mmin.M) * TIE) Mmin = { ...c.Mmin, combination: c.name };
  }

  const reactions: ReactionEnvelope<Tag>[] = first.reactions.map((support, s) => {
    const values = combinations.map((c) => ({ R: c.reactions[s]!.R, M: c.reactions[s]!.M, name: c.name }));
    const pick = (key: 'R' | 'M') => {
      const entries = values.map((v) => ({ value: v[key] ?? 0, combination: v.name }));
      return {
        governing: extreme(entries, (a, b) => Math.abs(a) > Math.abs(b) * (1 + TIE)),
        max: extreme(entries, (a, b) => a > b + Math.abs(b) * TIE),
        min: extreme(entries, (a, b) => a < b - Math.abs(b) * TIE),
      };
    };
    const R = pick('R');
    const envelope: ReactionEnvelope<Tag> = { x: support.x, kind: support.kind, R: R.governing, Rmax: R.max, Rmin: R.min };
    if (support.tag !== undefined) envelope.tag = support.tag;
    if (support.kind === 'fixed') {
      const M = pick('M');
      envelope.M = M.governing;
      envelope.Mmax = M.max;
      envelope.Mmin = M.min;
    }
    return envelope;
  });
  return { Vmax, Mmax, Mmin, reactions };
}

function extreme(entries: GoverningValue[], better: (a: number, b: number) => boolean): GoverningValue {
  let best = entries[0]!;
  for (const entry of entries.slice(1)) if (better(entry.value, best.value)) best = entry;
  return { ...best };
}

/**
 * The V that governs at x over all combinations: the value with the largest magnitude, each
 * combination read on `side` (or on its own larger side when `side` is omitted, as in shearAt).
 */
export function governingShearAt<Tag>(result: Combinations<Tag>, x: number, side?: Side): GoverningValue {
  const values = result.combinations.map((c) => ({ value: shearAt(c, x, side), combination: c.name }));
  return extreme(values, (a, b) => Math.abs(a) > Math.abs(b) * (1 + TIE));
}

/** Largest and smallest M at x over all combinations. */
export function momentRangeAt<Tag>(
  result: Combinations<Tag>,
  x: number,
  side?: Side,
): { max: GoverningValue; min: GoverningValue } {
  const values = result.combinations.map((c) => ({ value: momentAt(c, x, side), combination: c.name }));
  return {
    max: extreme(values, (a, b) => a > b + Math.abs(b) * TIE),
    min: extreme(values, (a, b) => a < b - Math.abs(b) * TIE),
  };
}

/** The M that governs at x: whichever of the largest and smallest has the larger magnitude. */
export function governingMomentAt<Tag>(result: Combinations<Tag>, x: number, side?: Side): GoverningValue {
  const { max, min } = momentRangeAt(result, x, side);
  return Math.abs(min.value) > Math.abs(max.value) * (1 + TIE) ? min : max;
}

/** The reaction envelope of the support at x (within a billionth of the span), if there is one. */
export function reactionEnvelopeAt<Tag>(
  result: { span: number; envelope: Pick<BeamEnvelope<Tag>, 'reactions'> },
  x: number,
): ReactionEnvelope<Tag> | undefined {
  const tolerance = LOOKUP_FRACTION * result.span;
  let best: ReactionEnvelope<Tag> | undefined;
  for (const reaction of result.envelope.reactions) {
    const distance = Math.abs(reaction.x - x);
    if (distance <= tolerance && (!best || distance < Math.abs(best.x - x))) best = reaction;
  }
  return best;
}

/**
 * Envelope points for drawing: n evenly spaced sections plus every breakpoint and point of zero
 * shear of every combination. Where any combination jumps, x appears twice (left, then right).
 */
export function sampleEnvelope<Tag>(result: Combinations<Tag>, n: number): EnvelopeSamples {
  const breaks: number[] = [];
  const extra: number[] = [];
  const jumpAt: number[] = [];
  for (const c of result.combinations) {
    breaks.push(...breakPositions(c));
    for (const zero of c.zeroShear) {
      extra.push(zero.x);
      if (zero.end !== undefined) extra.push(zero.end);
    }
    for (const jump of c.jumps) jumpAt.push(jump.x);
  }
  jumpAt.sort((a, b) => a - b);
  const sections = drawingSections(result.span, breaks, extra, n);
  const tolerance = LOOKUP_FRACTION * result.span;
  const out = { x: [] as number[], Vmax: [] as number[], Vmin: [] as number[], Mmax: [] as number[], Mmin: [] as number[] };
  const push = (x: number, side: Side | undefined): void => {
    let Vmax = -Infinity;
    let Vmin = Infinity;
    let Mmax = -Infinity;
    let Mmin = Infinity;
    for (const c of result.combinations) {
      const V = shearAt(c, x, side);
      const M = momentAt(c, x, side);
      Vmax = Math.max(Vmax, V);
      Vmin = Math.min(Vmin, V);
      Mmax = Math.max(Mmax, M);
      Mmin = Math.min(Mmin, M);
    }
    out.x.push(x);
    out.Vmax.push(Vmax);
    out.Vmin.push(Vmin);
    out.Mmax.push(Mmax);
    out.Mmin.push(Mmin);
  };
  let nextJump = 0;
  for (const x of sections) {
    while (nextJump < jumpAt.length && jumpAt[nextJump]! < x - tolerance) nextJump++;
    if (nextJump < jumpAt.length && Math.abs(jumpAt[nextJump]! - x) <= tolerance) {
      push(x, 'left');
      push(x, 'right');
    } else push(x, undefined);
  }
  return {
    x: Float64Array.from(out.x),
    Vmax: Float64Array.from(out.Vmax),
    Vmin: Float64Array.from(out.Vmin),
    Mmax: Float64Array.from(out.Mmax),
    Mmin: Float64Array.from(out.Mmin),
  };
}
