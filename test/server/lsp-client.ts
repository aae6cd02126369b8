/**
 * A real LSP client for the integration tests and the bench: starts the built server
 * (`node dist/server.js --stdio`, or the CLI's `tauline lsp --stdio`) as a child process and talks
 * JSON-RPC to it over stdio with vscode-jsonrpc.
 */
import { type ChildProcess, execFileSync, spawn } from 'node:child_process';
import { closeSync, existsSync, mkdirSync, openSync, readdirSync, rmSync, statSync } from 'node:fs';
import { join, resolve } from 'node:path';
import { createMessageConnection, type MessageConnection, StreamMessageReader, StreamMessageWriter } from 'vscode-jsonrpc/node';
import type { Diagnostic, InitializeResult, PublishDiagnosticsParams } from 'vscode-languageserver-protocol';

export const ROOT = process.env.TAULINE_ROOT ?? resolve(__dirname, '..', '..');
export const SERVER_JS = join(ROOT, 'dist', 'server.js');

function newestMtime(dir: string): number {
  let t = 0;
  for (const e of readdirSync(dir, { withFileTypes: true })) {
    const p = join(dir, e.name);
    t = Math.max(t, e.isDirectory() ? newestMtime(p) : statSync(p).mtimeMs);
  }
  return t;
}

/** Builds the bundles when dist/server.js is missing or older than the sources it is built from. */
export function ensureBuilt(): void {
  const fresh = () => {
    const sources = Math.max(...['src/server', 'src/core', 'src/render', 'src/extension'].filter((d) => existsSync(join(ROOT, d))).map((d) => newestMtime(join(ROOT, d))));
    return existsSync(SERVER_JS) && statSync(SERVER_JS).mtimeMs >= sources;
  };
  if (fresh()) return;
  // Test files run in parallel: one builds, the others wait for it rather than write the same bundles at once.
  mkdirSync(join(ROOT, 'dist'), { recursive: true });
  const lock = join(ROOT, 'dist', '.build-lock');
  const sleep = (ms: number) => Atomics.wait(new Int32Array(new SharedArrayBuffer(4)), 0, 0, ms);
  for (let waited = 0; ; waited += 200) {
    try {
      closeSync(openSync(lock, 'wx'));
      break;
    } catch {
      if (waited > 180_000) rmSync(lock, { force: true });
      sleep(200);
    }
  }
  try {
    if (!fresh()) execFileSync(process.execPath, [join(ROOT, 'scripts', 'build.mjs')], { cwd: ROOT, stdio: 'inherit' });
  } finally {
    rmSync(lock, { force: true });
  }
}

export interface TestClient {
  connection: MessageConnection;
  child: ChildProcess;
  stderr: () => string;
  initialize(options?: unknown, capabilities?: Record<string, unknown>): Promise<InitializeResult>;
  open(uri: string, text: string, version?: number): void;
  change(uri: string, version: number, changes: { range?: { start: { line: number; character: number }; end: { line: number; character: number } }; text: string }[]): void;
  /** Resolves with the next diagnostics published for `uri` at `version` or later. */
  diagnostics(uri: string, minVersion?: number, timeoutMs?: number): Promise<Diagnostic[]>;
  lastDiagnostics(uri: string): PublishDiagnosticsParams | undefined;
  /** Resolves with the next diagnostics published for `uri`, whatever their version. */
  nextDiagnostics(uri: string, timeoutMs?: number): Promise<Diagnostic[]>;
  request<R>(method: string, params: unknown): Promise<R>;
  notifications: { method: string; params: unknown }[];
  stop(): Promise<void>;
}

export function startClient(command: string[] = [process.execPath, SERVER_JS, '--stdio']): TestClient {
  const child = spawn(command[0]!, command.slice(1), { cwd: ROOT, stdio: ['pipe', 'pipe', 'pipe'] });
  let err = '';
  child.stderr!.on('data', (d) => (err += String(d)));
  const connection = createMessageConnection(new StreamMessageReader(child.stdout!), new StreamMessageWriter(child.stdin!));
  const published = new Map<string, PublishDiagnosticsParams>();
  const waiters: { uri: string; minVersion: number; resolve: (d: Diagnostic[]) => void }[] = [];
  const notifications: { method: string; params: unknown }[] = [];
  connection.onNotification('textDocument/publishDiagnostics', (p: PublishDiagnosticsParams) => {
    published.set(p.uri, p);
    for (const w of [...waiters]) {
      if (w.uri === p.uri && (p.version ?? 0) >= w.minVersion) {
        waiters.splice(waiters.indexOf(w), 1);
        w.resolve(p.diagnostics);
      }
    }
  });
  connection.onNotification((method: string, params: unknown) => {
    notifications.push({ method, params });
  });
  connection.onRequest('workspace/configuration', () => [null]);
  connection.onRequest('client/registerCapability', () => null);
  connection.onRequest('workspace/inlayHint/refresh', () => null);
  connection.onRequest('workspace/codeLens/refresh', () => null);
  connection.listen();
  return {
    connection,
    child,
    stderr: () => err,
    notifications,
    async initialize(options, capabilities) {
      const result = await connection.sendRequest<InitializeResult>('initialize', {
        processId: process.pid,
        rootUri: null,
        capabilities: capabilities ?? {
          textDocument: { completion: { completionItem: { snippetSupport: true } }, hover: { contentFormat: ['markdown'] }, publishDiagnostics: { relatedInformation: true } },
          workspace: { inlayHint: { refreshSupport: true } },
        },
        initializationOptions: options,
      });
      await connection.sendNotification('initialized', {});
      return result;
    },
    open(uri, text, version = 1) {
      void connection.sendNotification('textDocument/didOpen', { textDocument: { uri, languageId: 'markdown', version, text } });
    },
    change(uri, version, changes) {
      void connection.sendNotification('textDocument/didChange', { textDocument: { uri, version }, contentChanges: changes });
    },
    diagnostics(uri, minVersion = 0, timeoutMs = 20_000) {
      const have = published.get(uri);
      if (have && (have.version ?? 0) >= minVersion && minVersion > 0) return Promise.resolve(have.diagnostics);
      return new Promise((res, rej) => {
        const timer = setTimeout(() => rej(new Error(`no diagnostics for ${uri} v${minVersion} within ${timeoutMs} ms; server stderr:\n${err}`)), timeoutMs);
        waiters.push({ uri, minVersion, resolve: (d) => (clearTimeout(timer), res(d)) });
      });
    },
    lastDiagnostics: (uri) => published.get(uri),
    nextDiagnostics(uri, timeoutMs = 20_000) {
      return new Promise((res, rej) => {
        const timer = setTimeout(() => rej(new Error(`no diagnostics for ${uri} within ${timeoutMs} ms`)), timeoutMs);
        waiters.push({ uri, minVersion: 0, resolve: (d) => (clearTimeout(timer), res(d)) });
      });
    },
    request: <R>(method: string, params: unknown) => connection.sendRequest<R>(method, params),
    async stop() {
      try {
        await Promise.race([connection.sendRequest('shutdown'), new Promise((r) => setTimeout(r, 2000))]);
        void connection.sendNotification('exit');
      } catch {
        // already gone
      }
      await new Promise((r) => setTimeout(r, 100));
      connection.dispose();
      if (child.exitCode === null) child.kill();
    },
  };
}
