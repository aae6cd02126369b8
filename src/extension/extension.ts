/**
 * The VS Code extension (desktop): starts the Tauline language server as a Node process over IPC,
 * and contributes the Markdown preview plugin, the status bar and the commands.
 */
import * as vscode from 'vscode';
import { LanguageClient, type ServerOptions, TransportKind } from 'vscode-languageclient/node';
import { clientOptions, markdownItExtension, wireClient } from './common';
import { registerReport } from './report';

let client: LanguageClient | undefined;

export async function activate(context: vscode.ExtensionContext) {
  const module = vscode.Uri.joinPath(context.extensionUri, 'dist', 'server.js').fsPath;
  const serverOptions: ServerOptions = {
    run: { module, transport: TransportKind.ipc },
    debug: { module, transport: TransportKind.ipc, options: { execArgv: ['--nolazy', '--inspect=6019'] } },
  };
  client = new LanguageClient('tauline', 'Tauline', serverOptions, clientOptions(['file', 'untitled']));
  registerReport(context);
  wireClient(context, client);
  context.subscriptions.push({ dispose: () => void client?.stop() });
  // The preview plugin must be returned even if the server fails to start.
  client.start().catch((e) => void vscode.window.showErrorMessage(`Tauline: the language server did not start: ${e instanceof Error ? e.message : String(e)}`));
  return markdownItExtension();
}

export async function deactivate(): Promise<void> {
  await client?.stop();
  client = undefined;
}
