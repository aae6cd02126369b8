/**
 * The extension in a real VS Code: code-server (VS Code 1.139 on Node 24, both from npm, installed
 * on first use into .e2e/) driven by playwright-core in Debian's chromium. Opens a demo note and
 * looks for what an engineer sees: results at line ends, a hover with its section picture, a
 * failing check squiggled, the status-bar summary. Screenshots go to test-artifacts/e2e/.
 * Skips, saying why, when the editor cannot be installed (no registry) or chromium is missing.
 */
import { existsSync, mkdirSync, readFileSync, writeFileSync } from 'node:fs';
import { join } from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { BrowserContext, Page } from 'playwright-core';
import { ensureCodeServer, paths, registryReachable, type RunningCodeServer, scratchWorkspace, startCodeServer } from './code-server.mjs';
import { ensureBuilt, ROOT } from '../server/lsp-client';

const CHROMIUM = process.env.TAULINE_CHROMIUM ?? '/usr/bin/chromium';
const ARTIFACTS = join(ROOT, 'test-artifacts', 'e2e');

function skipReason(): string | undefined {
  if (process.env.TAULINE_E2E === '0') return 'TAULINE_E2E=0 turns the editor test off';
  if (!existsSync(CHROMIUM)) return `no chromium at ${CHROMIUM} (apt-get install -y chromium, or set TAULINE_CHROMIUM)`;
  const p = paths(ROOT);
  if (existsSync(p.entry) && existsSync(p.node)) return undefined;
  if (!registryReachable()) return 'code-server is not installed in .e2e/ and the npm registry cannot be reached to install it';
  return undefined;
}

/** Installs the editor on first use (minutes, once) while the suite is collected, so a failed install is a skip with its reason, not a failure. */
function prepare(): string | undefined {
  const why = skipReason();
  if (why) return why;
  try {
    ensureCodeServer(ROOT, (l) => console.log(`[e2e] ${l}`));
    return undefined;
  } catch (e) {
    return `code-server could not be installed into .e2e/ (${e instanceof Error ? e.message : String(e)})`;
  }
}

const reason = prepare();
if (reason) console.log(`[e2e] skipped: ${reason}`);

describe.skipIf(!!reason)('extension in a real VS Code (code-server + chromium)', () => {
  let server: RunningCodeServer | undefined;
  let context: BrowserContext | undefined;
  let page: Page;
  const consoleErrors: string[] = [];

  beforeAll(async () => {
    ensureBuilt();
    ensureCodeServer(ROOT, (l) => console.log(`[e2e] ${l}`));
    mkdirSync(ARTIFACTS, { recursive: true });
    const runDir = join(ROOT, '.e2e', 'run-test');
    const workspace = scratchWorkspace(join(ROOT, 'examples'), join(ROOT, '.e2e', 'workspace-test'));
    // A copy of a demo note whose allowable shear stress is set too low, so one check fails.
    const girder = readFileSync(join(workspace, 'mezzanine-girder.md'), 'utf8');
    writeFileSync(join(workspace, 'failing-check.md'), girder.replace(/tau_allow = [^#\n]*/, 'tau_allow = 12 MPa '));
    server = await startCodeServer(ROOT, { workspace, runDir, trusted: true });
    const { chromium } = await import('playwright-core');
    context = await chromium.launchPersistentContext(join(runDir, 'chromium'), {
      executablePath: CHROMIUM,
      headless: true,
      viewport: { width: 1400, height: 900 },
      args: ['--no-sandbox', '--disable-gpu', '--disable-quic', '--no-first-run', '--disable-background-networking', '--disable-component-update', '--disable-sync'],
    });
    page = context.pages()[0] ?? (await context.newPage());
    page.on('console', (m) => {
      if (m.type() === 'error') consoleErrors.push(m.text());
    });
    await page.goto(`${server.url}/?folder=${encodeURIComponent(workspace)}`);
    await page.waitForSelector('.monaco-workbench', { timeout: 60_000 });
    await page.waitForSelector('.explorer-folders-view .monaco-list-row', { timeout: 60_000 });
  }, 900_000);

  afterAll(async () => {
    await context?.close().catch(() => undefined);
    server?.stop();
  });

  async function openFile(name: string) {
    await page.keyboard.press('Control+P');
    const input = page.locator('.quick-input-widget input');
    await input.waitFor({ timeout: 15_000 });
    await input.fill(name);
    // Click the exact row: Enter can beat the result list.
    const row = page.locator('.quick-input-widget .monaco-list-row', { hasText: name }).first();
    await row.waitFor({ timeout: 15_000 });
    await row.click();
    try {
      await page.locator('.tabs-container .tab', { hasText: name }).first().waitFor({ timeout: 20_000 });
    } catch (e) {
      await page.screenshot({ path: join(ARTIFACTS, `failed-open-${name}.png`) });
      throw e;
    }
  }

  async function runCommand(title: string) {
    await page.keyboard.press('F1');
    const input = page.locator('.quick-input-widget input');
    await input.waitFor({ timeout: 15_000 });
    await input.fill(`>${title}`);
    const row = page.locator('.quick-input-widget .monaco-list-row', { hasText: title }).first();
    try {
      await row.waitFor({ timeout: 15_000 });
    } catch (e) {
      await page.screenshot({ path: join(ARTIFACTS, 'failed-command.png') });
      throw e;
    }
    await row.click();
    await page.waitForTimeout(500);
  }

  async function pickTheme(theme: string) {
    await page.mouse.move(5, 5);
    await page.keyboard.press('Escape');
    await runCommand('Preferences: Color Theme');
    const input = page.locator('.quick-input-widget input');
    await input.fill(theme);
    const row = page.locator('.quick-input-widget .monaco-list-row', { hasText: new RegExp(`^\\s*${theme}`) }).first();
    try {
      await row.waitFor({ timeout: 15_000 });
    } catch (e) {
      await page.screenshot({ path: join(ARTIFACTS, 'failed-theme.png') });
      throw e;
    }
    await row.click();
    await page.waitForTimeout(800);
  }

  /** Scrolls the editor so the line containing `text` is on screen. */
  async function reveal(text: string) {
    await page.keyboard.press('Control+Home');
    for (let i = 0; i < 30; i++) {
      if ((await page.locator('.monaco-editor .view-line', { hasText: text }).count()) > 0) return;
      await page.keyboard.press('PageDown');
      await page.waitForTimeout(150);
    }
  }

  it('shows results at line ends, a hover with the section picture, and the status bar', async () => {
    await openFile('mezzanine-girder.md');
    await page.waitForSelector('.monaco-editor .view-line >> text=section G2', { timeout: 30_000 });
    // Inlay hints arrive once the extension and the server are up (7-11 s after opening in practice).
    await page.locator('.monaco-editor .view-line', { hasText: '= 536 mm' }).first().waitFor({ timeout: 90_000 });
    await page.screenshot({ path: join(ARTIFACTS, '1-inline-results.png') });
    await page.locator('.codelens-decoration', { hasText: 'open calculation sheet' }).first().waitFor({ timeout: 30_000 });

    // Hover the section name; the first hover can come before the server is ready, so retry.
    const name = page.locator('.monaco-editor .view-line', { hasText: 'section G2' }).first().locator('span', { hasText: /^G2$/ }).first();
    const hover = page.locator('.monaco-hover:visible');
    let ok = false;
    for (let attempt = 0; attempt < 20 && !ok; attempt++) {
      await page.mouse.move(5, 5);
      await page.waitForTimeout(300);
      const box = await name.boundingBox();
      if (!box) throw new Error('the section name is not on screen');
      await page.mouse.move(box.x + box.width / 2, box.y + box.height / 2);
      try {
        await hover.locator('img[src^="data:image/svg+xml"]').first().waitFor({ timeout: 2500 });
        ok = true;
      } catch {
        // not yet
      }
    }
    expect(ok).toBe(true);
    const hoverText = await hover.first().innerText();
    expect(hoverText).toMatch(/section G2/);
    expect(hoverText).toMatch(/Q at the neutral axis/);
    const loaded = await hover.locator('img[src^="data:image/svg+xml"]').first().evaluate((img) => { const i = img as unknown as { complete: boolean; naturalWidth: number }; return i.complete && i.naturalWidth > 0; });
    expect(loaded).toBe(true);
    await page.waitForTimeout(400);
    await page.screenshot({ path: join(ARTIFACTS, '2-hover-section.png') });

    const status = await page.locator('.statusbar-item', { hasText: 'Tauline' }).first().innerText();
    expect(status).toMatch(/checks? pass/);

    // A dark theme: the picture's colours are baked in from the theme kind the extension reports.
    const lightSrc = await hover.locator('img[src^="data:image/svg+xml"]').first().getAttribute('src');
    await pickTheme('Dark Modern');
    await page.locator('.monaco-workbench.vs-dark').waitFor({ timeout: 30_000 });
    let darkSrc: string | null = null;
    for (let attempt = 0; attempt < 20 && (!darkSrc || darkSrc === lightSrc); attempt++) {
      await page.mouse.move(5, 5);
      await page.waitForTimeout(300);
      const box = await name.boundingBox();
      if (!box) throw new Error('the section name is not on screen');
      await page.mouse.move(box.x + box.width / 2, box.y + box.height / 2);
      try {
        await hover.locator('img[src^="data:image/svg+xml"]').first().waitFor({ timeout: 2500 });
        darkSrc = await hover.locator('img[src^="data:image/svg+xml"]').first().getAttribute('src');
      } catch {
        // not yet
      }
    }
    expect(darkSrc).not.toBe(lightSrc);
    const darkSvg = Buffer.from(darkSrc!.split(',')[1]!, 'base64').toString('utf8');
    expect(darkSvg).toContain('#e2e6eb'); // the dark figure's ink
    await page.waitForTimeout(400);
    await page.screenshot({ path: join(ARTIFACTS, '2b-hover-section-dark.png') });
    await pickTheme('Light Modern');
    await page.locator('.monaco-workbench.vs').waitFor({ timeout: 30_000 });

    // The lens over a block opens the calculation sheet beside the note.
    await page.mouse.move(5, 5);
    await page.keyboard.press('Escape');
    await page.locator('.codelens-decoration a', { hasText: 'open calculation sheet' }).first().click();
    await page.locator('.tabs-container .tab', { hasText: 'Calculation sheet' }).first().waitFor({ timeout: 30_000 });
    await page.waitForTimeout(1500);
    await page.screenshot({ path: join(ARTIFACTS, '4-calculation-sheet.png') });
    await runCommand('View: Close All Editors');
  });

  it('squiggles a failing check and explains it on hover', async () => {
    await openFile('failing-check.md');
    await reveal('check t_max');
    await page.locator('.monaco-editor .view-line', { hasText: 'FAIL' }).first().waitFor({ timeout: 60_000 });
    await page.locator('.monaco-editor .squiggly-warning').first().waitFor({ timeout: 30_000 });
    const keyword = page.locator('.monaco-editor .view-line', { hasText: 'check t_max' }).first().locator('span', { hasText: /^check$/ }).first();
    const hover = page.locator('.monaco-hover:visible');
    let text = '';
    for (let attempt = 0; attempt < 20 && !/FAIL/.test(text); attempt++) {
      await page.mouse.move(5, 5);
      await page.waitForTimeout(300);
      // Measured each time: code lenses arriving late move the lines down.
      const box = await keyword.boundingBox();
      if (!box) throw new Error('the check line is not on screen');
      await page.mouse.move(box.x + box.width / 2, box.y + box.height / 2);
      await page.waitForTimeout(1500);
      text = (await hover.allInnerTexts()).join('\n');
    }
    expect(text).toMatch(/Check fails/);
    expect(text).toMatch(/utilisation 1\.40/);
    expect(text).toMatch(/licensed engineer/);
    expect(text).toMatch(/FAIL/);
    await page.screenshot({ path: join(ARTIFACTS, '3-failing-check.png') });
    const status = await page.locator('.statusbar-item', { hasText: 'Tauline' }).first().innerText();
    expect(status).toMatch(/FAIL/);

    // Stamping writes the results table after each block, as one undoable edit.
    await page.mouse.move(5, 5);
    await page.keyboard.press('Escape');
    await runCommand('Tauline: Stamp Results into Note');
    await page.locator('.monaco-editor .view-line', { hasText: 'tauline-results' }).first().waitFor({ timeout: 30_000 });
    await page.screenshot({ path: join(ARTIFACTS, '3b-stamped.png') });
  });

  it('logs no content-security-policy violations', () => {
    // The marketplace address is pointed at a dead loopback port on purpose; only our own content counts.
    expect(consoleErrors.filter((e) => /Content Security Policy/i.test(e) && !/127\.0\.0\.1:9\//.test(e))).toEqual([]);
  });
});

describe.skipIf(!!reason)('extension in Restricted Mode with evaluation turned off', () => {
  let server: RunningCodeServer | undefined;
  let context: BrowserContext | undefined;
  let page: Page;

  beforeAll(async () => {
    ensureBuilt();
    ensureCodeServer(ROOT, (l) => console.log(`[e2e] ${l}`));
    mkdirSync(ARTIFACTS, { recursive: true });
    const runDir = join(ROOT, '.e2e', 'run-test-restricted');
    const workspace = scratchWorkspace(join(ROOT, 'examples'), join(ROOT, '.e2e', 'workspace-test-restricted'));
    // Workspace Trust stays on (no --disable-workspace-trust) and the folder is never trusted.
    server = await startCodeServer(ROOT, { workspace, runDir, trusted: false, settings: { 'tauline.evaluateInRestrictedMode': false } });
    const { chromium } = await import('playwright-core');
    context = await chromium.launchPersistentContext(join(runDir, 'chromium'), {
      executablePath: CHROMIUM,
      headless: true,
      viewport: { width: 1400, height: 900 },
      args: ['--no-sandbox', '--disable-gpu', '--disable-quic', '--no-first-run', '--disable-background-networking', '--disable-component-update', '--disable-sync'],
    });
    page = context.pages()[0] ?? (await context.newPage());
    await page.goto(`${server.url}/?folder=${encodeURIComponent(workspace)}`);
    await page.waitForSelector('.monaco-workbench', { timeout: 60_000 });
    await page.waitForSelector('.explorer-folders-view .monaco-list-row', { timeout: 60_000 });
  }, 900_000);

  afterAll(async () => {
    await context?.close().catch(() => undefined);
    server?.stop();
  });

  it('highlights and checks syntax but evaluates nothing', async () => {
    await page.keyboard.press('Control+P');
    const input = page.locator('.quick-input-widget input');
    await input.waitFor({ timeout: 15_000 });
    await input.fill('mezzanine-girder.md');
    const row = page.locator('.quick-input-widget .monaco-list-row', { hasText: 'mezzanine-girder.md' }).first();
    await row.waitFor({ timeout: 15_000 });
    await row.click();
    await page.waitForSelector('.monaco-editor .view-line >> text=section G2', { timeout: 30_000 });
    // The lens says why nothing is evaluated, and so does the status bar.
    await page.locator('.codelens-decoration', { hasText: 'Not evaluated' }).first().waitFor({ timeout: 90_000 });
    const status = await page.locator('.statusbar-item', { hasText: 'Tauline' }).first().innerText();
    expect(status).toMatch(/not evaluated/);
    expect(await page.locator('.monaco-editor .view-line', { hasText: '= 536 mm' }).count()).toBe(0);
    // The grammar still colours the block: `section` is its own token.
    expect(await page.locator('.monaco-editor .view-line', { hasText: 'section G2' }).first().locator('span', { hasText: /^section$/ }).count()).toBe(1);
    await page.screenshot({ path: join(ARTIFACTS, '5-restricted-mode.png') });
  });
});
