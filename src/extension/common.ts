/**
 * What the node and browser entries of the extension share: settings (our own names) sent to the
 * server, the theme kind for hover pictures, the status-bar summary of the open note's checks,
 * Workspace Trust, the stamp command, and the Markdown preview plugin. The entries differ only in
 * how they start the language client (a Node process over IPC, or a web worker).
 */
import * as vscode from 'vscode';
import type { BaseLanguageClient, LanguageClientOptions } from 'vscode-languageclient';
import { shearPlugin, type ShearPluginOptions } from '../render/plugin';

export const SECTION = 'tauline';
export const NOTE_SUMMARY_NOTIFICATION = 'tauline/noteSummary';
export const THEME_NOTIFICATION = 'tauline/theme';
export const STAMP_EDITS_REQUEST = 'tauline/stampEdits';

export interface NoteSummary {
  uri: string;
  version: number;
  evaluated: boolean;
  blocks: number;
  checks: number;
  failed: number;
  errors: number;
  maxRatio: number | null;
}

/** Evaluation runs in a trusted workspace, and in restricted mode unless the user turned it off (the block language cannot run code). */
export function evaluationAllowed(): boolean {
  if (vscode.workspace.isTrusted) return true;
  return vscode.workspace.getConfiguration(SECTION).get<boolean>('evaluateInRestrictedMode', true);
}

export function themeKind(): string {
  switch (vscode.window.activeColorTheme.kind) {
    case vscode.ColorThemeKind.Light:
      return 'light';
    case vscode.ColorThemeKind.Dark:
      return 'dark';
    case vscode.ColorThemeKind.HighContrast:
      return 'highContrast';
    case vscode.ColorThemeKind.HighContrastLight:
      return 'highContrastLight';
    default:
      return 'unknown';
  }
}

/** The settings object the server reads (src/server/settings.ts). */
export function serverSettings(): Record<string, unknown> {
  const c = vscode.workspace.getConfiguration(SECTION);
  return {
    unitSystem: c.get<string>('unitSystem', 'auto'),
    significantFigures: c.get<number>('significantFigures', 3),
    inlineResults: c.get<boolean>('inlineResults.enabled', true),
    diagnosticsDelayMs: c.get<number>('diagnostics.delay', 150),
    evaluate: evaluationAllowed(),
  };
}

/** vscode-languageclient's ErrorAction and CloseAction values (numbers in its protocol, stable since 6.x). */
const ERROR_CONTINUE = 1;
const CLOSE_DO_NOT_RESTART = 1;
const CLOSE_RESTART = 2;

/**
 * Restarts a server that died (a crash must never leave the engineer without results), tells the user
 * once per session rather than on every restart, and gives up after 5 crashes within 3 minutes.
 */
export function restartingErrorHandler(): NonNullable<LanguageClientOptions['errorHandler']> {
  const crashes: number[] = [];
  let told = false;
  return {
    error: () => ({ action: ERROR_CONTINUE, handled: true }),
    closed: () => {
      const now = Date.now();
      crashes.push(now);
      while (crashes.length && now - crashes[0]! > 180_000) crashes.shift();
      if (crashes.length > 5) {
        void vscode.window.showErrorMessage('Tauline: the language server stopped 5 times in 3 minutes and will not be restarted. Reload the window to try again.');
        return { action: CLOSE_DO_NOT_RESTART, handled: true };
      }
      if (!told) {
        told = true;
        void vscode.window.showWarningMessage('Tauline: the language server stopped unexpectedly and was restarted; results will reappear in a moment.');
      }
      return { action: CLOSE_RESTART, handled: true };
    },
  };
}

export function clientOptions(schemes: string[]): LanguageClientOptions {
  return {
    errorHandler: restartingErrorHandler(),
    documentSelector: schemes.map((scheme) => ({ language: 'markdown', scheme })),
    initializationOptions: { ...serverSettings(), themeKind: themeKind() },
    // Hover text stays untrusted: pictures are data: images, which need neither HTML nor commands.
    markdown: { isTrusted: false, supportHtml: false },
    diagnosticCollectionName: 'tauline',
    middleware: {
      // The server names the note by its URI string (it is LSP data); the sheet command takes a vscode.Uri and the block's fence line.
      async provideCodeLenses(document, token, next) {
        const lenses = await next(document, token);
        for (const lens of lenses ?? []) {
          const args = lens.command?.arguments;
          if (lens.command?.command === 'tauline.openReport' && args && typeof args[0] === 'string') args[0] = vscode.Uri.parse(args[0]);
        }
        return lenses;
      },
    },
  };
}

/** Everything that needs the running client. */
export function wireClient(context: vscode.ExtensionContext, client: BaseLanguageClient): void {
  const pushSettings = () => void client.sendNotification('workspace/didChangeConfiguration', { settings: { [SECTION]: serverSettings() } });
  context.subscriptions.push(
    vscode.workspace.onDidChangeConfiguration((e) => {
      if (e.affectsConfiguration(SECTION)) {
        pushSettings();
        void vscode.commands.executeCommand('markdown.preview.refresh');
      }
    }),
    vscode.workspace.onDidGrantWorkspaceTrust(() => {
      pushSettings();
      void vscode.commands.executeCommand('markdown.preview.refresh');
    }),
    vscode.window.onDidChangeActiveColorTheme(() => void client.sendNotification(THEME_NOTIFICATION, { kind: themeKind() })),
  );

  // Status bar: checks passing / failing in the note in the active editor.
  const summaries = new Map<string, NoteSummary>();
  const item = vscode.window.createStatusBarItem('tauline.checks', vscode.StatusBarAlignment.Left, 10);
  item.name = 'Tauline checks';
  item.command = 'tauline.openReport';
  context.subscriptions.push(item);
  const render = () => {
    const doc = vscode.window.activeTextEditor?.document;
    const s = doc ? summaries.get(doc.uri.toString()) : undefined;
    if (!doc || doc.languageId !== 'markdown' || !s || s.blocks === 0) {
      item.hide();
      return;
    }
    if (!s.evaluated) {
      item.text = '$(shield) Tauline: not evaluated';
      item.tooltip = 'This workspace is not trusted and tauline.evaluateInRestrictedMode is off.';
      item.backgroundColor = undefined;
    } else {
      const parts: string[] = [];
      if (s.checks === 0) parts.push('no checks');
      else if (s.failed === 0) parts.push(`${s.checks} check${s.checks === 1 ? ' passes' : 's pass'}`);
      else parts.push(`${s.failed} of ${s.checks} FAIL`);
      if (s.errors) parts.push(`${s.errors} error${s.errors === 1 ? '' : 's'}`);
      const bad = s.failed > 0 || s.errors > 0;
      item.text = `${bad ? '$(warning)' : '$(pass)'} Tauline: ${parts.join(', ')}`;
      item.tooltip = `${s.checks} checks, ${s.failed} failing${s.maxRatio !== null ? `, largest utilisation ${s.maxRatio.toFixed(2)}` : ''}; ${s.errors} errors in ${s.blocks} shear blocks. Click to open the calculation sheet.`;
      item.backgroundColor = bad ? new vscode.ThemeColor('statusBarItem.warningBackground') : undefined;
    }
    item.show();
  };
  context.subscriptions.push(
    client.onNotification(NOTE_SUMMARY_NOTIFICATION, (s: NoteSummary) => {
      summaries.set(s.uri, s);
      render();
    }),
    vscode.window.onDidChangeActiveTextEditor(render),
    vscode.workspace.onDidCloseTextDocument((d) => {
      summaries.delete(d.uri.toString());
      render();
    }),
  );

  // Stamping writes into the note, so it needs trust (and asks the server, which holds the evaluation).
  context.subscriptions.push(
    vscode.commands.registerCommand('tauline.stampNote', async () => {
      if (!vscode.workspace.isTrusted) {
        void vscode.window.showWarningMessage('Tauline: stamping writes results into the note; trust this workspace first.');
        return;
      }
      const editor = vscode.window.activeTextEditor;
      if (!editor || editor.document.languageId !== 'markdown') {
        void vscode.window.showInformationMessage('Tauline: open a Markdown note to stamp its results.');
        return;
      }
      const doc = editor.document;
      const out = await client.sendRequest<{ edits: unknown[]; problems: string[]; version: number }>(STAMP_EDITS_REQUEST, { uri: doc.uri.toString() });
      if (out.version !== doc.version) {
        void vscode.window.showWarningMessage('Tauline: the note changed while stamping; run the command again.');
        return;
      }
      if (out.edits.length) {
        const edits = await client.protocol2CodeConverter.asTextEdits(out.edits as never);
        const we = new vscode.WorkspaceEdit();
        we.set(doc.uri, edits ?? []);
        await vscode.workspace.applyEdit(we);
      }
      if (out.problems.length) void vscode.window.showWarningMessage(`Tauline: ${out.problems.join(' ')}`);
      else if (!out.edits.length) void vscode.window.showInformationMessage('Tauline: the stamps are up to date.');
    }),
  );
}

/** The Markdown preview: `shear` blocks become result cards; settings are read at each render. */
export function markdownItExtension() {
  const options: ShearPluginOptions = {
    get note() {
      const c = vscode.workspace.getConfiguration(SECTION);
      const unitSystem = c.get<string>('unitSystem', 'auto');
      return { unitSystem: unitSystem === 'SI' || unitSystem === 'US' ? unitSystem : 'auto', significantFigures: c.get<number>('significantFigures', 3) } as const;
    },
    figureColors: 'currentColor',
    evaluate: () => evaluationAllowed(),
    notEvaluatedText: 'Not evaluated: this workspace is not trusted and tauline.evaluateInRestrictedMode is off.',
  };
  return {
    extendMarkdownIt(md: Parameters<typeof shearPlugin>[0]) {
      return md.use(shearPlugin, options);
    },
  };
}
