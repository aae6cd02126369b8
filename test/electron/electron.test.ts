/**
 * The standard desktop harness: @vscode/test-electron downloads a VS Code build and runs
 * suite/index.cjs inside it with this extension loaded. Where no VS Code can be had (this kind of
 * machine cannot download one; see the code-server suite in test/e2e for the editor test that runs
 * here) the suite is skipped with the reason printed. Set VSCODE_EXECUTABLE to use an installed one.
 */
import { existsSync } from 'node:fs';
import { join } from 'node:path';
import { describe, expect, it } from 'vitest';
import { ensureBuilt, ROOT } from '../server/lsp-client';
import { scratchWorkspace } from '../e2e/code-server.mjs';

async function findVSCode(): Promise<{ executable?: string; reason?: string }> {
  if (process.env.VSCODE_EXECUTABLE) {
    return existsSync(process.env.VSCODE_EXECUTABLE) ? { executable: process.env.VSCODE_EXECUTABLE } : { reason: `VSCODE_EXECUTABLE=${process.env.VSCODE_EXECUTABLE} does not exist` };
  }
  try {
    const { downloadAndUnzipVSCode } = await import('@vscode/test-electron');
    const download = downloadAndUnzipVSCode({ version: '1.91.0', cachePath: join(ROOT, '.e2e', 'vscode-test') });
    const timeout = new Promise<never>((_, rej) => setTimeout(() => rej(new Error('no answer from the VS Code download server within 60 s')), 60_000));
    return { executable: await Promise.race([download, timeout]) };
  } catch (e) {
    return { reason: `VS Code cannot be downloaded here (${e instanceof Error ? e.message.split('\n')[0] : String(e)})` };
  }
}

const found = await findVSCode();
if (found.reason) console.log(`[electron] skipped: ${found.reason}; the code-server suite (test/e2e) covers the editor here.`);

describe.skipIf(!found.executable)('extension in desktop VS Code (@vscode/test-electron)', () => {
  it('shows results, hovers with pictures and squiggles a failing check', async () => {
    ensureBuilt();
    const { runTests } = await import('@vscode/test-electron');
    const workspace = scratchWorkspace(join(ROOT, 'examples'), join(ROOT, '.e2e', 'workspace-electron'));
    const code = await runTests({
      vscodeExecutablePath: found.executable,
      extensionDevelopmentPath: ROOT,
      extensionTestsPath: join(ROOT, 'test', 'electron', 'suite', 'index.cjs'),
      launchArgs: [workspace, '--disable-extensions', '--disable-workspace-trust', '--no-sandbox'],
    });
    expect(code).toBe(0);
  }, 600_000);
});
