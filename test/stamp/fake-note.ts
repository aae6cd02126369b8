/**
 * A stand-in evaluator for stamp tests: it reads `name = anything` and `check anything` lines of each
 * `shear` block and turns them into results whose texts depend only on the line, so a test controls
 * exactly what a stamp shows without the section engine or beam solver. `name = !` is a failed
 * statement; a check whose text contains `FAIL` fails.
 */
import { extractBlocks } from '../../src/core/blocks';
import type { BlockResult, CheckResult, NoteResult, StatementResult } from '../../src/core/note';
import { DIM } from '../../src/core/units';

export function fakeNote(text: string, override?: (name: string) => string | undefined): NoteResult {
  const blocks: BlockResult[] = extractBlocks(text).map((block) => {
    const results: StatementResult[] = [];
    const checks: CheckResult[] = [];
    const diagnostics: BlockResult['diagnostics'] = [];
    for (const l of block.lines) {
      const assign = /^\s*([A-Za-z_]\w*)\s*=\s*(.*)$/.exec(l.text);
      const check = /^\s*check\s+(.*)$/.exec(l.text);
      const base = { line: l.line, start: l.column, end: l.column + l.text.length };
      if (assign) {
        const [, name, rhs] = assign as unknown as [string, string, string];
        const statement = { kind: 'assign', ...base, target: { name, start: 0, end: name.length }, expr: { kind: 'number', value: 1, start: 0, end: 1 } } as unknown as StatementResult['statement'];
        if (rhs.trim() === '!') {
          results.push({ statement, trace: new Map(), failed: true });
          diagnostics.push({ code: 'test.error', severity: 'error', message: 'bad', line: l.line, column: l.column, endColumn: l.column + 1 });
        } else {
          const shown = override?.(name) ?? `${rhs.trim().length} kN`;
          results.push({ statement, name, value: { kind: 'quantity', si: rhs.length * 1000, dim: DIM.force }, text: shown, trace: new Map(), failed: false });
        }
      } else if (check) {
        const body = check[1]!.trim();
        const q = { kind: 'quantity' as const, si: 1, dim: DIM.stress };
        const pass = !body.includes('FAIL');
        const c: CheckResult = { line: l.line, text: body, op: '<=', left: q, right: q, pass, ratio: pass ? 0.5 : 1.25, leftText: '1 MPa', rightText: '2 MPa' };
        const statement = { kind: 'check', ...base, left: q, op: '<=', right: q, text: body } as unknown as StatementResult['statement'];
        results.push({ statement, check: c, trace: new Map(), failed: false });
        checks.push(c);
      }
    }
    return { block, statements: results.map((r) => r.statement), results, defines: new Map(), reads: new Map(), checks, diagnostics, unitSystem: 'SI' };
  });
  return { blocks, unitSystem: 'SI', diagnostics: blocks.flatMap((b) => b.diagnostics), reused: 0 };
}
