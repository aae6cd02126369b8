/**
 * The sheets in a real browser (Debian chromium through playwright-core): exported sheets and the
 * report panel's page laid out without overflow, figures and formulas present and sized, KaTeX's
 * fonts loaded, the panel's script keeping scroll positions under its nonce CSP, printing to PDF
 * without cutting figures, and the hostile corpus running nothing and fetching nothing.
 * Screenshots go to test-artifacts/render/ (git-ignored) for a person to look at.
 * Skipped, with the reason printed, when chromium is not installed.
 */
import { existsSync, mkdirSync, readFileSync, writeFileSync } from 'node:fs';
import { join } from 'node:path';
import MarkdownIt from 'markdown-it';
import type { Browser, Page } from 'playwright-core';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { runReport, sheetStyles } from '../../src/cli/report';
import { buildPage, EXPORT_CSP, renderNote, webviewCsp } from '../../src/render/page';
import { shearPlugin } from '../../src/render/plugin';
import { ARTIFACTS, ROOT } from './helpers';
import { HOSTILE_NOTES } from './xss-corpus';

// Functions passed to page.evaluate run in the browser; the project type-checks without the DOM
// library (the core must not see it), so the few browser globals used here are declared loosely.
/* eslint-disable @typescript-eslint/no-explicit-any */
declare const document: any;
declare const window: any;
declare function getComputedStyle(element: unknown): any;
type HTMLElement = any;

const CHROMIUM = '/usr/bin/chromium';
const available = existsSync(CHROMIUM);
if (!available) console.log(`browser tests skipped: no chromium at ${CHROMIUM} (apt-get install chromium)`);

const ORIGIN = 'https://sheet.test';
const EXAMPLES = ['mezzanine-girder', 'loading-dock-beam', 'timber-box-footbridge', 'glulam-walkway'];
const SHEETS = join(ARTIFACTS, 'sheets');

let browser: Browser;

/** A page that may load only `pages` (served from memory) and `files` under the origin; anything else is recorded and refused. */
async function openPage(options: { colorScheme?: 'light' | 'dark'; width?: number; init?: string } = {}) {
  const page = await browser.newPage({ viewport: { width: options.width ?? 1000, height: 900 }, colorScheme: options.colorScheme ?? 'light' });
  const leaks: string[] = [];
  const dialogs: string[] = [];
  const consoleErrors: string[] = [];
  const pages = new Map<string, string>();
  page.on('dialog', (d) => {
    dialogs.push(d.message());
    void d.dismiss();
  });
  page.on('console', (m) => {
    if (m.type() === 'error' || /Content Security Policy/i.test(m.text())) consoleErrors.push(m.text());
  });
  page.on('pageerror', (e) => consoleErrors.push(String(e)));
  await page.route('**/*', async (route) => {
    const url = route.request().url();
    if (pages.has(url)) return route.fulfill({ status: 200, contentType: 'text/html; charset=utf-8', body: pages.get(url)! });
    if (url.startsWith(`${ORIGIN}/files/`)) {
      const file = join(ROOT, decodeURIComponent(url.slice(`${ORIGIN}/files/`.length)));
      if (existsSync(file)) {
        const type = file.endsWith('.css') ? 'text/css' : file.endsWith('.js') ? 'text/javascript' : file.endsWith('.woff2') ? 'font/woff2' : 'application/octet-stream';
        return route.fulfill({ status: 200, contentType: type, body: readFileSync(file) });
      }
    }
    leaks.push(url);
    return route.abort();
  });
  if (options.init) await page.addInitScript(options.init);
  const load = async (html: string, path = '/page.html') => {
    pages.set(`${ORIGIN}${path}`, html);
    await page.goto(`${ORIGIN}${path}`);
    await page.evaluate(() => document.fonts.ready.then(() => undefined));
  };
  return { page, leaks, dialogs, consoleErrors, load };
}

interface Layout {
  overflowX: number;
  figures: { width: number; height: number; right: number; containerRight: number; spark: boolean }[];
  formulas: number;
  clippedSteps: string[];
  katexFont: string;
  fontsLoaded: boolean;
}

async function layout(page: Page): Promise<Layout> {
  return page.evaluate(() => {
    const doc = document.documentElement;
    const figures = [...document.querySelectorAll('svg.tl-fig')].map((svg: any) => {
      const r = svg.getBoundingClientRect();
      const container = (svg.closest('.tl-card') ?? document.body).getBoundingClientRect();
      return { width: r.width, height: r.height, right: r.right, containerRight: container.right, spark: svg.classList.contains('tl-fig-spark') };
    });
    const clippedSteps = ([...document.querySelectorAll('.tl-step')] as HTMLElement[])
      .filter((s) => s.scrollWidth > s.clientWidth + 1)
      .map((s) => s.querySelector('.tl-math')?.getAttribute('aria-label') ?? '?');
    const k = document.querySelector('.katex .mord.mathnormal') ?? document.querySelector('.katex');
    return {
      overflowX: doc.scrollWidth - doc.clientWidth,
      figures,
      formulas: document.querySelectorAll('.katex').length,
      clippedSteps,
      katexFont: k ? getComputedStyle(k).fontFamily : '',
      fontsLoaded: document.fonts.check('16px KaTeX_Main') && document.fonts.check('italic 16px KaTeX_Math'),
    };
  });
}

describe.skipIf(!available)('sheets in Chromium', () => {
  beforeAll(async () => {
    mkdirSync(ARTIFACTS, { recursive: true });
    const { chromium } = await import('playwright-core');
    browser = await chromium.launch({
      executablePath: CHROMIUM,
      args: ['--no-sandbox', '--disable-gpu', '--disable-quic', '--no-first-run', '--disable-background-networking', '--disable-component-update', '--disable-sync'],
    });
    const code = await runReport([join(ROOT, 'examples'), '-o', SHEETS, '--date', '2026-12-01'], { cwd: ROOT, out: () => undefined, err: (s) => process.stderr.write(s) });
    expect(code).toBe(0);
  });
  afterAll(async () => {
    await browser?.close();
  });

  describe('exported sheets', () => {
    for (const name of EXAMPLES) {
      it(`${name}: laid out, figures and formulas present, fonts loaded, nothing fetched`, async () => {
        const html = readFileSync(join(SHEETS, 'examples', `${name}.html`), 'utf8');
        for (const scheme of ['light', 'dark'] as const) {
          const { page, leaks, consoleErrors, load } = await openPage({ colorScheme: scheme });
          await load(html);
          const l = await layout(page);
          expect(l.overflowX, 'horizontal overflow').toBeLessThanOrEqual(0);
          expect(l.figures.length).toBe((html.match(/<svg /g) ?? []).length);
          expect(l.figures.length).toBeGreaterThanOrEqual(2);
          for (const f of l.figures) {
            expect(f.width).toBeGreaterThan(f.spark ? 90 : 200);
            expect(f.height).toBeGreaterThan(f.spark ? 20 : 150);
            expect(f.right).toBeLessThanOrEqual(f.containerRight + 0.5);
          }
          expect(l.formulas).toBeGreaterThan(3);
          expect(l.clippedSteps, 'formulas wider than their row').toEqual([]);
          expect(l.katexFont).toContain('KaTeX');
          expect(l.fontsLoaded).toBe(true);
          expect(leaks).toEqual([]);
          expect(consoleErrors).toEqual([]);
          await page.screenshot({ path: join(ARTIFACTS, `${name}-${scheme}.png`), fullPage: true });
          await page.close();
        }
      });
    }

    it('a narrow window wraps the formulas instead of widening the page', async () => {
      const html = readFileSync(join(SHEETS, 'examples', 'mezzanine-girder.html'), 'utf8');
      const { page, load } = await openPage({ width: 520 });
      await load(html);
      const l = await layout(page);
      expect(l.overflowX).toBeLessThanOrEqual(0);
      for (const f of l.figures) expect(f.right).toBeLessThanOrEqual(f.containerRight + 0.5);
      await page.screenshot({ path: join(ARTIFACTS, 'mezzanine-girder-narrow.png'), fullPage: true });
      await page.close();
    });

    for (const name of EXAMPLES) {
      it(`${name}: prints to A4 PDF with no figure or check cut across pages`, async () => {
        const html = readFileSync(join(SHEETS, 'examples', `${name}.html`), 'utf8');
        const { page, load } = await openPage();
        await load(html);
        const pdf = await page.pdf({ format: 'A4', printBackground: true, preferCSSPageSize: true });
        writeFileSync(join(ARTIFACTS, `${name}.pdf`), pdf);
        const pages = (pdf.toString('latin1').match(/\/Type\s*\/Page(?!s)/g) ?? []).length;
        expect(pages).toBeGreaterThanOrEqual(1);
        expect(pages).toBeLessThanOrEqual(8);
        // Chromium fragments multi-column boxes with the rules it prints with: lay the sheet out in
        // A4-sized columns (content box 182 × 263 mm) and require every figure, check and table in one column.
        await page.emulateMedia({ media: 'print' });
        const split = await page.evaluate(() => {
          const mm = 96 / 25.4;
          const w = Math.floor(182 * mm), h = Math.floor(263 * mm);
          const wrap = document.createElement('div');
          wrap.style.cssText = `column-width:${w}px;column-gap:0;column-fill:auto;height:${h}px;width:${w}px;`;
          while (document.body.firstChild) wrap.appendChild(document.body.firstChild);
          document.body.appendChild(wrap);
          const left = wrap.getBoundingClientRect().left;
          const cut: string[] = [];
          for (const el of document.querySelectorAll('.tl-figure, .tl-row-check, .tl-props, .tl-reactions, .tl-verdict')) {
            const rects = [...el.getClientRects()].filter((r) => r.height > 0);
            const columns = new Set(rects.map((r) => Math.floor((r.left - left + 1) / w)));
            if (columns.size > 1) cut.push(`${el.className}: ${el.textContent?.slice(0, 40)}`);
          }
          return { cut, columns: Math.ceil(wrap.scrollWidth / w) };
        });
        expect(split.cut).toEqual([]);
        expect(Math.abs(split.columns - pages)).toBeLessThanOrEqual(1);
        await page.screenshot({ path: join(ARTIFACTS, `${name}-print-columns.png`), fullPage: true });
        await page.close();
      });
    }
  });

  it('figures open on their own as images (as hover pictures do): valid SVG documents with their own size', async () => {
    const { buildSection, plate, translate } = await import('../../src/core/section');
    const { solveBeam } = await import('../../src/core/beam');
    const { sectionWithTau, sparkline, beamDiagrams } = await import('../../src/render/figures');
    const girder = buildSection([
      { part: plate(0.25, 0.016).part!, hole: false },
      { part: translate(plate(0.01, 0.52).part!, 0, 0.016), hole: false },
      { part: translate(plate(0.25, 0.016).part!, 0, 0.536), hole: false },
    ]).section!;
    const beam = solveBeam({ span: 6, supports: [{ kind: 'pin', x: 0 }, { kind: 'roller', x: 6 }], loads: [{ kind: 'udl', w: 10_000, x1: 0, x2: 6 }] }).beam!;
    const svgs = [
      sectionWithTau(girder, 82_200, { colors: 'light', title: 'a <title> & "quotes"' }),
      sectionWithTau(girder, undefined, { colors: 'dark' }),
      sparkline(girder, 1000, { colors: 'light', mark: 0.3 }),
      beamDiagrams(beam, { colors: 'dark' }),
    ];
    const imgs = svgs.map((svg) => `<img src="data:image/svg+xml;base64,${Buffer.from(svg).toString('base64')}">`).join('');
    const { page, leaks, load } = await openPage();
    await load(`<!DOCTYPE html><html><body style="background:#777">${imgs}</body></html>`);
    const sizes = await page.evaluate(() => Promise.all([...document.images].map((img: any) => img.decode().then(() => [img.naturalWidth, img.naturalHeight], () => [0, 0]))));
    for (const [i, [w, h]] of sizes.entries()) {
      const m = /width="(\d+)" height="(\d+)"/.exec(svgs[i]!)!;
      expect([w, h]).toEqual([Number(m[1]), Number(m[2])]);
    }
    expect(leaks).toEqual([]);
    await page.screenshot({ path: join(ARTIFACTS, 'figures-as-images.png'), fullPage: true });
    await page.close();
  });

  describe('the report panel page', () => {
    const NOTE_A = readFileSync(join(ROOT, 'examples', 'mezzanine-girder.md'), 'utf8');
    const NOTE_B = readFileSync(join(ROOT, 'examples', 'timber-box-footbridge.md'), 'utf8');
    const katexDir = existsSync(join(ROOT, 'media', 'katex', 'katex.min.css')) ? 'media/katex' : 'node_modules/katex/dist';
    const script = existsSync(join(ROOT, 'dist', 'webview.js')) ? 'dist/webview.js' : 'test-artifacts/render/webview.js';

    /** What VS Code gives a webview: acquireVsCodeApi (once), theme classes and --vscode-* variables. */
    const vscodeHost = (kind: 'light' | 'dark') => `
      (() => {
        let acquired = false;
        window.__tlStateWrites = 0;
        window.acquireVsCodeApi = () => {
          if (acquired) throw new Error('acquired twice');
          acquired = true;
          return {
            getState: () => window.__tlSavedState,
            setState: (s) => { window.__tlSavedState = JSON.parse(JSON.stringify(s)); window.__tlStateWrites++; },
            postMessage: () => { throw new Error('the page must not post'); },
          };
        };
        const vars = ${JSON.stringify(
          kind === 'dark'
            ? { '--vscode-editor-foreground': '#cccccc', '--vscode-editor-background': '#1f1f1f', '--vscode-descriptionForeground': '#9d9d9d', '--vscode-textCodeBlock-background': '#2b2b2b', '--vscode-widget-border': '#454545', '--vscode-font-family': 'system-ui, sans-serif', '--vscode-font-size': '13px', '--vscode-editor-font-family': 'monospace' }
            : { '--vscode-editor-foreground': '#3b3b3b', '--vscode-editor-background': '#ffffff', '--vscode-descriptionForeground': '#717171', '--vscode-textCodeBlock-background': '#f3f3f3', '--vscode-widget-border': '#e5e5e5', '--vscode-font-family': 'system-ui, sans-serif', '--vscode-font-size': '13px', '--vscode-editor-font-family': 'monospace' },
        )};
        document.addEventListener('DOMContentLoaded', () => {
          document.body.classList.add('vscode-${kind}');
          for (const [k, v] of Object.entries(vars)) document.documentElement.style.setProperty(k, v);
        });
      })();`;

    function panelPage(text: string, key: string): string {
      const note = renderNote(text, key);
      const nonce = 'A'.repeat(16) + 'b'.repeat(16);
      return buildPage({
        kind: 'webview',
        header: { title: note.title, project: note.project, date: '2026-12-01', source: key },
        summary: note.summary,
        body: note.html,
        csp: webviewCsp(ORIGIN, nonce),
        stylesheets: [`${ORIGIN}/files/${katexDir}/katex.min.css`, `${ORIGIN}/files/media/preview.css`],
        script: { src: `${ORIGIN}/files/${script}`, nonce },
        documentKey: key,
      });
    }

    beforeAll(async () => {
      if (!existsSync(join(ROOT, 'dist', 'webview.js'))) {
        const { build } = await import('esbuild');
        await build({ entryPoints: [join(ROOT, 'src/render/webview-script.ts')], outfile: join(ROOT, script), bundle: true, format: 'iife', platform: 'browser', logLevel: 'warning' });
      }
    });

    for (const kind of ['light', 'dark'] as const) {
      it(`renders under its CSP with the editor's ${kind} theme, with no violation`, async () => {
        const { page, leaks, consoleErrors, load } = await openPage({ init: vscodeHost(kind) });
        await load(panelPage(NOTE_A, 'file:///notes/mezzanine-girder.md'));
        const l = await layout(page);
        expect(consoleErrors).toEqual([]);
        expect(leaks).toEqual([]);
        expect(l.overflowX).toBeLessThanOrEqual(0);
        expect(l.figures.length).toBeGreaterThanOrEqual(3);
        expect(l.fontsLoaded).toBe(true);
        expect(await page.evaluate(() => getComputedStyle(document.querySelector('.tl-card')!).color)).toBe(kind === 'dark' ? 'rgb(204, 204, 204)' : 'rgb(59, 59, 59)');
        await page.screenshot({ path: join(ARTIFACTS, `panel-${kind}.png`), fullPage: false });
        // The CSP is in force: a script without the nonce does not run, and the browser says so.
        await page.evaluate(() => {
          const s = document.createElement('script');
          s.textContent = 'window.__tlInjected = 1';
          document.body.appendChild(s);
        });
        expect(await page.evaluate(() => (window as unknown as { __tlInjected?: number }).__tlInjected)).toBeUndefined();
        expect(consoleErrors.some((e) => /Content Security Policy/i.test(e))).toBe(true);
        await page.close();
      });
    }

    it('keeps the scroll position through live updates and per document when following the editor', async () => {
      const { page, load } = await openPage({ init: vscodeHost('light') });
      const a = 'file:///notes/a.md';
      const b = 'file:///notes/b.md';
      await load(panelPage(NOTE_A, a));
      await page.evaluate(() => window.scrollTo(0, 900));
      await page.waitForFunction(() => (window as unknown as { __tlSavedState?: { scroll: Record<string, number> } }).__tlSavedState?.scroll['file:///notes/a.md'] === 900);
      const update = (text: string, key: string) => {
        const n = renderNote(text, key);
        return { type: 'update', documentKey: key, title: n.title, header: `<div class="tl-sheet-brand">${n.title}</div>`, body: n.html };
      };
      // Typing: the same document re-rendered stays where it was.
      await page.evaluate((m) => window.postMessage(m, '*'), update(NOTE_A.replace('draft for checking', 'checked'), a));
      await page.waitForFunction(() => document.body.textContent!.includes('Status: checked'));
      expect(await page.evaluate(() => window.scrollY)).toBe(900);
      // Following the editor to another note: that note starts at its top...
      await page.evaluate((m) => window.postMessage(m, '*'), update(NOTE_B, b));
      await page.waitForFunction(() => document.body.dataset.document === 'file:///notes/b.md');
      expect(await page.evaluate(() => window.scrollY)).toBe(0);
      expect(await page.evaluate(() => document.title)).toContain('Footbridge');
      // ...and coming back returns to where the engineer was.
      await page.evaluate((m) => window.postMessage(m, '*'), update(NOTE_A, a));
      await page.waitForFunction(() => document.body.dataset.document === 'file:///notes/a.md');
      expect(await page.evaluate(() => window.scrollY)).toBe(900);
      // A reloaded page (VS Code restores the state) opens at the remembered position.
      const saved = await page.evaluate(() => (window as unknown as { __tlSavedState: unknown }).__tlSavedState);
      await page.addInitScript((s) => ((window as unknown as { __tlSavedState: unknown }).__tlSavedState = s), saved);
      await page.reload({ waitUntil: 'load' });
      await expect.poll(() => page.evaluate(() => window.scrollY), { timeout: 5000 }).toBe(900);
      // Messages of the wrong shape are ignored.
      await page.evaluate(() => window.postMessage({ type: 'update', body: '<p>x</p>' }, '*'));
      await page.waitForTimeout(50);
      expect(await page.evaluate(() => document.querySelector('.tl-sheet')!.innerHTML.startsWith('<p>x'))).toBe(false);
      await page.close();
    });
  });

  describe('hostile notes run nothing and fetch nothing', () => {
    const init = `window.alert = window.alert; window.__tlPwned = undefined;`;
    const vscodeLike = new MarkdownIt({ html: true }).use(shearPlugin);
    let css = '';
    beforeAll(() => {
      css = sheetStyles(ROOT);
    });

    async function exercise(html: string) {
      const { page, leaks, dialogs, load } = await openPage({ init });
      await load(html);
      // Fire every kind of event a payload could hang on, on every element, and follow every link.
      await page.evaluate(() => {
        for (const el of document.querySelectorAll('*')) {
          for (const type of ['mouseover', 'mouseenter', 'focus', 'click', 'load', 'error', 'animationstart']) {
            try {
              el.dispatchEvent(new Event(type, { bubbles: true }));
            } catch {
              /* ignore */
            }
          }
        }
      });
      await page.waitForTimeout(100);
      const pwned = await page.evaluate(() => (window as unknown as { __tlPwned?: unknown }).__tlPwned);
      await page.close();
      return { pwned, dialogs, leaks };
    }

    for (const note of HOSTILE_NOTES) {
      it(note.name, async () => {
        const rendered = renderNote(note.text, note.name);
        const withCsp = buildPage({ kind: 'export', header: { title: rendered.title, project: rendered.project }, summary: rendered.summary, body: rendered.html, csp: EXPORT_CSP, css });
        // Escaping must hold on its own: the same sheet with its CSP removed.
        const withoutCsp = withCsp.replace(/<meta http-equiv="Content-Security-Policy"[^>]*>/, '');
        const pages = [withCsp, withoutCsp];
        if (note.inBlocksOnly) pages.push(`<!DOCTYPE html><html><head><meta charset="utf-8"></head><body>${vscodeLike.render(note.text)}</body></html>`);
        for (const html of pages) {
          const r = await exercise(html);
          expect(r.pwned, 'a payload ran').toBeUndefined();
          expect(r.dialogs, 'a payload opened a dialog').toEqual([]);
          expect(r.leaks, 'a request left the page').toEqual([]);
        }
      });
    }
  });
});
