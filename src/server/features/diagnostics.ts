/**
 * The core's problems as LSP diagnostics: errors for syntax, units, undefined names, degenerate
 * sections and unstable beams; failing checks as warnings whose message carries the utilisation.
 * `source` is always `tauline` (the built-in Markdown server reports on the same files) and `code`
 * is the core's stable problem code.
 */
import { type Diagnostic as LspDiagnostic, DiagnosticSeverity } from 'vscode-languageserver';
import type { Diagnostic } from '../../core/diagnostic';
import type { NoteAnalysis } from '../analysis';

export const SOURCE = 'tauline';

const SEVERITY: Record<Diagnostic['severity'], DiagnosticSeverity> = {
  error: DiagnosticSeverity.Error,
  warning: DiagnosticSeverity.Warning,
  info: DiagnosticSeverity.Information,
};

export function toLspDiagnostic(d: Diagnostic, lines: string[]): LspDiagnostic {
  const lineLength = lines[d.line]?.length ?? d.endColumn;
  const start = Math.max(0, Math.min(d.column, lineLength));
  let end = Math.max(start, Math.min(d.endColumn, lineLength));
  if (end === start && lineLength > start) end = start + 1;
  return {
    range: { start: { line: d.line, character: start }, end: { line: d.line, character: end } },
    severity: SEVERITY[d.severity] ?? DiagnosticSeverity.Error,
    code: d.code,
    source: SOURCE,
    message: d.message,
  };
}

/** Diagnostics of a note; more than `limit` are cut so a pasted table cannot flood the client. */
export function noteDiagnostics(a: NoteAnalysis, limit = 1000): LspDiagnostic[] {
  const out = a.diagnostics.slice(0, limit).map((d) => toLspDiagnostic(d, a.lines));
  if (a.diagnostics.length > limit) {
    const last = a.diagnostics[limit]!;
    out.push({
      range: { start: { line: last.line, character: 0 }, end: { line: last.line, character: 0 } },
      severity: DiagnosticSeverity.Information,
      code: 'note.too-many-problems',
      source: SOURCE,
      message: `${a.diagnostics.length - limit} more problems are not listed.`,
    });
  }
  return out;
}

export interface NoteSummary {
  uri: string;
  version: number;
  evaluated: boolean;
  blocks: number;
  checks: number;
  failed: number;
  errors: number;
  maxRatio: number | null;
}

/** The counts the status bar shows for the open note. */
export function noteSummary(a: NoteAnalysis): NoteSummary {
  const checks = a.note ? a.note.blocks.flatMap((b) => b.checks) : [];
  const ratios = checks.map((c) => c.ratio).filter((r) => Number.isFinite(r));
  return {
    uri: a.uri,
    version: a.version,
    evaluated: !!a.note,
    blocks: a.blocks.length,
    checks: checks.length,
    failed: checks.filter((c) => !c.pass).length,
    errors: a.diagnostics.filter((d) => d.severity === 'error').length,
    maxRatio: ratios.length ? Math.max(...ratios) : null,
  };
}
