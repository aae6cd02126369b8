/**
 * Every editor feature, asked at every position of arbitrary notes (valid lines, near-misses and
 * junk mixed at random), answers without throwing, and what it returns stays inside the document:
 * hovers carry well-formed picture data, positions point at real lines, diagnostics have codes.
 */
import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { NoteStore } from '../../src/server/analysis';
import { codeLenses } from '../../src/server/features/codeLens';
import { completions, signatureHelp } from '../../src/server/features/completion';
import { noteDiagnostics } from '../../src/server/features/diagnostics';
import { hover } from '../../src/server/features/hover';
import { inlayHints } from '../../src/server/features/inlayHints';
import { definition, references } from '../../src/server/features/navigation';
import { stampDiagnostics } from '../../src/server/features/stamps';
import { documentSymbols } from '../../src/server/features/symbols';
import { DEFAULT_SETTINGS } from '../../src/server/settings';

const LINES = [
  'section S: test', '  plate 100 mm x 200 mm', '  plate 10 mm x 50 mm at 0 mm, 200 mm', '  circle 60 mm', '  hole circle 10 mm at 0 mm, 100 mm',
  'beam B: 6 m', '  pin at 0 m', '  roller at 6 m', '  udl 10 kN/m', '  point 5 kN at 2 m', '  dead: udl 2 kN/m', '  combine U = 1.2 dead',
  'V = B.Vmax', 'V = 20 kN', 't = tau_max(S, V)', 'q = flow(S, V, S.yc)', 'y = S.depth / 2', 'check t <= 1 MPa', 'check q <= 1 kN/m', 'units US', 'units SI',
  'x = tau(S, V, 1 m)', 'z = S.', 'w = tau(', 'check <=', 'section', '  plate', 'beam B:', ')))', '# comment', '', '   ', 'a = 1 / 0', 'b = V to kip', 'c = V + 1 mm',
  '<!-- tauline-results -->', '<!-- /tauline-results -->', '| `V` | 1 kN | |',
];

/** Coherent pieces (a section with its parts, a beam with its loads) so that many notes evaluate. */
const CHUNKS = [
  ['section S: test', '  plate 100 mm x 200 mm'],
  ['section S: built up', '  plate 200 mm x 20 mm', '  plate 10 mm x 300 mm', '  plate 200 mm x 20 mm'],
  ['section S: tube', '  tube 200 mm, 10 mm'],
  ['beam B: 6 m', '  pin at 0 m', '  roller at 6 m', '  udl 10 kN/m'],
  ['beam B: 6 m', '  fixed at 0 m', '  dead: point 5 kN at 6 m', '  live: udl 2 kN/m', '  combine U = 1.2 dead + 1.6 live'],
  ['V = B.Vmax', 't = tau_max(S, V)', 'check t <= 1 MPa'],
  ['V = 20 kN', 'q = flow(S, V, S.yc)', 'check q <= 100 kN/m'],
];

const note = fc
  .array(
    fc.oneof(
      { weight: 4, arbitrary: fc.constantFrom(...CHUNKS) },
      { weight: 3, arbitrary: fc.constantFrom(...LINES).map((l) => [l]) },
      { weight: 1, arbitrary: fc.string({ maxLength: 30 }).map((l) => [l]) },
      { weight: 1, arbitrary: fc.constantFrom('```shear Block', '```shear', '```', '~~~shear', 'Prose between blocks.', '## Heading').map((l) => [l]) },
    ),
    { maxLength: 30 },
  )
  .map((chunks) => ['# Note', '', '```shear First', ...chunks.flat(), '```', ''].join('\n'));

describe('editor features on arbitrary notes', () => {
  it('never throw and stay inside the document', () => {
    let pictures = 0;
    fc.assert(
      fc.property(note, fc.constantFrom('light', 'dark', 'unknown') as fc.Arbitrary<'light' | 'dark' | 'unknown'>, fc.boolean(), (text, themeKind, evaluate) => {
        const settings = { ...DEFAULT_SETTINGS, themeKind, evaluate };
        const a = new NoteStore().analyze('file:///p.md', 1, text, settings);
        const lines = text.split('\n');
        for (const d of [...noteDiagnostics(a), ...stampDiagnostics(a, settings)]) {
          expect(typeof d.code).toBe('string');
          expect(d.range.start.line).toBeLessThan(lines.length);
        }
        for (const h of inlayHints(a, { start: { line: 0, character: 0 }, end: { line: lines.length, character: 0 } }, settings)) {
          expect(h.position.character).toBe(lines[h.position.line]!.length);
        }
        codeLenses(a);
        documentSymbols(a, settings);
        for (let line = 0; line < lines.length; line++) {
          for (let character = 0; character <= lines[line]!.length; character += 2) {
            const pos = { line, character };
            const h = hover(a, pos, settings);
            const md = h ? (h.contents as { value: string }).value : '';
            expect(md.length).toBeLessThan(100_000);
            for (const m of md.matchAll(/data:image\/svg\+xml;base64,([^)]*)\)/g)) {
              expect(m[1]).toMatch(/^[A-Za-z0-9+/]+=*$/);
              pictures++;
            }
            completions(a, pos, settings, true);
            signatureHelp(a, pos);
            const def = definition(a, pos);
            if (def) expect(def.range.start.line).toBeLessThan(lines.length);
            references(a, pos, true);
          }
        }
      }),
      { numRuns: 200 },
    );
    // The generator reaches the interesting cases: sections, beams and checks that evaluate.
    expect(pictures).toBeGreaterThan(50);
  });
});
