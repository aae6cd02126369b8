/**
 * The markdown-it plugin on the demo notes: one card per block, the numbers shown are the core's
 * numbers, the fence chain and the host's token attributes are respected, cached tokens re-render
 * the same, and evaluation can be switched off.
 */
import { readdirSync, readFileSync } from 'node:fs';
import { join } from 'node:path';
import MarkdownIt from 'markdown-it';
import type { StateCore } from 'markdown-it';
import { describe, expect, it } from 'vitest';
import { type JsonSection, noteToJson } from '../../src/core/contract';
import { evaluateNote } from '../../src/core/note';
import { shearPlugin } from '../../src/render/plugin';
import { closeTo3, matchSnapshot, outline, parseShown, readCards, renderWithResult, ROOT } from './helpers';

const EXAMPLES = join(ROOT, 'examples');
const examples = readdirSync(EXAMPLES).filter((f) => f.endsWith('.md')).sort();

/** What VS Code's preview adds after contributed plugins: a source-map core rule on every token with a map. */
function vscodeLike(): MarkdownIt {
  const md = new MarkdownIt({ html: true, linkify: true });
  md.use(shearPlugin);
  md.core.ruler.push('source_map_like_vscode', (state: StateCore) => {
    for (const t of state.tokens) {
      if (t.map && t.type !== 'inline') {
        t.attrSet('data-line', String(t.map[0]));
        t.attrJoin('class', 'code-line');
        t.attrSet('dir', 'auto');
      }
    }
  });
  return md;
}

describe('demo notes', () => {
  it('has demo notes to render', () => {
    expect(examples.length).toBeGreaterThanOrEqual(3);
  });

  for (const file of examples) {
    describe(file, () => {
      const text = readFileSync(join(EXAMPLES, file), 'utf8');
      const { html, result } = renderWithResult(text, `file:///${file}`);
      const cards = readCards(html);

      it('renders one card per shear block, titled as the block', () => {
        expect(cards).toHaveLength(result.blocks.length);
        cards.forEach((c, i) => expect(c.title).toBe(result.blocks[i]!.block.title || 'Calculation'));
      });

      it('shows every result the core computed, on the row of its line', () => {
        for (const [i, b] of result.blocks.entries()) {
          for (const r of b.results) {
            const row = cards[i]!.rows.find((x) => x.line === r.statement.line && x.kind === r.statement.kind);
            expect(row, `row for line ${r.statement.line + 1}`).toBeDefined();
            if (r.statement.kind === 'assign' && r.text && !r.failed) {
              // A value written as a plain number is shown as written ("1.1 kN"); anything computed, as the core formats it.
              const last = row!.steps[row!.steps.length - 1]!.replace(/^= /, '');
              expect(sameQuantity(last, r.text), `result on line ${r.statement.line + 1}: ${last} vs ${r.text}`).toBe(true);
              if (row!.steps.length > 2) expect(last).toBe(r.text);
            }
            if (r.check) {
              expect(row!.verdict).toBe(r.check.pass ? 'Pass' : 'Fail');
              expect(row!.ratio).toContain(String(Number(r.check.ratio.toPrecision(3))).slice(0, 4));
              expect(row!.steps.join(' ')).toContain(r.check.leftText);
              expect(row!.steps.join(' ')).toContain(r.check.rightText);
            }
          }
        }
      });

      it('shows section properties that read back to the checker JSON values', () => {
        const json = noteToJson(file, result);
        for (const [i, b] of json.blocks.entries()) {
          for (const [name, value] of Object.entries(b.values)) {
            if (!('kind' in value) || value.kind !== 'section') continue;
            const v = value as JsonSection;
            const row = cards[i]!.rows.find((r) => r.kind === 'section' && r.line === v.line - 1)!;
            expect(row, `section ${name}`).toBeDefined();
            const si = (label: string, factor: number) => parseShown(row.props[label]!) * factor;
            const us = result.unitSystem === 'US';
            expect(closeTo3(si('Area A', us ? 0.0254 ** 2 : 1e-6), v.A)).toBe(true);
            expect(closeTo3(si('Second moment I', us ? 0.0254 ** 4 : 1e-12), v.I)).toBe(true);
            expect(closeTo3(si('Centroid height ȳ', us ? 0.0254 : 1e-3), v.yc)).toBe(true);
            expect(closeTo3(si('Depth h', us ? 0.0254 : 1e-3), v.depth)).toBe(true);
            expect(row.figures).toBe(1);
          }
        }
      });

      it('typesets every formula without a KaTeX error, and prints no NaN or undefined', () => {
        expect(html).not.toMatch(/katex-error|tl-math-error/);
        expect(html).not.toMatch(/NaN|undefined|Infinity/);
        expect(html).toContain('class="katex"');
      });

      it('matches its reviewed outline', () => {
        matchSnapshot(`example-${file.replace(/\.md$/, '')}.txt`, outline(cards));
      });
    });
  }
});

/** "1.1 kN" and "1.10 kN" are the same quantity: same unit, numbers equal. */
function sameQuantity(a: string, b: string): boolean {
  const [na, ...ua] = a.split(' ');
  const [nb, ...ub] = b.split(' ');
  return ua.join(' ') === ub.join(' ') && Math.abs(parseShown(na!) - parseShown(nb!)) <= 1e-9 * Math.abs(parseShown(nb!));
}

const NOTE = [
  '# A note',
  '',
  '```js',
  'const x = 1;',
  '```',
  '',
  '```shear Rectangle',
  'section R: 100 x 300',
  '  plate 100 mm x 300 mm',
  'V = 45 kN',
  'tmax = tau_max(R, V)',
  'check tmax <= 3 MPa',
  '```',
  '',
  '```shear Second',
  'q = flow(R, V, 200 mm)',
  '```',
  '',
].join('\n');

describe('the plugin in a host like VS Code', () => {
  it('keeps the fence token attributes on the card and puts line anchors on rows', () => {
    const html = vscodeLike().render(NOTE, {});
    expect(html).toContain('<div data-line="6" class="code-line tl-card" dir="auto">');
    expect(html).toContain('class="tl-row tl-row-assign code-line" data-line="9"');
    expect(html).toContain('class="tl-row tl-row-check code-line tl-pass" data-line="11"');
  });

  it('hands other info strings to the previous fence renderer', () => {
    const md = new MarkdownIt();
    const seen: string[] = [];
    const base = md.renderer.rules.fence!;
    md.renderer.rules.fence = (tokens, idx, opts, env, self) => {
      seen.push(tokens[idx]!.info);
      return base(tokens, idx, opts, env, self);
    };
    md.use(shearPlugin);
    const html = md.render(NOTE);
    expect(seen).toEqual(['js']);
    expect(html).toContain('<pre><code class="language-js">const x = 1;');
    expect(readCards(html)).toHaveLength(2);
  });

  it('re-renders cached tokens to the same HTML without touching the tokens', () => {
    const md = vscodeLike();
    const tokens = md.parse(NOTE, {});
    const before = JSON.stringify(tokens.map((t) => t.attrs));
    const a = md.renderer.render(tokens, md.options, {});
    const b = md.renderer.render(tokens, md.options, {});
    expect(b).toBe(a);
    expect(JSON.stringify(tokens.map((t) => t.attrs))).toBe(before);
  });

  it('evaluates tokens parsed without its core rule from the fences themselves', () => {
    const parser = new MarkdownIt();
    const tokens = parser.parse(NOTE, {});
    const md = new MarkdownIt().use(shearPlugin);
    const html = md.renderer.render(tokens, md.options, {});
    const cards = readCards(html);
    expect(cards).toHaveLength(2);
    const direct = evaluateNote(NOTE);
    expect(cards[1]!.rows[0]!.steps.at(-1)).toBe(`= ${direct.blocks[1]!.results[0]!.text}`);
  });

  it('names flow from one block to the next, as in the checker', () => {
    const { html, result } = renderWithResult(NOTE);
    const q = result.blocks[1]!.results[0]!;
    expect(q.failed).toBe(false);
    expect(readCards(html)[1]!.rows[0]!.steps.at(-1)).toBe(`= ${q.text}`);
  });

  it('shows source and a notice, and evaluates nothing, when evaluation is off', () => {
    const md = new MarkdownIt().use(shearPlugin, { evaluate: () => false, notEvaluatedText: 'not evaluated <untrusted>' });
    const env = { tauline: {} as { result?: unknown } };
    const html = md.render(NOTE, env);
    expect(html).toContain('not evaluated &lt;untrusted&gt;');
    expect(html).toContain('<pre class="tl-source"><code>section R: 100 x 300');
    expect(html).not.toContain('tl-row');
    expect(env.tauline.result).toBeUndefined();
  });

  it('re-evaluates only what an edit can change, per document', () => {
    const md = new MarkdownIt().use(shearPlugin);
    const env1 = { tauline: {} as { result?: { reused: number } }, currentDocument: 'file:///a.md' };
    md.render(NOTE, env1);
    const env2 = { tauline: {} as { result?: { reused: number } }, currentDocument: 'file:///a.md' };
    md.render(NOTE.replace('# A note', '# A note, retitled'), env2);
    expect(env2.tauline.result!.reused).toBe(2);
    const env3 = { tauline: {} as { result?: { reused: number } }, currentDocument: 'file:///a.md' };
    md.render(NOTE.replace('V = 45 kN', 'V = 50 kN'), env3);
    expect(env3.tauline.result!.reused).toBe(0);
  });

  it('puts the short caution under the last card only', () => {
    const html = new MarkdownIt().use(shearPlugin).render(NOTE);
    expect(html.match(/class="tl-caution"/g)).toHaveLength(1);
    expect(html.lastIndexOf('tl-caution')).toBeGreaterThan(html.lastIndexOf('tl-card-head'));
  });

  it('claims only the shear info string', () => {
    const md = new MarkdownIt().use(shearPlugin);
    expect(md.render('```shears\nV = 1 kN\n```\n')).not.toContain('tl-card');
    expect(md.render('```math\nx\n```\n')).not.toContain('tl-card');
    expect(md.render('```SHEAR upper case\nV = 1 kN\n```\n')).toContain('tl-card');
  });

  it('shows diagnostics in place, under their line', () => {
    const text = '```shear\nV = 45 kN\nW = V + 3 mm\nX = 2 * V\n```\n';
    const { html, result } = renderWithResult(text);
    const rows = readCards(html)[0]!.rows;
    const d = result.blocks[0]!.diagnostics[0]!;
    const i = rows.findIndex((r) => r.diagnostics.length > 0);
    expect(rows[i]!.diagnostics[0]).toBe(d.message);
    expect(rows[i]!.line).toBe(2);
    expect(rows[i - 1]!.line).toBe(2);
    expect(rows[i + 1]!.line).toBe(3);
    expect(readCards(html)[0]!.status).toContain('1 error');
  });
});
