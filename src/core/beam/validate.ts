/**
 * Checks a beam as given and turns it into the solver's internal form. Input comes from a note
 * and may be anything, so every field is checked before it is used; nothing here throws.
 *
 * Stability rule: the solver handles vertical loads on one continuous beam. Such a beam is held
 * (no rigid-body drop or rotation) exactly when it has at least two pin or roller supports, or at
 * least one fixed support. One pin or roller alone lets the beam rotate about it; no support lets it
 * fall. A beam on rollers only is solved, with a warning that nothing holds it horizontally.
 */

import { type LoadSet, emptyLoadSet } from './loads';
import { ANCHOR, type Anchor, SAME_SECTION_FRACTION, sectionSnapper } from './positions';
import {
  type BeamInput,
  type BeamProblem,
  type CombinationFactor,
  type SupportKind,
  ALL_LOADS_COMBINATION,
  DEFAULT_GROUP,
} from './types';

export const LIMITS = { supports: 1000, loads: 5000, combinations: 500, factors: 200 } as const;

/**
 * Supports closer than this fraction of the span are one support given twice. Closer supports
 * would also leave the stiffness equations too badly conditioned to trust.
 */
const SAME_SUPPORT_FRACTION = 1e-6;

export interface CheckedSupport<Tag> {
  kind: SupportKind;
  x: number;
  tag?: Tag;
}

export interface CheckedCombination {
  name: string;
  factors: CombinationFactor[];
  tag?: unknown;
  implicit: boolean;
}

export interface CheckedBeam<Tag> {
  span: number;
  /** Sorted by x. */
  supports: CheckedSupport<Tag>[];
  /** In order of first appearance. */
  groups: string[];
  groupLoads: Map<string, LoadSet>;
  combinations: (CheckedCombination & { tag?: Tag })[];
}

export function checkBeam<Tag>(input: BeamInput<Tag>): { beam?: CheckedBeam<Tag>; problems: BeamProblem<Tag>[] } {
  const problems: BeamProblem<Tag>[] = [];
  const error = (code: BeamProblem['code'], message: string, tag?: Tag): void => {
    problems.push(tag === undefined ? { code, severity: 'error', message } : { code, severity: 'error', message, tag });
  };
  const warn = (code: BeamProblem['code'], message: string, tag?: Tag): void => {
    problems.push(tag === undefined ? { code, severity: 'warning', message } : { code, severity: 'warning', message, tag });
  };

  if (!isRecord(input)) {
    error('beam.invalid', 'The beam description is missing.');
    return { problems };
  }
  const span = input.span;
  if (typeof span !== 'number') {
    error('beam.span', 'The beam has no span length.');
    return { problems };
  }
  if (!Number.isFinite(span)) {
    error('beam.not-finite', `The span is ${String(span)}; it must be a finite length.`);
    return { problems };
  }
  if (span <= 0) {
    error('beam.span', `The span is ${metres(span)}; a beam needs a positive length.`);
    return { problems };
  }
  const supportsIn: unknown = input.supports;
  const loadsIn: unknown = input.loads ?? [];
  const combinationsIn: unknown = input.combinations ?? [];
  if (!Array.isArray(supportsIn) || !Array.isArray(loadsIn) || !Array.isArray(combinationsIn)) {
    error('beam.invalid', 'Supports, loads and combinations must be lists.');
    return { problems };
  }
  if (
    supportsIn.length > LIMITS.supports ||
    loadsIn.length > LIMITS.loads ||
    combinationsIn.length > LIMITS.combinations
  ) {
    error(
      'beam.too-large',
      `The beam is too large to solve here (at most ${LIMITS.supports} supports, ${LIMITS.loads} loads and ` +
        `${LIMITS.combinations} combinations).`,
    );
    return { problems };
  }

  const slack = SAME_SECTION_FRACTION * span;
  /** Checks a position on the beam; returns it clamped to [0, span], or undefined after a problem. */
  const position = (value: unknown, what: string, tag: Tag | undefined): number | undefined => {
    if (typeof value !== 'number') {
      error('beam.invalid', `The ${what} has no position.`, tag);
      return undefined;
    }
    if (!Number.isFinite(value)) {
      error('beam.not-finite', `The ${what} is at ${String(value)}; positions must be finite.`, tag);
      return undefined;
    }
    if (value < -slack || value > span + slack) {
      error('beam.outside', `The ${what} at ${metres(value)} is off the beam, which runs from 0 to ${metres(span)}.`, tag);
      return undefined;
    }
    return Math.min(Math.max(value, 0), span);
  };
  const magnitude = (value: unknown, what: string, tag: Tag | undefined): number | undefined => {
    if (typeof value !== 'number') {
      error('beam.invalid', `The ${what} has no value.`, tag);
      return undefined;
    }
    if (!Number.isFinite(value)) {
      error('beam.not-finite', `The ${what} is ${String(value)}; it must be a finite number.`, tag);
      return undefined;
    }
    return value;
  };

  const supports: CheckedSupport<Tag>[] = [];
  let supportsOk = true;
  for (const raw of supportsIn as unknown[]) {
    const tag = tagOf<Tag>(raw);
    if (!isRecord(raw) || (raw.kind !== 'pin' && raw.kind !== 'roller' && raw.kind !== 'fixed')) {
      error('beam.invalid', 'A support must be a pin, a roller or fixed.', tag);
      supportsOk = false;
      continue;
    }
    const x = position(raw.x, `${raw.kind} support`, tag);
    if (x === undefined) {
      supportsOk = false;
      continue;
    }
    supports.push(tag === undefined ? { kind: raw.kind, x } : { kind: raw.kind, x, tag });
  }
  supports.sort((a, b) => a.x - b.x);
  for (let i = 1; i < supports.length; i++) {
    if (supports[i]!.x - supports[i - 1]!.x <= SAME_SUPPORT_FRACTION * span) {
      error(
        'beam.duplicate-support',
        `Two supports are at ${metres(supports[i]!.x)}${supports[i]!.x === supports[i - 1]!.x ? '' : ' (less than a millionth of the span apart)'}; give each position one support (use fixed for a support that also holds rotation).`,
        supports[i]!.tag,
      );
      supportsOk = false;
    }
  }
  if (supportsOk) {
    const fixedCount = supports.filter((s) => s.kind === 'fixed').length;
    if (fixedCount === 0 && supports.length < 2) {
      const rule =
        'A beam carrying vertical loads needs at least two pin or roller supports, or one fixed support.';
      if (supports.length === 0) error('beam.unstable', `The beam has no supports, so it is a mechanism. ${rule}`);
      else
        error(
          'beam.unstable',
          `The beam rests on a single ${supports[0]!.kind} at ${metres(supports[0]!.x)} and can rotate about it, so it is a mechanism. ${rule}`,
          supports[0]!.tag,
        );
    } else if (supports.every((s) => s.kind === 'roller')) {
      warn(
        'beam.no-horizontal-restraint',
        'Every support is a roller, so nothing holds the beam horizontally. Vertical results are given; ' +
          'make one support a pin if the beam must resist horizontal force.',
      );
    }
  }

  const groups: string[] = [];
  const groupLoads = new Map<string, LoadSet>();
  const setFor = (group: string): LoadSet => {
    let set = groupLoads.get(group);
    if (!set) {
      set = emptyLoadSet();
      groupLoads.set(group, set);
      groups.push(group);
    }
    return set;
  };
  for (const raw of loadsIn as unknown[]) {
    const tag = tagOf<Tag>(raw);
    if (!isRecord(raw)) {
      error('beam.invalid', 'A load must be a point load, a udl, a ramp or a moment.', tag);
      continue;
    }
    if (raw.group !== undefined && (typeof raw.group !== 'string' || raw.group === '')) {
      error('beam.invalid', 'A load group must be a name.', tag);
      continue;
    }
    const group = (raw.group as string | undefined) ?? DEFAULT_GROUP;
    switch (raw.kind) {
      case 'point': {
        const P = magnitude(raw.P, 'point load', tag);
        const x = position(raw.x, 'point load', tag);
        if (P !== undefined && x !== undefined) setFor(group).points.push({ x, P });
        break;
      }
      case 'moment': {
        const M = magnitude(raw.M, 'applied moment', tag);
        const x = position(raw.x, 'applied moment', tag);
        if (M !== undefined && x !== undefined) setFor(group).couples.push({ x, M });
        break;
      }
      case 'udl':
      case 'ramp': {
        const name = raw.kind === 'udl' ? 'udl' : 'ramp load';
        const w1 = magnitude(raw.kind === 'udl' ? raw.w : raw.w1, `${name} intensity`, tag);
        const w2 = raw.kind === 'udl' ? w1 : magnitude(raw.w2, `${name} end intensity`, tag);
        const start = magnitude(raw.x1, `${name} start`, tag);
        const end = magnitude(raw.x2, `${name} end`, tag);
        if (w1 === undefined || w2 === undefined || start === undefined || end === undefined) break;
        if (!(end > start)) {
          error(
            'beam.load-extent',
            `The ${name} runs from ${metres(start)} to ${metres(end)}; its start must come before its end.`,
            tag,
          );
          break;
        }
        const x1 = position(start, `${name} start`, tag);
        const x2 = position(end, `${name} end`, tag);
        if (x1 === undefined || x2 === undefined) break;
        if (!(x2 > x1)) {
          error('beam.load-extent', `The ${name} has no length on the beam.`, tag);
          break;
        }
        setFor(group).lines.push({ x1, x2, w1, w2 });
        break;
      }
      default:
        error('beam.invalid', 'A load must be a point load, a udl, a ramp or a moment.', tag);
    }
  }

  if (!problems.some((p) => p.severity === 'error')) snapToSections(span, supports, groupLoads);

  const combinations: (CheckedCombination & { tag?: Tag })[] = [];
  const named = new Set<string>();
  const seenNames = new Set<string>();
  for (const raw of combinationsIn as unknown[]) {
    const tag = tagOf<Tag>(raw);
    if (!isRecord(raw) || typeof raw.name !== 'string' || raw.name === '' || !Array.isArray(raw.factors)) {
      error('beam.invalid', 'A combination needs a name and a list of factored groups.', tag);
      continue;
    }
    const name = raw.name;
    if (seenNames.has(name)) {
      error('beam.duplicate-combination', `Combination ${name} is defined twice; give each combination its own name.`, tag);
      continue;
    }
    seenNames.add(name);
    if (raw.factors.length > LIMITS.factors) {
      error('beam.too-large', `Combination ${name} has more than ${LIMITS.factors} terms.`, tag);
      continue;
    }
    const factors: CombinationFactor[] = [];
    let ok = true;
    for (const term of raw.factors as unknown[]) {
      if (!isRecord(term) || typeof term.group !== 'string') {
        error('beam.invalid', `Each term of combination ${name} needs a group name and a factor.`, tag);
        ok = false;
        continue;
      }
      const group = term.group;
      const factor = magnitude(term.factor, `factor on ${group} in combination ${name}`, tag);
      if (factor === undefined) {
        ok = false;
        continue;
      }
      if (!groupLoads.has(group)) {
        const known = groups.length ? `The load groups are: ${groups.join(', ')}.` : 'The beam has no loads.';
        error('beam.unknown-group', `Combination ${name} names group ${group}, but no load belongs to it. ${known}`, tag);
        ok = false;
        continue;
      }
      named.add(group);
      const existing = factors.find((f) => f.group === group);
      if (existing) {
        warn(
          'beam.repeated-group',
          `Combination ${name} names group ${group} more than once; the factors are added.`,
          tag,
        );
        existing.factor += factor;
      } else factors.push({ group, factor });
    }
    if (ok) combinations.push(tag === undefined ? { name, factors, implicit: false } : { name, factors, implicit: false, tag });
  }
  if (combinationsIn.length > 0) {
    for (const group of groups) {
      if (!named.has(group)) {
        const which =
          group === DEFAULT_GROUP ? `The loads without a group (group ${DEFAULT_GROUP}) are` : `Load group ${group} is`;
        warn('beam.group-unused', `${which} in no combination, so those loads do not reach the design values.`);
      }
    }
  } else {
    combinations.push({
      name: ALL_LOADS_COMBINATION,
      factors: groups.map((group) => ({ group, factor: 1 })),
      implicit: true,
    });
  }

  if (problems.some((p) => p.severity === 'error')) return { problems };
  return { beam: { span, supports, groups, groupLoads, combinations }, problems };
}

/**
 * Moves every position to the section that stands for it (see ./positions.ts). A line load left
 * shorter than a section acts as its resultant at that section.
 */
function snapToSections<Tag>(span: number, supports: CheckedSupport<Tag>[], groupLoads: Map<string, LoadSet>): void {
  const positions: { x: number; anchor: Anchor }[] = [
    { x: 0, anchor: ANCHOR.end },
    { x: span, anchor: ANCHOR.end },
    ...supports.map((s) => ({ x: s.x, anchor: ANCHOR.support })),
  ];
  for (const set of groupLoads.values()) {
    for (const p of set.points) positions.push({ x: p.x, anchor: ANCHOR.load });
    for (const c of set.couples) positions.push({ x: c.x, anchor: ANCHOR.load });
    for (const l of set.lines) positions.push({ x: l.x1, anchor: ANCHOR.load }, { x: l.x2, anchor: ANCHOR.load });
  }
  const snap = sectionSnapper(positions, SAME_SECTION_FRACTION * span);
  for (const s of supports) s.x = snap(s.x);
  for (const set of groupLoads.values()) {
    for (const p of set.points) p.x = snap(p.x);
    for (const c of set.couples) c.x = snap(c.x);
    const lines = set.lines;
    set.lines = [];
    for (const l of lines) {
      const x1 = snap(l.x1);
      const x2 = snap(l.x2);
      if (x2 > x1) set.lines.push({ ...l, x1, x2 });
      else set.points.push({ x: x1, P: 0.5 * (l.w1 + l.w2) * (l.x2 - l.x1) });
    }
  }
}

export function metres(x: number): string {
  if (!Number.isFinite(x)) return String(x);
  const rounded = Number(x.toPrecision(4));
  // Rounding the largest doubles up to 4 figures overflows; their exponent form is still finite.
  return Number.isFinite(rounded) ? `${rounded} m` : `${x.toPrecision(4)} m`;
}

function isRecord(value: unknown): value is Record<string, unknown> {
  return typeof value === 'object' && value !== null;
}

function tagOf<Tag>(value: unknown): Tag | undefined {
  return isRecord(value) ? (value.tag as Tag | undefined) : undefined;
}
