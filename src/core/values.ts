/**
 * The values a note computes: quantities (an SI number with a dimension), cross-sections and beams.
 */
import type { Dimension, DisplayUnit } from './units';
import type { Section } from './section/section';
import type { BeamLoad, BeamResult } from './beam';

/** What the evaluator asks of a solved beam; `combination` undefined means the design envelope. */
export interface BeamModel {
  /** The solver's full result, for diagrams and reports. */
  result: BeamResult;
  /** The loads as written (SI, with their groups), for drawing the beam. */
  loads: readonly BeamLoad[];
  span: number;
  /** Combinations the note wrote (`combine NAME = …`) and load groups it named (`dead: udl …`). */
  combinationNames: string[];
  groupNames: string[];
  summary(combination?: string): { Vmax: number; Mmax: number; Mmin: number };
  shear(x: number, side?: 'left' | 'right', combination?: string): number;
  moment(x: number, combination?: string): number;
  reaction(x: number, combination?: string): number | undefined;
  reactions(combination?: string): { x: number; R: number; M?: number }[];
}

export interface Quantity {
  kind: 'quantity';
  /** Value in coherent SI units (N, m, Pa, N/m, m², m³, m⁴…). */
  si: number;
  dim: Dimension;
  /** The unit the note wrote for this value (`66.6 kN`, `V to kip`), shown instead of the system's choice. */
  shown?: DisplayUnit;
}

export interface SectionValue {
  kind: 'section';
  name: string;
  title: string;
  section: Section;
}

export interface BeamValue {
  kind: 'beam';
  name: string;
  beam: BeamModel;
  /** A beam value seen through one load combination or load group (`B.ULS`, `B.dead`); undefined means the design envelope. */
  combination?: string;
}

export interface SideValue {
  kind: 'side';
  side: 'left' | 'right';
}

/** A name whose own line has an error: reading it fails quietly, so one mistake is one diagnostic. */
export interface UnavailableValue {
  kind: 'unavailable';
  name: string;
}

export type Value = Quantity | SectionValue | BeamValue | SideValue | UnavailableValue;

export function quantity(si: number, dim: Dimension, shown?: DisplayUnit): Quantity {
  return shown ? { kind: 'quantity', si, dim, shown } : { kind: 'quantity', si, dim };
}
