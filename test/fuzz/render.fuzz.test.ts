/**
 * Fuzzing the renderer: any note through markdown-it with the shear plugin, raw HTML off (so every
 * tag in the output is ours or markdown-it's). No exception, one card per `shear` fence, no markup a
 * note could have injected, no NaN or Infinity shown, and the same HTML on a second render through
 * the plugin's caches (the preview contract: output is a pure function of the text).
 */
import fc from 'fast-check';
import MarkdownIt from 'markdown-it';
import { afterAll, describe, expect, it } from 'vitest';
import { shearPlugin } from '../../src/render/plugin';
import { anyNote, mutate, mutation } from './arbitraries';
import { fuzzParameters, HANG_MS, testTimeout } from './config';
import { checkHtml } from './invariants';

const md = new MarkdownIt({ html: false });
md.use(shearPlugin, { note: { blockBudgetMs: 500 } });
const counter = new MarkdownIt({ html: false });

function shearFences(text: string): number {
  return counter.parse(text, {}).filter((t) => t.type === 'fence' && (t.info.trim().split(/\s+/, 1)[0] ?? '').toLowerCase() === 'shear').length;
}

function cards(html: string): number {
  return (html.match(/<div class="tl-card[ "]/g) ?? []).length;
}

const slowest = { ms: 0, chars: 0 };
afterAll(() => console.log(`render fuzz: slowest render ${slowest.ms.toFixed(1)} ms for ${slowest.chars} characters`));

function render(text: string, env: Record<string, unknown> = {}): string {
  const t0 = performance.now();
  const html = md.render(text, env);
  const ms = performance.now() - t0;
  if (ms > slowest.ms) Object.assign(slowest, { ms, chars: text.length });
  expect(ms, `hang: ${text.slice(0, 300)}`).toBeLessThan(HANG_MS);
  return html;
}

/** Payloads for titles, comments and bad lines (the renderer's own corpus covers more in a browser). */
const PAYLOADS = ['<script>x=1</script>', '"><img src=x onerror=alert(1)>', "' onmouseover='alert(1)' x='", '</div><svg onload=alert(1)>', 'javascript:alert(1)', '\\href{javascript:alert(1)}{x}', '{{constructor.constructor("alert(1)")()}}', '<!--', ']]>', '&lt;script&gt;'];
const payloadNote = fc
  .tuple(anyNote, fc.array(fc.tuple(fc.nat(), fc.constantFrom(...PAYLOADS), fc.constantFrom('title', 'comment', 'line', 'section')), { minLength: 1, maxLength: 4 }))
  .map(([text, inserts]) => {
    const lines = text.split('\n');
    for (const [at, p, where] of inserts) {
      const i = at % lines.length;
      if (where === 'title' && /^\s*```shear/.test(lines[i]!)) lines[i] = `${lines[i]} ${p}`;
      else if (where === 'comment') lines[i] = `${lines[i]} # ${p}`;
      else if (where === 'section') lines.splice(i, 0, `section P: ${p}`, '  plate 10 mm x 20 mm');
      else lines.splice(i, 0, p);
    }
    return lines.join('\n');
  });

describe('renderer', () => {
  it('renders any note: one card per block, nothing injected, nothing non-finite, same HTML twice', () => {
    fc.assert(
      fc.property(fc.oneof(anyNote, payloadNote), (text) => {
        const html = render(text);
        expect(checkHtml(html, text), text).toEqual([]);
        expect(cards(html), text).toBe(shearFences(text));
        expect(render(text), 'second render').toBe(html);
      }),
      fuzzParameters(80),
    );
  }, testTimeout(120_000));

  it('follows a document through edits with its per-document cache, matching a fresh render', () => {
    fc.assert(
      fc.property(anyNote, fc.array(fc.array(mutation, { minLength: 1, maxLength: 3 }), { minLength: 1, maxLength: 3 }), (text, edits) => {
        // A clock that never moves keeps the time budget out of the comparison.
        const env = { currentDocument: 'file:///fuzz/edited.md' };
        const editing = new MarkdownIt({ html: false }).use(shearPlugin, { note: { now: () => 0 } });
        let current = text;
        editing.render(current, { ...env });
        for (const e of edits) {
          current = mutate(current, e);
          const viaCache = editing.render(current, { ...env });
          const fresh = new MarkdownIt({ html: false }).use(shearPlugin, { note: { now: () => 0 } }).render(current, {});
          expect(viaCache, current).toBe(fresh);
        }
      }),
      fuzzParameters(25),
    );
  }, testTimeout(120_000));
});
