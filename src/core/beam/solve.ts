/**
 * solveBeam: checks a beam, finds its reactions for every load group and combination, and builds
 * the diagrams and the envelope. See ./types.ts for the sign convention.
 */

import { BeamDiagram, buildDiagram } from './diagram';
import {
  buildEnvelope,
  governingMomentAt,
  governingShearAt,
  momentRangeAt,
  reactionEnvelopeAt,
  sampleEnvelope,
} from './envelope';
import { type LoadSet, addScaled, emptyLoadSet } from './loads';
import {
  type ReactionSolver,
  type SupportModel,
  type SupportReactions,
  equilibriumSolver,
  stiffnessSolver,
} from './reactions';
import {
  type BeamEnvelope,
  type BeamInput,
  type BeamProblem,
  type EnvelopeSamples,
  type GoverningValue,
  type Reaction,
  type ReactionEnvelope,
  type Side,
  type SupportKind,
  SIGN_CONVENTION,
} from './types';
import { type CheckedBeam, checkBeam } from './validate';

export interface BeamSolution<Tag = unknown> {
  /** Present when there is no error-severity problem. */
  beam?: BeamResult<Tag>;
  problems: BeamProblem<Tag>[];
}

export interface SolveOptions {
  /**
   * How reactions are found. `auto` (the default) uses equilibrium for determinate beams and the
   * stiffness method otherwise; `stiffness` forces the stiffness method, for cross-checking.
   */
  method?: 'auto' | 'stiffness';
}

/**
 * A solved beam: one diagram per load group (`cases`), one per combination (`combinations`; the
 * single implicit {@link ALL_LOADS_COMBINATION} when none were given), and the envelope over the
 * combinations. The reading methods on the result answer for the design, i.e. over the
 * combinations; read a single case or combination through its own diagram.
 */
export class BeamResult<Tag = unknown> {
  readonly span: number;
  /** Supports sorted by x. */
  readonly supports: { kind: SupportKind; x: number; tag?: Tag }[];
  /** Load group names in order of first appearance. */
  readonly groups: string[];
  readonly cases: BeamDiagram<Tag>[];
  readonly combinations: BeamDiagram<Tag>[];
  readonly envelope: BeamEnvelope<Tag>;
  /** Largest |V| over all combinations, N (see envelope.Vmax for its sign, place and combination). */
  readonly Vmax: number;
  /** How the reactions were found. */
  readonly method: 'equilibrium' | 'stiffness';
  readonly signConvention: string = SIGN_CONVENTION;

  constructor(fields: Omit<BeamResult<Tag>, 'signConvention' | 'Vmax' | MethodNames>) {
    this.span = fields.span;
    this.supports = fields.supports;
    this.groups = fields.groups;
    this.cases = fields.cases;
    this.combinations = fields.combinations;
    this.envelope = fields.envelope;
    this.method = fields.method;
    this.Vmax = Math.abs(fields.envelope.Vmax.V);
  }

  /** Governing V at x over the combinations (largest magnitude, signed); side rule as in shearAt. */
  shear(x: number, side?: Side): number {
    return governingShearAt(this, x, side).value;
  }

  governingShear(x: number, side?: Side): GoverningValue {
    return governingShearAt(this, x, side);
  }

  /** Governing M at x over the combinations (largest magnitude, signed). */
  moment(x: number, side?: Side): number {
    return governingMomentAt(this, x, side).value;
  }

  momentRange(x: number, side?: Side): { max: GoverningValue; min: GoverningValue } {
    return momentRangeAt(this, x, side);
  }

  /** Reaction envelope of the support at x, or undefined when no support is there. */
  reaction(x: number): ReactionEnvelope<Tag> | undefined {
    return reactionEnvelopeAt(this, x);
  }

  sample(n: number): EnvelopeSamples {
    return sampleEnvelope(this, n);
  }

  loadCase(group: string): BeamDiagram<Tag> | undefined {
    return this.cases.find((c) => c.name === group);
  }

  combination(name: string): BeamDiagram<Tag> | undefined {
    return this.combinations.find((c) => c.name === name);
  }
}

type MethodNames = 'shear' | 'governingShear' | 'moment' | 'momentRange' | 'reaction' | 'sample' | 'loadCase' | 'combination';

/**
 * Solves a straight prismatic beam under vertical loads. Input and output are SI (N, m, N/m, N·m).
 *
 * Sign convention (full text in {@link SIGN_CONVENTION}, details in ./types.ts): x from the left
 * end; loads positive downward; applied moments positive clockwise; reactions positive upward and
 * fixed-support reaction couples positive counterclockwise; V positive when the forces left of the
 * section resolve upward; M positive sagging; so dM/dx = V and dV/dx = −w.
 *
 * Never throws: anything wrong with the input comes back in `problems`, and a result is given only
 * when no problem is an error. No number in a result is NaN or infinite.
 */
export function solveBeam<Tag = unknown>(input: BeamInput<Tag>, options: SolveOptions = {}): BeamSolution<Tag> {
  try {
    const { beam, problems } = checkBeam(input);
    if (!beam) return { problems };
    return solveChecked(beam, problems, options);
  } catch {
    return {
      problems: [
        {
          code: 'beam.internal',
          severity: 'error',
          message: 'The beam could not be solved because of a fault in the solver; please report this beam.',
        },
      ],
    };
  }
}

function solveChecked<Tag>(beam: CheckedBeam<Tag>, problems: BeamProblem<Tag>[], options: SolveOptions): BeamSolution<Tag> {
  const { span, supports } = beam;
  const model: SupportModel = {
    x: Float64Array.from(supports.map((s) => s.x)),
    fixed: supports.map((s) => s.kind === 'fixed'),
  };
  const solver: ReactionSolver | undefined =
    (options.method === 'stiffness' ? undefined : equilibriumSolver(model)) ?? stiffnessSolver(span, model);
  if (!solver) {
    problems.push({
      code: 'beam.unstable',
      severity: 'error',
      message:
        'The supports do not hold the beam (a mechanism). A beam carrying vertical loads needs at least two pin or roller supports, or one fixed support.',
    });
    return { problems };
  }

  const failures: string[] = [];
  const diagramFor = (
    name: string,
    kind: 'group' | 'combination',
    factors: { group: string; factor: number }[],
    loads: LoadSet,
  ): BeamDiagram<Tag> => {
    const solved = solver.reactions(loads);
    const content = buildDiagram(span, model.x, solved, loads);
    const { V, M, forceScale } = content.closure;
    if (!(Math.abs(V) <= 1e-8 * forceScale) || !(Math.abs(M) <= 1e-8 * forceScale * span)) failures.push(name);
    return new BeamDiagram<Tag>({
      name,
      kind,
      factors,
      span,
      reactions: reactionList(supports, solved),
      pieces: content.pieces,
      jumps: content.jumps,
      Vmax: content.Vmax,
      Mmax: content.Mmax,
      Mmin: content.Mmin,
      zeroShear: content.zeroShear,
    });
  };

  const cases = beam.groups.map((group) => diagramFor(group, 'group', [], beam.groupLoads.get(group)!));
  const combinations = beam.combinations.map((combination) => {
    const loads = emptyLoadSet();
    for (const { group, factor } of combination.factors) addScaled(loads, beam.groupLoads.get(group)!, factor);
    return diagramFor(combination.name, 'combination', combination.factors.map((f) => ({ ...f })), loads);
  });

  const allDiagrams = [...cases, ...combinations];
  if (!allDiagrams.every(isFiniteDiagram)) {
    problems.push({
      code: 'beam.not-finite',
      severity: 'error',
      message: 'The loads or dimensions are too large to compute with; check their units.',
    });
    return { problems };
  }
  if (failures.length > 0) {
    problems.push({
      code: 'beam.internal',
      severity: 'error',
      message: `The solved forces do not balance the loads (${failures.join(', ')}); the beam is too badly conditioned to solve reliably. Check for supports very close together.`,
    });
    return { problems };
  }

  const result = new BeamResult<Tag>({
    span,
    supports: supports.map((s) => ({ ...s })),
    groups: [...beam.groups],
    cases,
    combinations,
    envelope: buildEnvelope(combinations),
    method: solver.method,
  });
  return { beam: result, problems };
}

function reactionList<Tag>(
  supports: { kind: SupportKind; x: number; tag?: Tag }[],
  solved: SupportReactions,
): Reaction<Tag>[] {
  return supports.map((support, s) => {
    const reaction: Reaction<Tag> = { x: support.x, kind: support.kind, R: solved.R[s]! };
    if (support.kind === 'fixed') reaction.M = solved.M[s]!;
    if (support.tag !== undefined) reaction.tag = support.tag;
    return reaction;
  });
}

function isFiniteDiagram(diagram: BeamDiagram<unknown>): boolean {
  for (const r of diagram.reactions) if (!Number.isFinite(r.R) || !Number.isFinite(r.M ?? 0)) return false;
  for (const piece of diagram.pieces) {
    for (const c of piece.shear) if (!Number.isFinite(c)) return false;
    for (const c of piece.moment) if (!Number.isFinite(c)) return false;
  }
  return (
    Number.isFinite(diagram.Vmax.V) &&
    Number.isFinite(diagram.Mmax.M) &&
    Number.isFinite(diagram.Mmin.M) &&
    diagram.zeroShear.every((z) => Number.isFinite(z.x) && Number.isFinite(z.M))
  );
}
