/**
 * The JSON contract of `tauline check --json` (PRODUCT.md, "The command line"). Outside checks and
 * CI depend on this shape: extend it, never break it. Values are in coherent SI base units; lines
 * and columns are 1-based.
 */
import { siUnitText } from './units';
import type { NoteResult } from './note';

export interface JsonQuantity {
  line: number;
  si: number;
  unit: string;
  text: string;
}
export interface JsonSection {
  line: number;
  kind: 'section';
  A: number;
  yc: number;
  I: number;
  depth: number;
  Iy: number;
  Ixy: number;
  tau_max_at: number;
}
export interface JsonBeam {
  line: number;
  kind: 'beam';
  Vmax: number;
  Mmax: number;
  Mmin: number;
  reactions: { x: number; R: number; M?: number }[];
  combinations?: string[];
}
export type JsonValue = JsonQuantity | JsonSection | JsonBeam;

export interface JsonCheck {
  line: number;
  text: string;
  pass: boolean;
  ratio: number;
}
export interface JsonDiagnostic {
  line: number;
  column: number;
  severity: 'error' | 'warning' | 'info';
  message: string;
  code: string;
}
export interface JsonBlock {
  line: number;
  title: string;
  values: Record<string, JsonValue>;
  checks: JsonCheck[];
  diagnostics: JsonDiagnostic[];
}
export interface JsonFile {
  path: string;
  blocks: JsonBlock[];
  /** Problems that belong to no block (an unreadable file). */
  error?: string;
}
export interface JsonReport {
  files: JsonFile[];
  summary: { files: number; blocks: number; checks: number; failed: number; errors: number; stale?: number };
}

export function noteToJson(path: string, note: NoteResult): JsonFile {
  return {
    path,
    blocks: note.blocks.map((b) => {
      const values: Record<string, JsonValue> = Object.create(null) as Record<string, JsonValue>;
      for (const r of b.results) {
        if (!r.name || !r.value) continue;
        const line = r.statement.line + 1;
        const v = r.value;
        if (v.kind === 'quantity') {
          values[r.name] = { line, si: v.si, unit: siUnitText(v.dim), text: r.text ?? '' };
        } else if (v.kind === 'section') {
          const s = v.section;
          values[r.name] = { line, kind: 'section', A: s.area, yc: s.centroidY, I: s.I, depth: s.depth, Iy: s.Iy, Ixy: s.Ixy, tau_max_at: s.tauMax(1).locations[0]?.y ?? 0 };
        } else if (v.kind === 'beam') {
          const sum = v.beam.summary(v.combination);
          const beam: JsonBeam = { line, kind: 'beam', Vmax: sum.Vmax, Mmax: sum.Mmax, Mmin: sum.Mmin, reactions: v.beam.reactions(v.combination) };
          if (v.beam.combinationNames.length) beam.combinations = v.beam.combinationNames;
          values[r.name] = beam;
        }
      }
      return {
        line: b.block.fenceLine + 1,
        title: b.block.title,
        values,
        checks: b.checks.map((c) => ({ line: c.line + 1, text: c.text, pass: c.pass, ratio: c.ratio })),
        diagnostics: b.diagnostics.map((d) => ({ line: d.line + 1, column: d.column + 1, severity: d.severity, message: d.message, code: d.code })),
      };
    }),
  };
}

export function summarize(files: JsonFile[]): JsonReport['summary'] {
  let blocks = 0;
  let checks = 0;
  let failed = 0;
  let errors = 0;
  for (const f of files) {
    if (f.error) errors++;
    for (const b of f.blocks) {
      blocks++;
      checks += b.checks.length;
      failed += b.checks.filter((c) => !c.pass).length;
      errors += b.diagnostics.filter((d) => d.severity === 'error').length;
    }
  }
  return { files: files.length, blocks, checks, failed, errors };
}
