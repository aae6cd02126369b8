/** The pure core of Tauline: no editor, no file system. Every other part builds on it. */
export * from './blocks';
export * from './cautions';
export * from './contract';
export * from './diagnostic';
export * from './evaluate';
export * from './expression';
export * from './format';
export * from './note';
export * from './statements';
export * from './units';
export * from './values';
export { buildSection, plate, circle, tube, box, isection, tee, channel, angle, polygon, translate, bounds } from './section';
export type { Section } from './section';
export { solveBeam, SIGN_CONVENTION } from './beam';
export type { BeamResult } from './beam';
