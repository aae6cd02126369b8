/**
 * Language-server chaos: the real built server (`node dist/server.js --stdio`) driven by a seeded
 * random stream of incremental edits, opens and closes of many notes at once, requests of every
 * kind (half of them cancelled at once), settings changes and garbage. It must keep answering, log
 * no failed request or evaluation, end with the same diagnostics as a fresh in-process evaluation
 * of each note's final text, and its memory must level off over 10,000 edits (the RSS curve is
 * printed). A killed server is replaced by a fresh process that, given the notes again, publishes
 * the same diagnostics; the extension's part (restarting it and saying so once) is pinned below.
 */
import { readFileSync } from 'node:fs';
import fc from 'fast-check';
import { afterAll, beforeAll, describe, expect, it, vi } from 'vitest';
import { CancellationTokenSource } from 'vscode-jsonrpc/node';
import { TextDocument } from 'vscode-languageserver-textdocument';
import type { Diagnostic as LspDiagnostic } from 'vscode-languageserver-protocol';
import { evaluateNote } from '../../src/core/note';
import { anyNote } from '../fuzz/arbitraries';
import { SEED } from '../fuzz/config';
import { EXAMPLE_LINES, EXAMPLE_NOTES } from '../fuzz/seeds';
import { ensureBuilt, startClient, type TestClient } from './lsp-client';

const EDITS = Number(process.env.TAULINE_CHAOS_EDITS ?? 10_000);

/** A small seeded generator, so a failing run can be replayed with TAULINE_FUZZ_SEED. */
function random(seed: number) {
  let a = seed >>> 0;
  const next = () => {
    a = (a + 0x6d2b79f5) >>> 0;
    let t = a;
    t = Math.imul(t ^ (t >>> 15), t | 1);
    t ^= t + Math.imul(t ^ (t >>> 7), t | 61);
    return ((t ^ (t >>> 14)) >>> 0) / 4294967296;
  };
  return {
    next,
    int: (n: number) => Math.floor(next() * n),
    pick: <T>(xs: readonly T[]): T => xs[Math.floor(next() * xs.length)]!,
  };
}

const SNIPPETS = [
  '', ' ', '\n', 'x', '1', '0', '.', '(', ')', ' kN', ' mm', ' MPa', ' = ', ' * 2', '^', '#', '```', '```shear\n', '\n```\n',
  'V = B1.Vmax\n', 't = tau_max(G2, V)\n', 'check t <= 1 MPa\n', 'section Q\n  plate 10 mm x 20 mm\n', '  plate 1 mm x 1 mm\n',
  'beam Z: 3 m\n  pin at 0 m\n  roller at 3 m\n  udl 1 kN/m\n', '__proto__', 'constructor', '1e308', '\t', '\r\n', 'é', '😀', '\u0000',
  '<!-- tauline-results: written by `tauline stamp`; edits inside are replaced -->\n', '<!-- /tauline-results -->\n', '> ', '- ',
];

const REQUESTS = ['textDocument/hover', 'textDocument/completion', 'textDocument/inlayHint', 'textDocument/codeLens', 'textDocument/documentSymbol', 'textDocument/definition', 'textDocument/references', 'textDocument/documentHighlight', 'textDocument/signatureHelp', 'textDocument/codeAction', 'tauline/stampEdits', 'tauline/evaluationStats'];

/** /proc/<pid>/status VmRSS, in MB (Linux). */
function rssOf(pid: number): number {
  try {
    const m = /VmRSS:\s+(\d+) kB/.exec(readFileSync(`/proc/${pid}/status`, 'utf8'));
    return m ? Number(m[1]) / 1024 : Number.NaN;
  } catch {
    return Number.NaN;
  }
}

function withTimeout<T>(p: Promise<T>, ms: number, what: string): Promise<T> {
  return Promise.race([p, new Promise<T>((_r, rej) => setTimeout(() => rej(new Error(`no answer to ${what} within ${ms} ms`)), ms))]);
}

/** Error diagnostics as `line:code`, from the core's problems (the server adds stamp problems of its own). */
function errorKeys(diags: { line: number; code?: string | number; severity?: unknown }[]): string[] {
  return diags.map((d) => `${d.line}:${String(d.code)}:${String(d.severity)}`).filter((k) => !k.includes(':stamp.')).sort();
}

function serverKeys(diags: LspDiagnostic[]): string[] {
  const sev = ['', 'error', 'warning', 'info', 'hint'];
  return errorKeys(diags.map((d) => ({ line: d.range.start.line, code: d.code, severity: sev[d.severity ?? 1] })));
}

function coreKeys(text: string): string[] {
  const r = evaluateNote(text, { blockBudgetMs: 2000 });
  return errorKeys(r.diagnostics.slice(0, 1000).map((d) => ({ line: d.line, code: d.code, severity: d.severity })));
}

describe('language server under chaos', () => {
  let c: TestClient;
  beforeAll(() => ensureBuilt(), 300_000);
  afterAll(async () => {
    await c?.stop();
  });

  it(`keeps answering through ${EDITS.toLocaleString('en')} random edits, opens, closes and cancellations; memory levels off`, async () => {
    const rng = random(SEED ^ 0x5eed);
    const fuzzNotes = fc.sample(anyNote, { numRuns: 30, seed: SEED });
    const seeds = [...EXAMPLE_NOTES, ...fuzzNotes];
    c = startClient();
    await c.initialize({ diagnosticsDelayMs: 5, themeKind: 'dark' });
    const pid = c.child.pid!;
    const docs = new Map<string, TextDocument>();
    let nextUri = 0;
    const open = () => {
      const uri = `file:///chaos/note-${nextUri++}.md`;
      const text = rng.pick(seeds);
      docs.set(uri, TextDocument.create(uri, 'markdown', 1, text));
      c.open(uri, text, 1);
    };
    const close = (uri: string) => {
      docs.delete(uri);
      void c.connection.sendNotification('textDocument/didClose', { textDocument: { uri } });
    };
    for (let i = 0; i < 12; i++) open();

    const pending: Promise<unknown>[] = [];
    const failures: string[] = [];
    let cancelled = 0;
    let answered = 0;
    const curve: [number, number][] = [[0, rssOf(pid)]];
    const started = Date.now();
    let edits = 0;
    let ops = 0;
    while (edits < EDITS) {
      ops++;
      const roll = rng.next();
      const uris = [...docs.keys()];
      if (roll < 0.72 && uris.length) {
        // An incremental edit at a random place, mirrored locally the way the server applies it.
        const uri = rng.pick(uris);
        const doc = docs.get(uri)!;
        const text = doc.getText();
        const at = rng.int(text.length + 1);
        const len = rng.next() < 0.6 ? 0 : rng.int(Math.min(40, text.length - at + 1));
        const insert = rng.next() < 0.15 ? rng.pick(EXAMPLE_LINES) + '\n' : rng.pick(SNIPPETS);
        const range = { start: doc.positionAt(at), end: doc.positionAt(at + len) };
        const version = doc.version + 1;
        TextDocument.update(doc, [{ range, text: insert }], version);
        c.change(uri, version, [{ range, text: insert }]);
        edits++;
      } else if (roll < 0.74 && uris.length) {
        // A whole-document replacement (a paste over everything, a revert).
        const uri = rng.pick(uris);
        const doc = docs.get(uri)!;
        const text = rng.pick(seeds);
        const version = doc.version + 1;
        TextDocument.update(doc, [{ text }], version);
        c.change(uri, version, [{ text }]);
        edits++;
      } else if (roll < 0.78) {
        // Many notes at once: a burst of opens, or of closes.
        if (docs.size < 40 && rng.next() < 0.5) for (let i = rng.int(8) + 1; i > 0; i--) open();
        else for (const u of uris.slice(0, rng.int(Math.min(6, uris.length)) + 1)) if (docs.size > 3) close(u);
      } else if (roll < 0.995) {
        // A request anywhere (sometimes on a closed or unknown note); half are cancelled at once.
        const uri = rng.next() < 0.05 ? 'file:///chaos/never-opened.md' : rng.pick(uris.length ? uris : ['file:///chaos/none.md']);
        const doc = docs.get(uri);
        const line = rng.int(Math.max(1, doc?.lineCount ?? 5) + 2);
        const position = { line, character: rng.int(60) };
        const method = rng.pick(REQUESTS);
        const params =
          method === 'textDocument/inlayHint' ? { textDocument: { uri }, range: { start: { line: 0, character: 0 }, end: { line: line + 20, character: 0 } } }
          : method === 'textDocument/references' ? { textDocument: { uri }, position, context: { includeDeclaration: true } }
          : method === 'textDocument/codeAction' ? { textDocument: { uri }, range: { start: position, end: position }, context: { diagnostics: [] } }
          : method.startsWith('tauline/') ? { uri }
          : { textDocument: { uri }, position };
        const source = new CancellationTokenSource();
        const sent = doc?.getText() ?? '';
        const p = c.connection.sendRequest(method, params, source.token).then(
          (result) => {
            answered++;
            // No answer shows a number that is not one (pictures are base64 and are left out).
            const shown = (JSON.stringify(result) ?? '').replace(/data:image\/[a-z+]+;base64,[A-Za-z0-9+/=]+/g, '');
            for (const w of ['NaN', 'Infinity', '∞', 'not a number']) if (shown.includes(w) && !sent.includes(w)) failures.push(`${method} shows ${w}: ${shown.slice(Math.max(0, shown.indexOf(w) - 80), shown.indexOf(w) + 40)}`);
          },
          (e: { code?: number; message?: string }) => {
            // RequestCancelled and ContentModified are answers; anything else is a failure of the server.
            if (e?.code === -32800 || e?.code === -32801) cancelled++;
            else failures.push(`${method}: ${e?.code} ${e?.message}`);
          },
        );
        pending.push(p);
        if (rng.next() < 0.5) source.cancel();
      } else {
        // Settings change, or garbage the server must shrug off.
        if (rng.next() < 0.5) void c.connection.sendNotification('workspace/didChangeConfiguration', { settings: { tauline: { diagnosticsDelayMs: rng.pick([0, 5, 50]), significantFigures: rng.pick([3, 4, 0, 99, 'x']), unitSystem: 'auto', inlineResults: rng.next() < 0.5 } } });
        // (A didOpen without text is pinned separately below: server-open-without-text.)
        else void c.connection.sendNotification(rng.pick(['textDocument/didChange', 'tauline/theme', 'workspace/didChangeConfiguration']), rng.pick([null, {}, { textDocument: { uri: 42 } }, { settings: { tauline: { evaluate: 'yes' } } }]));
      }
      if (ops % 60 === 0) {
        // A pause in typing: the debounced evaluations run.
        await new Promise((r) => setTimeout(r, rng.int(25)));
      }
      if (ops % 250 === 0) {
        // The server still answers, promptly after the backlog it has been sent; record its memory.
        const probe = uris[0] ?? 'file:///chaos/none.md';
        await withTimeout(c.request('tauline/evaluationStats', { uri: probe }), 30_000, `a probe after ${edits} edits`);
        await withTimeout(Promise.allSettled(pending.splice(0)), 30_000, 'the outstanding requests');
        if (edits - (curve.at(-1)?.[0] ?? 0) >= 500) curve.push([edits, rssOf(pid)]);
      }
    }
    await withTimeout(Promise.allSettled(pending.splice(0)), 30_000, 'the last requests');
    curve.push([edits, rssOf(pid)]);
    const seconds = (Date.now() - started) / 1000;
    console.log(
      [
        `chaos: ${edits} edits in ${ops} operations over ${nextUri} notes (${docs.size} open at the end) in ${seconds.toFixed(1)} s; ${answered} requests answered, ${cancelled} cancelled`,
        'server RSS (MB) by edits: ' + curve.map(([e, r]) => `${e}:${r.toFixed(0)}`).join(' '),
      ].join('\n'),
    );
    expect(failures).toEqual([]);
    expect(c.child.exitCode).toBeNull();

    // Settle on known settings, then every open note's final diagnostics must be a fresh evaluation's.
    void c.connection.sendNotification('workspace/didChangeConfiguration', { settings: { tauline: { diagnosticsDelayMs: 0, significantFigures: 3, unitSystem: 'auto', inlineResults: true, evaluate: true } } });
    for (const [uri, doc] of docs) {
      const version = doc.version + 1;
      const text = doc.getText() + '\n';
      TextDocument.update(doc, [{ text }], version);
      c.change(uri, version, [{ text }]);
    }
    for (const [uri, doc] of docs) {
      const published = await c.diagnostics(uri, doc.version, 60_000);
      expect(serverKeys(published), uri).toEqual(coreKeys(doc.getText()));
    }
    // Our own failure logs say "tauline:"; the protocol library logs a request handler that threw.
    // (A notification with garbage params, sent on purpose above, is logged by the library and dropped.)
    const logged = c.notifications.filter((n) => n.method === 'window/logMessage').map((n) => String((n.params as { message?: string }).message));
    expect(logged.filter((m) => /^tauline:|Request handler/i.test(m))).toEqual([]);
    expect(logged.filter((m) => /failed|error|exception/i.test(m) && !/^Notification handler '[\w/]+' failed/.test(m))).toEqual([]);

    // Memory levels off: after the caches have warmed (the first fifth), the peak stays within a
    // generous margin of where it was, rather than climbing with every edit.
    const warm = curve.filter(([e]) => e >= EDITS / 5);
    const base = warm[0]?.[1] ?? curve[0]![1];
    const peak = Math.max(...warm.map(([, r]) => r));
    expect(peak).toBeLessThan(base * 1.6 + 60);
  }, 900_000);

  it('a didOpen with no text is an empty note, not a failure on every evaluation', async () => {
    const g = startClient();
    try {
      await g.initialize({ diagnosticsDelayMs: 0 });
      void g.connection.sendNotification('textDocument/didOpen', { textDocument: { uri: 'file:///chaos/no-text.md', languageId: 'markdown', version: 1 } });
      void g.connection.sendNotification('workspace/didChangeConfiguration', { settings: { tauline: { significantFigures: 4 } } });
      await g.request('textDocument/hover', { textDocument: { uri: 'file:///chaos/no-text.md' }, position: { line: 0, character: 0 } });
      await new Promise((r) => setTimeout(r, 300));
      const logged = g.notifications.filter((n) => n.method === 'window/logMessage').map((n) => String((n.params as { message?: string }).message));
      expect(logged.filter((m) => m.startsWith('tauline:'))).toEqual([]);
    } finally {
      await g.stop();
    }
  }, 60_000);

  it('a killed server is replaced by a fresh process that publishes the same diagnostics for the same notes', async () => {
    const notes = EXAMPLE_NOTES.map((text, i) => ({ uri: `file:///chaos/restart-${i}.md`, text: text + '\n```shear\nbad = 1 furlong\n```\n' }));
    const first = startClient();
    await first.initialize({ diagnosticsDelayMs: 0 });
    const before = new Map<string, string[]>();
    for (const n of notes) first.open(n.uri, n.text, 1);
    for (const n of notes) before.set(n.uri, serverKeys(await first.diagnostics(n.uri, 1)));
    first.child.kill('SIGKILL');
    await new Promise((r) => first.child.once('exit', r));
    first.connection.dispose();
    // What the language client does on a restart: a new process, initialize, and the open notes again.
    const second = startClient();
    try {
      await second.initialize({ diagnosticsDelayMs: 0 });
      for (const n of notes) second.open(n.uri, n.text, 1);
      for (const n of notes) expect(serverKeys(await second.diagnostics(n.uri, 1)), n.uri).toEqual(before.get(n.uri));
      expect([...before.values()].flat().some((k) => k.includes('unit.unknown'))).toBe(true);
    } finally {
      await second.stop();
    }
  }, 120_000);
});

// The extension's side of a crash, checked on its own client options with a stand-in `vscode`.
const shown: string[] = [];
vi.mock('vscode', () => {
  const config = { get: (_k: string, d: unknown) => d };
  const say = (m: string) => {
    shown.push(m);
    return Promise.resolve(undefined);
  };
  return {
    workspace: { getConfiguration: () => config, isTrusted: true },
    window: { activeColorTheme: { kind: 2 }, showInformationMessage: say, showWarningMessage: say, showErrorMessage: say },
    ColorThemeKind: { Light: 1, Dark: 2, HighContrast: 3, HighContrastLight: 4 },
    ThemeColor: class {},
    StatusBarAlignment: { Left: 1, Right: 2 },
  };
});

describe('extension restart after a server crash', () => {
  /** vscode-languageclient's CloseAction.Restart. */
  const RESTART = 2;

  it('the client options restart a crashed server and tell the user once', async () => {
    const { clientOptions } = await import('../../src/extension/common');
    const options = clientOptions(['file']);
    const handler = options.errorHandler;
    expect(handler, 'clientOptions has an errorHandler').toBeDefined();
    shown.length = 0;
    const outcomes = [];
    for (let i = 0; i < 3; i++) outcomes.push(await handler!.closed());
    expect(outcomes.map((o) => o.action)).toEqual([RESTART, RESTART, RESTART]);
    expect(shown.filter((m) => /restart/i.test(m))).toHaveLength(1);
  });
});
