/**
 * The Tauline language server, independent of its transport: node.ts (IPC or stdio from the
 * extension), stdio.ts (`tauline lsp --stdio` for any LSP editor) and browser.ts (a web worker)
 * each make a connection and hand it here.
 *
 * Evaluation is the core's `evaluateNote` with one NoteCache per document, so an edit re-evaluates
 * only the edited block and the blocks that read its names. Diagnostics are debounced per document;
 * after evaluating, the server lets queued edits arrive and drops the result if the document moved
 * on (the newer edit has its own run scheduled). Requests evaluate the current version on demand
 * (cheap: the cache) and answer RequestCancelled when the client has given up on them.
 */
import {
  type CancellationToken,
  type Connection,
  type InitializeParams,
  type InitializeResult,
  CodeActionKind,
  LSPErrorCodes,
  ResponseError,
  TextDocumentSyncKind,
  TextDocuments,
} from 'vscode-languageserver';
import { TextDocument } from 'vscode-languageserver-textdocument';
import { type NoteAnalysis, NoteStore } from './analysis';
import { codeLenses } from './features/codeLens';
import { completions, signatureHelp } from './features/completion';
import { noteDiagnostics, noteSummary } from './features/diagnostics';
import { hover } from './features/hover';
import { inlayHints } from './features/inlayHints';
import { definition, highlights, references } from './features/navigation';
import { stampDiagnostics, stampEdits, stampQuickFixes, STAMP_EDITS_REQUEST } from './features/stamps';
import { documentSymbols } from './features/symbols';
import { DEFAULT_SETTINGS, mergeSettings, type ServerSettings, type ThemeKind } from './settings';

export interface ServerDeps {
  /** Clock for timing evaluations (the core takes it injected to stay pure). */
  now?: () => number;
}

/** Custom messages between the extension and the server (any other client may ignore them). */
export const NOTE_SUMMARY_NOTIFICATION = 'tauline/noteSummary';
export const THEME_NOTIFICATION = 'tauline/theme';
export const STATS_REQUEST = 'tauline/evaluationStats';

export interface ServerHandle {
  documents: TextDocuments<TextDocument>;
  store: NoteStore;
  settings(): ServerSettings;
}

const yieldToQueue: () => Promise<void> =
  typeof setImmediate === 'function' ? () => new Promise((r) => setImmediate(r)) : () => new Promise((r) => setTimeout(r, 0));

export function startServer(connection: Connection, deps: ServerDeps = {}): ServerHandle {
  const now = deps.now ?? (() => (typeof performance !== 'undefined' ? performance.now() : Date.now()));
  const documents = new TextDocuments(TextDocument);
  const store = new NoteStore(now);
  let settings: ServerSettings = { ...DEFAULT_SETTINGS };
  let snippetSupport = false;
  let inlayRefresh = false;
  let lensRefresh = false;
  const timers = new Map<string, ReturnType<typeof setTimeout>>();
  /** Milliseconds from the start of a diagnostics run to handing them to the transport, per document (for the bench). */
  const lastPublishMs = new Map<string, number>();

  const log = (s: string) => {
    try {
      connection.console.log(s);
    } catch {
      // no console on this transport
    }
  };

  function analysisOf(uri: string): NoteAnalysis | undefined {
    const doc = documents.get(uri);
    if (!doc) return undefined;
    return store.analyze(uri, doc.version, textOf(doc), settings);
  }

  /** Runs a request handler: answers RequestCancelled for a cancelled request, and never lets an exception out. */
  function handle<T>(token: CancellationToken | undefined, uri: string, fallback: T, fn: (a: NoteAnalysis) => T): T | ResponseError<void> {
    if (token?.isCancellationRequested) return new ResponseError(LSPErrorCodes.RequestCancelled, 'cancelled');
    try {
      const a = analysisOf(uri);
      if (!a) return fallback;
      const out = fn(a);
      if (token?.isCancellationRequested) return new ResponseError(LSPErrorCodes.RequestCancelled, 'cancelled');
      return out;
    } catch (e) {
      log(`tauline: request failed: ${e instanceof Error ? (e.stack ?? e.message) : String(e)}`);
      return fallback;
    }
  }

  function safely<T>(fn: () => T, fallback: T): T {
    try {
      return fn();
    } catch (e) {
      log(`tauline: ${e instanceof Error ? (e.stack ?? e.message) : String(e)}`);
      return fallback;
    }
  }

  async function validate(uri: string): Promise<void> {
    timers.delete(uri);
    const doc = documents.get(uri);
    if (!doc) return;
    const version = doc.version;
    const started = now();
    let a: NoteAnalysis;
    try {
      a = store.analyze(uri, version, textOf(doc), settings);
    } catch (e) {
      log(`tauline: evaluation failed: ${e instanceof Error ? (e.stack ?? e.message) : String(e)}`);
      return;
    }
    // Edits that arrived while evaluating are queued behind us: let them in, then publish only if still current.
    await yieldToQueue();
    const current = documents.get(uri);
    if (!current || current.version !== version) return;
    const diagnostics = [...noteDiagnostics(a), ...safely(() => stampDiagnostics(a, settings), [])];
    lastPublishMs.set(uri, now() - started);
    await connection.sendDiagnostics({ uri, version, diagnostics });
    void connection.sendNotification(NOTE_SUMMARY_NOTIFICATION, noteSummary(a));
  }

  function schedule(uri: string, delay: number): void {
    const t = timers.get(uri);
    if (t) clearTimeout(t);
    timers.set(uri, setTimeout(() => void validate(uri), delay));
  }

  function revalidateAll(): void {
    store.invalidate();
    for (const d of documents.all()) schedule(d.uri, 0);
    if (inlayRefresh) void connection.languages.inlayHint.refresh().catch(() => undefined);
    if (lensRefresh) void connection.sendRequest('workspace/codeLens/refresh').catch(() => undefined);
  }

  connection.onInitialize((params: InitializeParams): InitializeResult => {
    settings = mergeSettings(settings, params.initializationOptions);
    snippetSupport = !!params.capabilities.textDocument?.completion?.completionItem?.snippetSupport;
    inlayRefresh = !!params.capabilities.workspace?.inlayHint?.refreshSupport;
    lensRefresh = !!params.capabilities.workspace?.codeLens?.refreshSupport;
    return {
      capabilities: {
        textDocumentSync: TextDocumentSyncKind.Incremental,
        hoverProvider: true,
        inlayHintProvider: true,
        codeLensProvider: { resolveProvider: false },
        completionProvider: { triggerCharacters: ['.'] },
        signatureHelpProvider: { triggerCharacters: ['(', ','], retriggerCharacters: [','] },
        definitionProvider: true,
        referencesProvider: true,
        documentHighlightProvider: true,
        documentSymbolProvider: { label: 'Tauline' },
        codeActionProvider: { codeActionKinds: [CodeActionKind.QuickFix] },
      },
      serverInfo: { name: 'tauline', version: '0.1.0' },
    };
  });

  connection.onDidChangeConfiguration((params) => {
    const raw = (params.settings as { tauline?: unknown } | undefined)?.tauline;
    if (!raw) return;
    const next = mergeSettings(settings, raw);
    if (JSON.stringify(next) === JSON.stringify(settings)) return;
    settings = next;
    revalidateAll();
  });

  connection.onNotification(THEME_NOTIFICATION, (p: { kind?: ThemeKind }) => {
    settings = mergeSettings(settings, { themeKind: p?.kind });
  });

  connection.onRequest(STATS_REQUEST, (p: { uri: string }) => {
    const a = store.get(p?.uri);
    return a ? { version: a.version, evaluationMs: a.evaluationMs, analysisMs: a.analysisMs, publishMs: lastPublishMs.get(a.uri) ?? null, reused: a.reused, blocks: a.blocks.length } : null;
  });

  // The first evaluation of a note runs at once; later edits wait for a pause in typing.
  documents.onDidChangeContent((e) => schedule(e.document.uri, store.get(e.document.uri) ? settings.diagnosticsDelayMs : 0));
  documents.onDidClose((e) => {
    const t = timers.get(e.document.uri);
    if (t) clearTimeout(t);
    timers.delete(e.document.uri);
    store.forget(e.document.uri);
    void connection.sendDiagnostics({ uri: e.document.uri, diagnostics: [] });
  });

  connection.onHover((p, token) => handle(token, p.textDocument.uri, null, (a) => hover(a, p.position, settings)));
  connection.languages.inlayHint.on((p, token) => handle(token, p.textDocument.uri, [], (a) => inlayHints(a, p.range, settings)));
  connection.onCodeLens((p, token) => handle(token, p.textDocument.uri, [], (a) => codeLenses(a)));
  connection.onCompletion((p, token) => handle(token, p.textDocument.uri, [], (a) => completions(a, p.position, settings, snippetSupport)));
  connection.onSignatureHelp((p, token) => handle(token, p.textDocument.uri, null, (a) => signatureHelp(a, p.position)));
  connection.onDefinition((p, token) => handle(token, p.textDocument.uri, null, (a) => definition(a, p.position)));
  connection.onReferences((p, token) => handle(token, p.textDocument.uri, [], (a) => references(a, p.position, p.context.includeDeclaration)));
  connection.onDocumentHighlight((p, token) => handle(token, p.textDocument.uri, [], (a) => highlights(a, p.position)));
  connection.onDocumentSymbol((p, token) => handle(token, p.textDocument.uri, [], (a) => documentSymbols(a, settings)));

  connection.onCodeAction((p, token) => handle(token, p.textDocument.uri, [], (a) => stampQuickFixes(a, p.context.diagnostics, settings)));
  connection.onRequest(STAMP_EDITS_REQUEST, (p: { uri: string }, token) =>
    handle(token, p?.uri, { edits: [], problems: ['The note is not open.'], version: -1 }, (a) => stampEdits(a, settings)),
  );

  documents.listen(connection);
  connection.listen();
  return { documents, store, settings: () => settings };
}

/** A client that opens a document without its text (not allowed by LSP, seen in the wild) gets an empty note, not a failure on every evaluation. */
function textOf(doc: TextDocument): string {
  const text: unknown = doc.getText();
  return typeof text === 'string' ? text : '';
}
