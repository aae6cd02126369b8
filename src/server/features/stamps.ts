/**
 * Results stamps in the editor: a diagnostic on each stamp that no longer matches the note's
 * results (and on damaged stamp markers), a quick fix that rewrites that block's stamp, and the
 * edits for stamping the whole note (the extension's `tauline.stampNote` asks for them with
 * `tauline/stampEdits` and applies them as one WorkspaceEdit, so evaluation stays in the server).
 */
import { type CodeAction, CodeActionKind, type Diagnostic as LspDiagnostic, DiagnosticSeverity, type TextEdit } from 'vscode-languageserver';
import { evaluateNote, type NoteResult } from '../../core/note';
import { findStaleStamps, readStamps, stampText, type StampEdit } from '../../core/stamp';
import type { NoteAnalysis } from '../analysis';
import type { ServerSettings as Settings } from '../settings';

/**
 * Stamps are read by reviewers and by `tauline check --frozen` in CI, which knows nothing of this
 * editor's settings: they are always written and compared with the defaults (the note's own unit
 * system, 3 significant figures), whatever the user chose for inline results.
 */
function canonicalNote(a: NoteAnalysis, settings: Pick<Settings, 'unitSystem' | 'significantFigures'>): NoteResult | undefined {
  if (!a.note) return undefined;
  if (settings.unitSystem === 'auto' && settings.significantFigures === 3) return a.note;
  return evaluateNote(a.text);
}
type StampSettings = Pick<Settings, 'unitSystem' | 'significantFigures'>;
import { SOURCE } from './diagnostics';

export const STAMP_EDITS_REQUEST = 'tauline/stampEdits';
export const STALE_STAMP_CODE = 'stamp.stale';

function lineRange(a: NoteAnalysis, line: number) {
  return { start: { line, character: 0 }, end: { line, character: (a.lines[line] ?? '').length } };
}

export function stampDiagnostics(a: NoteAnalysis, settings: StampSettings): LspDiagnostic[] {
  // Every stamp and every damaged marker contains this word; a note without it has nothing stale
  // (a missing stamp counts only beside another stamp), so most keystrokes skip the scan.
  if (!a.note || !a.text.includes('tauline-results')) return [];
  const out: LspDiagnostic[] = [];
  const note = canonicalNote(a, settings)!;
  for (const s of findStaleStamps(a.text, note)) {
    const line = s.stampLine ?? s.fenceLine;
    const names = s.changes.slice(0, 4).map((c) => `${c.name}: ${c.oldText ?? '(new)'} → ${c.newText ?? '(gone)'}`);
    const more = s.changes.length > 4 ? ` and ${s.changes.length - 4} more` : '';
    out.push({
      range: lineRange(a, line),
      severity: s.reason === 'missing' ? DiagnosticSeverity.Information : DiagnosticSeverity.Warning,
      code: STALE_STAMP_CODE,
      source: SOURCE,
      message:
        s.reason === 'missing'
          ? `The block "${s.title || `block ${s.blockIndex + 1}`}" has no results stamp, while other blocks of this note do.`
          : `The results stamp of "${s.title || `block ${s.blockIndex + 1}`}" is stale: ${names.join('; ')}${more}.`,
      data: { blockIndex: s.blockIndex, version: a.version },
    });
  }
  for (const p of readStamps(a.text, a.blocks).problems) {
    out.push({ range: lineRange(a, p.line), severity: p.severity === 'error' ? DiagnosticSeverity.Error : DiagnosticSeverity.Warning, code: p.code, source: SOURCE, message: p.message });
  }
  return out;
}

function toTextEdits(a: NoteAnalysis, edits: StampEdit[]): TextEdit[] {
  // Offsets are UTF-16 indices into the analysed text; turn them into line/character positions.
  const starts: number[] = [0];
  for (let i = 0; i < a.text.length; i++) {
    const c = a.text.charCodeAt(i);
    if (c === 10) starts.push(i + 1);
    else if (c === 13) {
      if (a.text.charCodeAt(i + 1) === 10) i++;
      starts.push(i + 1);
    }
  }
  const pos = (offset: number) => {
    let lo = 0;
    let hi = starts.length - 1;
    while (lo < hi) {
      const mid = (lo + hi + 1) >> 1;
      if (starts[mid]! <= offset) lo = mid;
      else hi = mid - 1;
    }
    return { line: lo, character: offset - starts[lo]! };
  };
  return edits.map((e) => ({ range: { start: pos(e.start), end: pos(e.end) }, newText: e.newText }));
}

/** Edits that stamp every block (or the blocks given); problems come back for the user to see. */
export function stampEdits(a: NoteAnalysis, settings: StampSettings, blocks?: number[]): { edits: TextEdit[]; problems: string[]; version: number } {
  const note = canonicalNote(a, settings);
  if (!note) return { edits: [], problems: ['The note is not evaluated (untrusted workspace), so it cannot be stamped.'], version: a.version };
  const out = stampText(a.text, note, { blocks });
  return { edits: toTextEdits(a, out.edits), problems: out.problems.map((p) => `line ${p.line + 1}: ${p.message}`), version: a.version };
}

export function stampQuickFixes(a: NoteAnalysis, diagnostics: LspDiagnostic[], settings: StampSettings): CodeAction[] {
  const actions: CodeAction[] = [];
  for (const d of diagnostics) {
    if (d.code !== STALE_STAMP_CODE || d.source !== SOURCE) continue;
    const blockIndex = (d.data as { blockIndex?: unknown } | undefined)?.blockIndex;
    if (typeof blockIndex !== 'number') continue;
    const { edits } = stampEdits(a, settings, [blockIndex]);
    if (!edits.length) continue;
    actions.push({
      title: 'Update this block\'s results stamp',
      kind: CodeActionKind.QuickFix,
      diagnostics: [d],
      isPreferred: true,
      edit: { changes: { [a.uri]: edits } },
    });
  }
  return actions;
}
