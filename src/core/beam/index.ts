/**
 * Beam solver of the Tauline core: reactions, exact V(x) and M(x) diagrams, load cases,
 * factored combinations and their envelope for a straight prismatic beam under vertical loads.
 * Pure: plain SI numbers in, plain data out. The sign convention is documented in ./types.ts.
 */

export { solveBeam, BeamResult, type BeamSolution, type SolveOptions } from './solve';
export { BeamDiagram, shearAt, momentAt, reactionAt, sampleDiagram } from './diagram';
export {
  governingShearAt,
  governingMomentAt,
  momentRangeAt,
  reactionEnvelopeAt,
  sampleEnvelope,
} from './envelope';
export { LIMITS as BEAM_LIMITS } from './validate';
export * from './types';
