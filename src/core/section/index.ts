/** The cross-section engine: shapes, sections and the elementary shear stress tau = V·Q/(I·t). */
export type { Circle, Part, Polygon, Primitive, SectionProblem, SectionProblemCode, SignedPrimitive } from './primitives';
export { MAX_POLYGON_VERTICES, makeCircle, makePolygon } from './primitives';
export type { AngleDimensions, Bounds, FlangedDimensions, ShapeResult } from './shapes';
export { angle, bounds, box, channel, circle, isection, plate, polygon, tee, topOf, translate, tube } from './shapes';
export type {
  Breakpoint,
  BuildResult,
  OutlineItem,
  PartSummary,
  Reading,
  Section,
  SectionInput,
  TauMaxLocation,
  TauMaxResult,
  TauProfile,
  TauReading,
  TauSides,
  WidthReading,
} from './section';
export { buildSection } from './section';
