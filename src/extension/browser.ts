/**
 * The extension in the browser-based VS Code: the language server runs in a web worker
 * (dist/browser/server.js); everything else is shared with the desktop entry.
 */
import * as vscode from 'vscode';
import { LanguageClient } from 'vscode-languageclient/browser';
import { clientOptions, markdownItExtension, wireClient } from './common';
import { registerReport } from './report';

/** The web extension host is a worker scope; its global Worker is not in the Node typings this project compiles with. */
declare const Worker: new (url: string) => ConstructorParameters<typeof LanguageClient>[3];

let client: LanguageClient | undefined;

export async function activate(context: vscode.ExtensionContext) {
  const serverUri = vscode.Uri.joinPath(context.extensionUri, 'dist', 'browser', 'server.js');
  const worker = new Worker(serverUri.toString(true));
  client = new LanguageClient('tauline', 'Tauline', clientOptions(['file', 'untitled', 'vscode-vfs', 'vscode-test-web']), worker);
  registerReport(context);
  wireClient(context, client);
  context.subscriptions.push({ dispose: () => void client?.stop() });
  client.start().catch((e) => void vscode.window.showErrorMessage(`Tauline: the language server did not start: ${e instanceof Error ? e.message : String(e)}`));
  return markdownItExtension();
}

export async function deactivate(): Promise<void> {
  await client?.stop();
  client = undefined;
}
