/**
 * The outline: each `shear` block (by its title) holding its sections, beams, checks and
 * quantities, so the engineer can jump straight to "check t_max <= tau_allow".
 */
import { type DocumentSymbol, SymbolKind } from 'vscode-languageserver';
import type { NoteAnalysis } from '../analysis';
import { lineResult, presenter } from '../present';
import type { ServerSettings } from '../settings';

export function documentSymbols(a: NoteAnalysis, settings: ServerSettings): DocumentSymbol[] {
  const pr = presenter(a, settings);
  return a.blocks.map((block, i) => {
    const endLine = Math.max(block.fenceLine, block.endLine);
    const children: DocumentSymbol[] = [];
    for (const st of a.statements[i] ?? []) {
      const res = a.resultOf.get(st);
      const detail = res ? lineResult(res, pr) : undefined;
      const lineLen = (a.lines[st.line] ?? '').length;
      let lastLine = st.line;
      if (st.kind === 'section') lastLine = Math.max(st.line, ...st.parts.map((p) => p.line));
      if (st.kind === 'beam') lastLine = Math.max(st.line, ...st.items.map((p) => p.line));
      const range = { start: { line: st.line, character: 0 }, end: { line: lastLine, character: (a.lines[lastLine] ?? '').length } };
      const named = (name: string, start: number, end: number, kind: SymbolKind) =>
        children.push({ name, detail, kind, range, selectionRange: { start: { line: st.line, character: start }, end: { line: st.line, character: end } } });
      switch (st.kind) {
        case 'section':
          named(st.target.name, st.target.start, st.target.end, SymbolKind.Struct);
          break;
        case 'beam':
          named(st.target.name, st.target.start, st.target.end, SymbolKind.Object);
          break;
        case 'assign':
          named(st.target.name, st.target.start, st.target.end, SymbolKind.Variable);
          break;
        case 'check':
          children.push({
            name: `check ${st.text}`,
            detail: res?.check ? (res.check.pass ? `pass ${res.check.ratio.toFixed(2)}` : `FAIL ${res.check.ratio.toFixed(2)}`) : undefined,
            kind: SymbolKind.Boolean,
            range,
            selectionRange: { start: { line: st.line, character: st.start }, end: { line: st.line, character: Math.min(st.end, lineLen) } },
          });
          break;
        case 'units':
          break;
      }
    }
    const fence = a.lines[block.fenceLine] ?? '';
    return {
      name: block.title || `shear block ${i + 1}`,
      detail: `shear block, line ${block.fenceLine + 1}`,
      kind: SymbolKind.Namespace,
      range: { start: { line: block.fenceLine, character: 0 }, end: { line: endLine, character: (a.lines[endLine] ?? '').length } },
      selectionRange: { start: { line: block.fenceLine, character: 0 }, end: { line: block.fenceLine, character: fence.length } },
      children,
    };
  });
}
