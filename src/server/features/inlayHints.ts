/**
 * Each line's result at the line's end: `= 66.6 kN`; a check shows `pass 0.28` or `FAIL 1.12`;
 * a section its area and I; a beam its largest shear and moment.
 */
import { type InlayHint, InlayHintKind, type Range } from 'vscode-languageserver';
import type { NoteAnalysis } from '../analysis';
import { lineResult, presenter } from '../present';
import type { ServerSettings } from '../settings';

export function inlayHints(a: NoteAnalysis, range: Range, settings: ServerSettings): InlayHint[] {
  if (!settings.inlineResults || !a.note) return [];
  const pr = presenter(a, settings);
  const out: InlayHint[] = [];
  for (const br of a.note.blocks) {
    if (br.block.endLine < range.start.line || br.block.fenceLine > range.end.line) continue;
    for (const r of br.results) {
      const line = r.statement.line;
      if (line < range.start.line || line > range.end.line) continue;
      const label = lineResult(r, pr);
      if (!label) continue;
      const text = a.lines[line] ?? '';
      out.push({
        position: { line, character: text.length },
        label,
        kind: InlayHintKind.Type,
        paddingLeft: true,
        tooltip: r.check ? `${r.check.leftText} ${r.check.op} ${r.check.rightText}` : undefined,
      });
    }
  }
  return out;
}
