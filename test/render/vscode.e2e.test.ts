/**
 * The sheet and the cards in a real VS Code (code-server from npm, driven by playwright-core in
 * Debian's chromium; the editor tests' harness in test/e2e/code-server.mjs): the report panel shows
 * the note under its CSP and follows the editor to another note; the Markdown preview shows the
 * result cards with their figures and KaTeX. Screenshots go to test-artifacts/render/.
 * Skips, saying why, when chromium or the editor cannot be had.
 */
import { existsSync, mkdirSync } from 'node:fs';
import { join } from 'node:path';
import type { BrowserContext, FrameLocator, Page } from 'playwright-core';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { ensureCodeServer, paths, registryReachable, type RunningCodeServer, scratchWorkspace, startCodeServer } from '../e2e/code-server.mjs';
import { ARTIFACTS, ROOT } from './helpers';

const CHROMIUM = process.env.TAULINE_CHROMIUM ?? '/usr/bin/chromium';

function skipReason(): string | undefined {
  if (process.env.TAULINE_E2E === '0') return 'TAULINE_E2E=0 turns the editor tests off';
  if (!existsSync(CHROMIUM)) return `no chromium at ${CHROMIUM}`;
  const p = paths(ROOT);
  if (existsSync(p.entry) && existsSync(p.node)) return undefined;
  if (!registryReachable()) return 'code-server is not installed in .e2e/ and the npm registry cannot be reached';
  try {
    ensureCodeServer(ROOT, (l) => console.log(`[render e2e] ${l}`));
    return undefined;
  } catch (e) {
    return `code-server could not be installed (${e instanceof Error ? e.message : String(e)})`;
  }
}

const reason = skipReason();
if (reason) console.log(`[render e2e] skipped: ${reason}`);

describe.skipIf(!!reason)('sheet and preview in a real VS Code', () => {
  let server: RunningCodeServer | undefined;
  let context: BrowserContext | undefined;
  let page: Page;
  const cspViolations: string[] = [];

  beforeAll(async () => {
    if (!existsSync(join(ROOT, 'dist', 'extension.js')) || !existsSync(join(ROOT, 'dist', 'webview.js')) || !existsSync(join(ROOT, 'media', 'katex', 'katex.min.css'))) {
      const { execFileSync } = await import('node:child_process');
      execFileSync(process.execPath, [join(ROOT, 'scripts', 'build.mjs')], { cwd: ROOT, stdio: 'ignore' });
    }
    mkdirSync(ARTIFACTS, { recursive: true });
    const runDir = join(ROOT, '.e2e', 'run-render');
    const workspace = scratchWorkspace(join(ROOT, 'examples'), join(ROOT, '.e2e', 'workspace-render'));
    server = await startCodeServer(ROOT, { workspace, runDir, trusted: true });
    const { chromium } = await import('playwright-core');
    context = await chromium.launchPersistentContext(join(runDir, 'chromium'), {
      executablePath: CHROMIUM,
      headless: true,
      viewport: { width: 1400, height: 900 },
      args: ['--no-sandbox', '--disable-gpu', '--disable-quic', '--no-first-run', '--disable-background-networking', '--disable-component-update', '--disable-sync'],
    });
    page = context.pages()[0] ?? (await context.newPage());
    context.on('console', (m) => {
      if (/Content Security Policy/i.test(m.text()) && /vscode-cdn|vscode-resource|webview|nonce/i.test(m.text())) cspViolations.push(m.text());
    });
    await page.goto(`${server.url}/?folder=${encodeURIComponent(workspace)}`);
    await page.locator('.monaco-workbench').waitFor({ timeout: 90_000 });
    await page.locator('.explorer-folders-view .monaco-list-row').first().waitFor({ timeout: 60_000 });
  }, 300_000);

  afterAll(async () => {
    await context?.close();
    server?.stop();
  });

  async function openFile(name: string) {
    await page.keyboard.press('Control+P');
    await page.locator('.quick-input-widget input').fill(name);
    await page.locator('.quick-input-widget .monaco-list-row', { hasText: name }).first().click();
    await page.locator('.tabs-container .tab', { hasText: name }).first().waitFor({ timeout: 20_000 });
  }

  async function runCommand(title: string) {
    await page.keyboard.press('F1');
    await page.locator('.quick-input-widget input').fill(`>${title}`);
    await page.locator('.quick-input-widget .monaco-list-row', { hasText: title }).first().click();
  }

  const webview = (): FrameLocator => page.frameLocator('iframe.webview.ready').last().frameLocator('#active-frame');

  it('the sheet panel shows the note, its figures and formulas, and follows the editor', async () => {
    await openFile('mezzanine-girder.md');
    // The extension is up once its results appear at line ends.
    await page.locator('.monaco-editor .view-line', { hasText: '= 536 mm' }).first().waitFor({ timeout: 90_000 });
    await runCommand('Open Calculation Sheet');
    const sheet = webview();
    await sheet.locator('.tl-sheet-head', { hasText: 'Mezzanine girder G2' }).waitFor({ timeout: 30_000 });
    expect(await sheet.locator('.tl-card').count()).toBe(3);
    expect(await sheet.locator('svg.tl-fig').count()).toBeGreaterThanOrEqual(3);
    expect(await sheet.locator('.katex').count()).toBeGreaterThan(5);
    expect(await sheet.locator('.tl-sheet-status').innerText()).toContain('all 2 checks pass');
    await page.screenshot({ path: join(ARTIFACTS, 'vscode-sheet.png') });
    // Following the editor: another note becomes the sheet.
    await openFile('timber-box-footbridge.md');
    await webview().locator('.tl-sheet-head', { hasText: 'Footbridge' }).waitFor({ timeout: 30_000 });
    await page.screenshot({ path: join(ARTIFACTS, 'vscode-sheet-followed.png') });
    expect(cspViolations).toEqual([]);
    await runCommand('View: Close All Editors');
  });

  it('the Markdown preview shows result cards with figures and KaTeX', async () => {
    await openFile('loading-dock-beam.md');
    await runCommand('Markdown: Open Preview to the Side');
    const preview = webview();
    await preview.locator('.tl-card').first().waitFor({ timeout: 30_000 });
    expect(await preview.locator('.tl-card[data-line]').count()).toBe(1);
    expect(await preview.locator('.tl-row.code-line[data-line]').count()).toBeGreaterThan(3);
    expect(await preview.locator('svg.tl-fig').count()).toBeGreaterThanOrEqual(3);
    expect(await preview.locator('.katex').count()).toBeGreaterThan(3);
    await preview.locator('.tl-figure-beam').scrollIntoViewIfNeeded();
    await page.screenshot({ path: join(ARTIFACTS, 'vscode-preview.png') });
    expect(cspViolations).toEqual([]);
    await runCommand('View: Close All Editors');
  });
});
