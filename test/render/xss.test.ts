/**
 * The hostile corpus, checked in the markup: nothing a note writes becomes an element, an attribute,
 * a link target or a fetch. (The same corpus runs in Chromium in browser.test.ts, where a payload
 * that ran would set a flag, open a dialog or make a request.)
 */
import MarkdownIt from 'markdown-it';
import { describe, expect, it } from 'vitest';
import { buildPage, EXPORT_CSP, renderNote, webviewCsp } from '../../src/render/page';
import { shearPlugin } from '../../src/render/plugin';
import { HOSTILE_NOTES } from './xss-corpus';

/** Every tag in the markup, with the values of aria-label (escaped note text) blanked. */
function tags(html: string): string[] {
  return (html.match(/<[^>]*>/g) ?? []).map((t) => t.replace(/aria-label="[^"]*"/g, 'aria-label=""'));
}

function assertInert(html: string): void {
  for (const t of tags(html)) {
    expect(t, t).not.toMatch(/^<(script|iframe|object|embed|img|math|style|link|meta(?! (charset|http-equiv="Content-Security-Policy"|name="(viewport|generator)")))\b/i);
    expect(t, t).not.toMatch(/\son[a-z]+\s*=/i);
    expect(t, t).not.toMatch(/(href|src|action|formaction|xlink:href)\s*=\s*["']?\s*(javascript|data|vbscript|https?):/i);
  }
  expect(html).not.toContain('attacker.invalid/x.png"');
}

describe('hostile notes, as markup', () => {
  for (const note of HOSTILE_NOTES) {
    it(`sheet: ${note.name}`, () => {
      const t0 = Date.now();
      const rendered = renderNote(note.text, note.name);
      expect(Date.now() - t0).toBeLessThan(5000);
      const page = buildPage({ kind: 'export', header: { title: rendered.title, project: rendered.project }, summary: rendered.summary, body: rendered.html, csp: EXPORT_CSP, css: '' });
      assertInert(page.replace(/<title>[^<]*<\/title>/, ''));
      // The page title is text too: nothing in it may close the element early.
      expect(/<title>([^<]*)<\/title>/.exec(page)).not.toBeNull();
    });
    if (note.inBlocksOnly) {
      it(`host with raw HTML on: ${note.name}`, () => {
        const md = new MarkdownIt({ html: true }).use(shearPlugin);
        assertInert(md.render(note.text));
      });
    }
  }
});

describe('content security policies', () => {
  it('the report panel allows our nonce script and the extension\'s files, nothing remote', () => {
    // VS Code's cspSource as a desktop build and a browser build give it.
    const source = "'self' https://*.vscode-cdn.net https://file+.vscode-resource.vscode-cdn.net";
    const csp = webviewCsp(source, 'abcDEF0123456789abcDEF0123456789');
    expect(csp).toBe(
      `default-src 'none'; img-src ${source} data:; style-src ${source} 'unsafe-inline'; font-src ${source}; script-src 'nonce-abcDEF0123456789abcDEF0123456789'; base-uri 'none'; form-action 'none'`,
    );
    expect(webviewCsp("x; script-src *", 'n')).not.toMatch(/;\s*script-src \*/);
  });

  it('an exported sheet runs no script and fetches nothing', () => {
    expect(EXPORT_CSP).toContain("default-src 'none'");
    expect(EXPORT_CSP).not.toMatch(/script-src|https?:/);
  });
});
