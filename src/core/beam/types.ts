/**
 * Public data shapes of the beam solver.
 *
 * Units: everything is coherent SI — N, m, N/m, N·m. The caller converts the note's units first.
 *
 * Sign convention (the text of {@link SIGN_CONVENTION} is what reports show):
 * - x is measured from the left end of the beam, 0 ≤ x ≤ span.
 * - Loads act downward when positive: point loads P, line loads w (udl and ramp).
 * - An applied moment (`moment M at X`) is positive clockwise.
 * - Reactions R are positive upward. The reaction couple of a fixed support is positive
 *   counterclockwise, so reactions read as the mirror image of the loads they balance:
 *   ΣR = ΣP + ∫w dx and Σ R·x + Σ M_reaction = Σ P·x + ∫ w·x dx + Σ M_applied.
 * - V(x) is positive when the resultant of the forces to the LEFT of the cut acts upward.
 * - M(x) is positive sagging (bottom fibre in tension).
 * With these signs dM/dx = +V and dV/dx = −w between concentrated actions; going left to right a
 * point load P lowers V by P, a reaction R raises V by R, a clockwise applied moment raises M by M,
 * and a (counterclockwise) fixed-support reaction couple lowers M by its value.
 */
export const SIGN_CONVENTION =
  'x from the left end; loads and line loads positive downward; applied moments positive clockwise; ' +
  'reactions positive upward, fixed-support reaction couples positive counterclockwise; ' +
  'V positive when the forces left of the section resolve upward; M positive sagging; dM/dx = V.';

/** Name of the group that holds every load given without a group. Combinations may name it. */
export const DEFAULT_GROUP = 'default';

/** Name of the design case built when no combinations are given: every group with factor 1. */
export const ALL_LOADS_COMBINATION = 'all loads';

export type SupportKind = 'pin' | 'roller' | 'fixed';

/**
 * A support. `pin` and `roller` both hold the beam vertically; only `fixed` also holds rotation.
 * `tag` is anything the caller wants echoed on problems and reactions (a source line, a range).
 */
export interface BeamSupport<Tag = unknown> {
  kind: SupportKind;
  x: number;
  tag?: Tag;
}

export interface PointLoad {
  kind: 'point';
  /** Force, N, positive downward. */
  P: number;
  x: number;
}

export interface UniformLoad {
  kind: 'udl';
  /** Intensity, N/m, positive downward, acting from x1 to x2 (x1 < x2). */
  w: number;
  x1: number;
  x2: number;
}

export interface RampLoad {
  kind: 'ramp';
  /** Intensity w1 at x1 varying linearly to w2 at x2, N/m, positive downward (x1 < x2). */
  w1: number;
  w2: number;
  x1: number;
  x2: number;
}

export interface AppliedMoment {
  kind: 'moment';
  /** Couple, N·m, positive clockwise. */
  M: number;
  x: number;
}

export type BeamLoad<Tag = unknown> = (PointLoad | UniformLoad | RampLoad | AppliedMoment) & {
  /** Load group (case) name; loads without one belong to {@link DEFAULT_GROUP}. */
  group?: string;
  tag?: Tag;
};

export interface CombinationFactor {
  group: string;
  factor: number;
}

export interface BeamCombination<Tag = unknown> {
  name: string;
  factors: CombinationFactor[];
  tag?: Tag;
}

export interface BeamInput<Tag = unknown> {
  /** Length of the beam, m; the beam runs from x = 0 to x = span. */
  span: number;
  supports: BeamSupport<Tag>[];
  loads: BeamLoad<Tag>[];
  /**
   * Factored combinations of load groups. When absent or empty, one design case named
   * {@link ALL_LOADS_COMBINATION} takes every group with factor 1.
   */
  combinations?: BeamCombination<Tag>[];
}

export type BeamProblemCode =
  | 'beam.invalid'
  | 'beam.span'
  | 'beam.not-finite'
  | 'beam.outside'
  | 'beam.load-extent'
  | 'beam.duplicate-support'
  | 'beam.unstable'
  | 'beam.unknown-group'
  | 'beam.duplicate-combination'
  | 'beam.repeated-group'
  | 'beam.group-unused'
  | 'beam.no-horizontal-restraint'
  | 'beam.too-large'
  | 'beam.internal';

/**
 * A problem with the beam as given. Any `error` means no result is returned; `warning`s come with
 * a result. `tag` is the tag of the support, load or combination at fault, when there is one.
 */
export interface BeamProblem<Tag = unknown> {
  code: BeamProblemCode;
  severity: 'error' | 'warning';
  message: string;
  tag?: Tag;
}

/** Which side of a section x to read when V or M jumps there. */
export type Side = 'left' | 'right';

export interface Reaction<Tag = unknown> {
  x: number;
  kind: SupportKind;
  /** Vertical reaction, N, positive upward. */
  R: number;
  /** Reaction couple of a fixed support, N·m, positive counterclockwise; absent for pin and roller. */
  M?: number;
  tag?: Tag;
}

/**
 * One polynomial piece of the diagrams on [x0, x1], in powers of the local coordinate t = x − x0:
 * V(x) = shear[0] + shear[1]·t + shear[2]·t², M(x) = moment[0] + … + moment[3]·t³.
 * shear[0] and moment[0] are the values just right of x0; evaluating at t = x1 − x0 gives the
 * values just left of x1. Local coordinates keep the coefficients well conditioned.
 */
export interface DiagramPiece {
  x0: number;
  x1: number;
  shear: Float64Array;
  moment: Float64Array;
}

/**
 * A section where V or M is discontinuous; "left" and "right" are the values either side. The beam
 * ends are listed when a reaction, load or couple acts there: outside the beam V = M = 0.
 */
export interface DiagramJump {
  x: number;
  shearLeft: number;
  shearRight: number;
  momentLeft: number;
  momentRight: number;
}

/**
 * The largest |V|: the signed value, where, and the side when V jumps at that x. Values within
 * 1e-10 of each other tie, and the leftmost is reported (so a symmetric beam names its left half).
 */
export interface ShearPeak {
  V: number;
  x: number;
  side?: Side;
}

/** An extreme of M: the value, where, and the side when M jumps at that x (applied couples). Ties as for V. */
export interface MomentPeak {
  M: number;
  x: number;
  side?: Side;
}

/**
 * A point of zero shear. `crossing`: V passes through (or touches) zero inside a piece.
 * `jump`: V changes sign across a concentrated force at x. `interval`: V is zero from x to `end`.
 * The beam ends are not listed. Every extreme of M lies at one of these points or at an end,
 * a concentrated force or an applied couple.
 */
export interface ZeroShear {
  x: number;
  kind: 'crossing' | 'jump' | 'interval';
  end?: number;
  /** M at the point (at `x` for an interval, where M is constant). */
  M: number;
}

/**
 * Points for drawing diagrams: `n` evenly spaced sections plus every breakpoint and point of zero
 * shear, in order of x. At a jump x appears twice, first with the left values, then the right.
 * Outside the beam V = M = 0, so a reaction at x = 0 appears as (0, 0) followed by (0, R).
 */
export interface DiagramSamples {
  x: Float64Array;
  V: Float64Array;
  M: Float64Array;
}

/** Plain-data content of one solved load set; survives structured cloning (postMessage, workers). */
export interface BeamDiagramData<Tag = unknown> {
  /** Group name for a load case, combination name for a combination. */
  name: string;
  kind: 'group' | 'combination';
  /** Factors of a combination (empty for a load case). */
  factors: CombinationFactor[];
  span: number;
  reactions: Reaction<Tag>[];
  pieces: DiagramPiece[];
  jumps: DiagramJump[];
  Vmax: ShearPeak;
  Mmax: MomentPeak;
  Mmin: MomentPeak;
  zeroShear: ZeroShear[];
}

export interface GoverningValue {
  value: number;
  combination: string;
}

export interface ReactionEnvelope<Tag = unknown> {
  x: number;
  kind: SupportKind;
  tag?: Tag;
  /** The combination value of R with the largest magnitude (signed), and its combination. */
  R: GoverningValue;
  Rmax: GoverningValue;
  Rmin: GoverningValue;
  /** Reaction couple of a fixed support: largest magnitude, maximum, minimum. */
  M?: GoverningValue;
  Mmax?: GoverningValue;
  Mmin?: GoverningValue;
}

/** Extremes over the combinations; on a tie (within 1e-10) the combination listed first is named. */
export interface BeamEnvelope<Tag = unknown> {
  /** Largest |V| over all combinations (signed value) and the combination that gives it. */
  Vmax: ShearPeak & { combination: string };
  Mmax: MomentPeak & { combination: string };
  Mmin: MomentPeak & { combination: string };
  reactions: ReactionEnvelope<Tag>[];
}

/** Envelope sampling over the combinations; layout as in {@link DiagramSamples}. */
export interface EnvelopeSamples {
  x: Float64Array;
  Vmax: Float64Array;
  Vmin: Float64Array;
  Mmax: Float64Array;
  Mmin: Float64Array;
}
