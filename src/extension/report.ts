/**
 * The calculation sheet in VS Code: `tauline.openReport` shows the note as a sheet in a webview that
 * follows the active Markdown editor and re-renders as the engineer types; `tauline.exportReport`
 * writes the sheet as one self-contained HTML file (styles and fonts inlined, no script) that prints
 * cleanly to PDF.
 *
 * The webview runs with a strict CSP (a per-page nonce for our one script, styles and fonts from the
 * extension only, no remote content), `enableForms: false` and local resources limited to media/
 * and dist/. Rendering happens here in the extension host with our own markdown-it (raw HTML off);
 * the page only swaps in what it is sent. Uses vscode.workspace.fs only, so it also runs in the
 * browser build.
 */
import * as vscode from 'vscode';
import { evaluationAllowed, SECTION } from './common';
import type { SheetUpdate } from '../render/messages';
import {
  buildPage,
  createSheetMarkdown,
  EXPORT_CSP,
  inlineKatexFonts,
  makeNonce,
  renderNote,
  type RenderedNote,
  type SheetHeader,
  sheetHeaderHtml,
  webviewCsp,
} from '../render/page';
import type { ShearPluginOptions } from '../render/plugin';

const VIEW_TYPE = 'tauline.report';
/** Typing pauses this long before the sheet re-renders. */
const UPDATE_DELAY_MS = 300;

function pluginOptions(): ShearPluginOptions {
  return {
    get note() {
      const c = vscode.workspace.getConfiguration(SECTION);
      const unitSystem = c.get<string>('unitSystem', 'auto');
      return { unitSystem: unitSystem === 'SI' || unitSystem === 'US' ? unitSystem : 'auto', significantFigures: c.get<number>('significantFigures', 3) } as const;
    },
    figureColors: 'currentColor',
    evaluate: () => evaluationAllowed(),
    notEvaluatedText: 'Not evaluated: this workspace is not trusted and tauline.evaluateInRestrictedMode is off.',
  };
}

function isNote(doc: vscode.TextDocument | undefined): doc is vscode.TextDocument {
  return !!doc && (doc.languageId === 'markdown' || /\.(md|markdown)$/i.test(doc.uri.path));
}

function fileStem(uri: vscode.Uri): string {
  const base = uri.path.split('/').pop() ?? 'note';
  return base.replace(/\.(md|markdown)$/i, '') || 'note';
}

function today(): string {
  const d = new Date();
  const pad = (n: number) => String(n).padStart(2, '0');
  return `${d.getFullYear()}-${pad(d.getMonth() + 1)}-${pad(d.getDate())}`;
}

// The git extension's API, as far as this file reads it.
interface GitRepository {
  state: { HEAD?: { commit?: string }; workingTreeChanges: { uri: vscode.Uri }[]; indexChanges: { uri: vscode.Uri }[] };
}
interface GitApi {
  getRepository(uri: vscode.Uri): GitRepository | null;
}

/** The short commit of the repository holding the note, marked when the note has uncommitted changes. */
async function gitRevision(doc: vscode.TextDocument): Promise<string | undefined> {
  try {
    const ext = vscode.extensions.getExtension<{ getAPI(version: 1): GitApi }>('vscode.git');
    if (!ext) return undefined;
    const exports = ext.isActive ? ext.exports : await ext.activate();
    const repo = exports.getAPI(1).getRepository(doc.uri);
    const commit = repo?.state.HEAD?.commit;
    if (!repo || !commit) return undefined;
    const key = doc.uri.toString();
    const changed = doc.isDirty || [...repo.state.workingTreeChanges, ...repo.state.indexChanges].some((c) => c.uri.toString() === key);
    return `${commit.slice(0, 7)}${changed ? ' (modified)' : ''}`;
  } catch {
    return undefined;
  }
}

class SheetRenderer {
  private md = createSheetMarkdown(pluginOptions());

  /** Settings or trust changed: a fresh engine, so no cached evaluation survives. */
  reset(): void {
    this.md = createSheetMarkdown(pluginOptions());
  }

  render(doc: vscode.TextDocument): RenderedNote {
    return renderNote(doc.getText(), fileStem(doc.uri), this.md);
  }

  header(doc: vscode.TextDocument, note: RenderedNote, revision?: string): SheetHeader {
    return { title: note.title, project: note.project, date: today(), revision, source: vscode.workspace.asRelativePath(doc.uri, false) };
  }
}

class ReportPanel {
  private document: vscode.TextDocument | undefined;
  private timer: ReturnType<typeof setTimeout> | undefined;
  private revision: string | undefined;
  private readonly disposables: vscode.Disposable[] = [];

  constructor(
    readonly panel: vscode.WebviewPanel,
    private readonly context: vscode.ExtensionContext,
    private readonly renderer: SheetRenderer,
    private readonly onDispose: () => void,
  ) {
    panel.webview.options = webviewOptions(context);
    this.disposables.push(
      panel.onDidDispose(() => this.dispose()),
      vscode.workspace.onDidChangeTextDocument((e) => {
        if (e.document === this.document) this.schedule();
      }),
      vscode.window.onDidChangeActiveTextEditor((editor) => {
        if (editor && isNote(editor.document) && editor.document !== this.document) void this.show(editor.document);
      }),
      panel.onDidChangeViewState((e) => {
        // A hidden webview misses messages: bring it up to date when it shows again.
        if (e.webviewPanel.visible) this.schedule(0);
      }),
    );
  }

  get shownDocument(): vscode.TextDocument | undefined {
    return this.document;
  }

  /** Shows a document: a full page the first time, an update message after that (keeps the page and its scroll memory). */
  async show(doc: vscode.TextDocument): Promise<void> {
    const first = this.document === undefined;
    this.document = doc;
    this.revision = await gitRevision(doc);
    if (first) this.writePage();
    else this.update();
  }

  schedule(delay = UPDATE_DELAY_MS): void {
    if (this.timer) clearTimeout(this.timer);
    this.timer = setTimeout(() => {
      this.timer = undefined;
      this.update();
    }, delay);
  }

  refresh(): void {
    this.writePage();
  }

  private writePage(): void {
    const doc = this.document;
    if (!doc) return;
    const note = this.renderer.render(doc);
    const webview = this.panel.webview;
    const nonce = makeNonce();
    const media = vscode.Uri.joinPath(this.context.extensionUri, 'media');
    this.panel.title = `Sheet: ${note.title}`;
    webview.html = buildPage({
      kind: 'webview',
      header: this.renderer.header(doc, note, this.revision),
      summary: note.summary,
      body: note.html,
      csp: webviewCsp(webview.cspSource, nonce),
      stylesheets: [
        webview.asWebviewUri(vscode.Uri.joinPath(media, 'katex', 'katex.min.css')).toString(),
        webview.asWebviewUri(vscode.Uri.joinPath(media, 'preview.css')).toString(),
      ],
      script: { src: webview.asWebviewUri(vscode.Uri.joinPath(this.context.extensionUri, 'dist', 'webview.js')).toString(), nonce },
      documentKey: doc.uri.toString(),
    });
  }

  private update(): void {
    const doc = this.document;
    if (!doc) return;
    if (doc.isClosed) return;
    const note = this.renderer.render(doc);
    this.panel.title = `Sheet: ${note.title}`;
    const message: SheetUpdate = {
      type: 'update',
      documentKey: doc.uri.toString(),
      title: note.title,
      header: sheetHeaderHtml(this.renderer.header(doc, note, this.revision), note.summary),
      body: note.html,
    };
    void this.panel.webview.postMessage(message);
  }

  dispose(): void {
    if (this.timer) clearTimeout(this.timer);
    for (const d of this.disposables.splice(0)) d.dispose();
    this.onDispose();
  }
}

function webviewOptions(context: vscode.ExtensionContext): vscode.WebviewOptions & vscode.WebviewPanelOptions {
  return {
    enableScripts: true,
    enableForms: false,
    enableCommandUris: false,
    localResourceRoots: [vscode.Uri.joinPath(context.extensionUri, 'media'), vscode.Uri.joinPath(context.extensionUri, 'dist')],
  };
}

function targetDocument(arg: unknown, panel: ReportPanel | undefined): Thenable<vscode.TextDocument | undefined> | vscode.TextDocument | undefined {
  if (arg instanceof vscode.Uri) return vscode.workspace.openTextDocument(arg);
  const active = vscode.window.activeTextEditor?.document;
  if (isNote(active)) return active;
  return panel?.shownDocument ?? vscode.window.visibleTextEditors.map((e) => e.document).find(isNote);
}

async function readMedia(context: vscode.ExtensionContext, ...path: string[]): Promise<Uint8Array> {
  return vscode.workspace.fs.readFile(vscode.Uri.joinPath(context.extensionUri, 'media', ...path));
}

/** preview.css and KaTeX's stylesheet with the fonts the sheet uses inlined. */
async function exportStyles(context: vscode.ExtensionContext): Promise<string> {
  const decoder = new TextDecoder();
  const preview = decoder.decode(await readMedia(context, 'preview.css'));
  const katexCss = decoder.decode(await readMedia(context, 'katex', 'katex.min.css'));
  const fonts = new Map<string, Uint8Array>();
  for (const m of katexCss.matchAll(/fonts\/([A-Za-z0-9_-]+\.woff2)/g)) {
    const file = m[1]!;
    if (fonts.has(file) || !/KaTeX_(Main|Math|Size[1-4]|AMS)/.test(file)) continue;
    try {
      fonts.set(file, await readMedia(context, 'katex', 'fonts', file));
    } catch {
      /* a missing font falls back to the reader's fonts */
    }
  }
  return `${inlineKatexFonts(katexCss, (file) => fonts.get(file))}\n${preview}`;
}

async function exportSheet(context: vscode.ExtensionContext, doc: vscode.TextDocument, renderer: SheetRenderer): Promise<void> {
  const stem = fileStem(doc.uri);
  const defaultUri = doc.uri.scheme === 'untitled' ? undefined : vscode.Uri.joinPath(doc.uri, '..', `${stem}.html`);
  const target = await vscode.window.showSaveDialog({ defaultUri, filters: { 'HTML calculation sheet': ['html'] }, saveLabel: 'Export sheet' });
  if (!target) return;
  const note = renderer.render(doc);
  const page = buildPage({
    kind: 'export',
    header: renderer.header(doc, note, await gitRevision(doc)),
    summary: note.summary,
    body: note.html,
    csp: EXPORT_CSP,
    css: await exportStyles(context),
  });
  await vscode.workspace.fs.writeFile(target, new TextEncoder().encode(page));
  const open = 'Open in Browser';
  const choice = await vscode.window.showInformationMessage(`Tauline: sheet written to ${vscode.workspace.asRelativePath(target, false)}. Print it from the browser to get a PDF.`, open);
  if (choice === open) void vscode.env.openExternal(target);
}

/** Registers the sheet commands and the panel serializer. */
export function registerReport(context: vscode.ExtensionContext): void {
  const renderer = new SheetRenderer();
  let current: ReportPanel | undefined;

  const adopt = (panel: vscode.WebviewPanel): ReportPanel => {
    current?.panel.dispose();
    const created = new ReportPanel(panel, context, renderer, () => {
      if (current === created) current = undefined;
    });
    current = created;
    return created;
  };

  context.subscriptions.push(
    vscode.commands.registerCommand('tauline.openReport', async (arg?: unknown) => {
      const doc = await targetDocument(arg, current);
      if (!doc) {
        void vscode.window.showInformationMessage('Tauline: open a Markdown note to see its calculation sheet.');
        return;
      }
      if (current) {
        current.panel.reveal(vscode.ViewColumn.Beside, true);
        await current.show(doc);
        return;
      }
      const panel = vscode.window.createWebviewPanel(VIEW_TYPE, 'Calculation sheet', { viewColumn: vscode.ViewColumn.Beside, preserveFocus: true }, webviewOptions(context));
      await adopt(panel).show(doc);
    }),
    vscode.commands.registerCommand('tauline.exportReport', async (arg?: unknown) => {
      const doc = await targetDocument(arg, current);
      if (!doc) {
        void vscode.window.showInformationMessage('Tauline: open a Markdown note to export its calculation sheet.');
        return;
      }
      try {
        await exportSheet(context, doc, renderer);
      } catch (e) {
        void vscode.window.showErrorMessage(`Tauline: could not export the sheet: ${e instanceof Error ? e.message : String(e)}`);
      }
    }),
    vscode.workspace.onDidChangeConfiguration((e) => {
      if (e.affectsConfiguration(SECTION)) {
        renderer.reset();
        current?.refresh();
      }
    }),
    vscode.workspace.onDidGrantWorkspaceTrust(() => {
      renderer.reset();
      current?.refresh();
    }),
    vscode.window.registerWebviewPanelSerializer(VIEW_TYPE, {
      async deserializeWebviewPanel(panel: vscode.WebviewPanel, state: unknown) {
        const uri = state && typeof state === 'object' && typeof (state as { document?: unknown }).document === 'string' ? (state as { document: string }).document : undefined;
        const restored = adopt(panel);
        try {
          const doc = uri ? await vscode.workspace.openTextDocument(vscode.Uri.parse(uri, true)) : vscode.window.activeTextEditor?.document;
          if (isNote(doc)) await restored.show(doc);
          else panel.dispose();
        } catch {
          panel.dispose();
        }
      },
    }),
    { dispose: () => current?.panel.dispose() },
  );
}
