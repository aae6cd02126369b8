/**
 * The browser build of the server (dist/browser/server.js, what the web extension runs in a web
 * worker) started in a Node worker thread behind a stand-in for the worker's `self`, and driven over
 * postMessage by a real JSON-RPC client: the bundle must need nothing from Node.
 */
import { join } from 'node:path';
import { Worker } from 'node:worker_threads';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { createMessageConnection, type MessageConnection, PortMessageReader, PortMessageWriter } from 'vscode-jsonrpc/node';
import type { Hover, PublishDiagnosticsParams } from 'vscode-languageserver-protocol';
import { ensureBuilt, ROOT } from './lsp-client';

const BOOT = `
const { parentPort } = require('node:worker_threads');
globalThis.self = {
  addEventListener() {},
  postMessage(m) { parentPort.postMessage(m); },
  set onmessage(fn) { parentPort.on('message', (data) => fn({ data })); },
};
require(${JSON.stringify(join(ROOT, 'dist', 'browser', 'server.js'))});
`;

describe('browser build of the server (web worker)', () => {
  let worker: Worker;
  let conn: MessageConnection;
  const published: PublishDiagnosticsParams[] = [];

  beforeAll(() => {
    ensureBuilt();
    worker = new Worker(BOOT, { eval: true });
    conn = createMessageConnection(new PortMessageReader(worker), new PortMessageWriter(worker));
    conn.onNotification('textDocument/publishDiagnostics', (p: PublishDiagnosticsParams) => void published.push(p));
    conn.onNotification(() => undefined);
    conn.listen();
  });

  afterAll(async () => {
    conn?.dispose();
    await worker?.terminate();
  });

  it('initializes, evaluates a note and answers a hover', async () => {
    const init = await conn.sendRequest<{ capabilities: { hoverProvider?: boolean } }>('initialize', { processId: null, rootUri: null, capabilities: {}, initializationOptions: { diagnosticsDelayMs: 0 } });
    expect(init.capabilities.hoverProvider).toBe(true);
    await conn.sendNotification('initialized', {});
    const uri = 'vscode-vfs://github/demo/note.md';
    const text = ['```shear', 'section R: rectangle', '  plate 100 mm x 200 mm', 'V = 30 kN', 't = tau_max(R, V)', 'check t <= 2 MPa', '```', ''].join('\n');
    await conn.sendNotification('textDocument/didOpen', { textDocument: { uri, languageId: 'markdown', version: 1, text } });
    const deadline = Date.now() + 20_000;
    while (!published.some((p) => p.uri === uri) && Date.now() < deadline) await new Promise((r) => setTimeout(r, 50));
    // closed form for a rectangle: tau_max = 3V/(2A) = 3·30 kN/(2·20 000 mm²) = 2.25 MPa > 2 MPa: utilisation 1.13
    const d = published.find((p) => p.uri === uri)!.diagnostics;
    expect(d.map((x) => x.code)).toEqual(['check.fails']);
    expect(d[0]!.message).toMatch(/1\.13/);
    const h = await conn.sendRequest<Hover>('textDocument/hover', { textDocument: { uri }, position: { line: 4, character: 0 } });
    expect((h.contents as { value: string }).value).toContain('**t** = 2.25 MPa');
  });
});
