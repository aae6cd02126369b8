// Editor bench (run after `npm run build`; `npm run bench` does both). Plain Node, talking to the
// real bundled server over stdio, as an editor does. Prints ratios measured in this one run:
//  - keystroke to diagnostics for a one-line edit in block 100 of a generated 200-block note, as a
//    fraction of a full evaluation of the same note (target: under 5 %), both as round trips over
//    stdio and as the server's own evaluation time;
//  - hover latency p50 / p95 over stdio;
//  - bundle sizes, and the time to load the extension bundle (with a stand-in `vscode` module).
import { spawn } from 'node:child_process';
import { readFileSync, statSync } from 'node:fs';
import { createRequire } from 'node:module';
import { gzipSync } from 'node:zlib';
import { join, resolve } from 'node:path';
import { fileURLToPath } from 'node:url';
import { generatedNote } from './generate.mjs';

const require = createRequire(import.meta.url);
const rpc = require('vscode-jsonrpc/node');
const root = resolve(fileURLToPath(import.meta.url), '..', '..');
const serverJs = join(root, 'dist', 'server.js');

const now = () => Number(process.hrtime.bigint()) / 1e6;
const median = (xs) => percentile(xs, 50);
function percentile(xs, p) {
  const s = [...xs].sort((a, b) => a - b);
  return s[Math.min(s.length - 1, Math.max(0, Math.ceil((p / 100) * s.length) - 1))];
}
const ms = (x) => `${x.toFixed(2)} ms`;

const child = spawn(process.execPath, [serverJs, '--stdio'], { stdio: ['pipe', 'pipe', 'inherit'] });
const conn = rpc.createMessageConnection(new rpc.StreamMessageReader(child.stdout), new rpc.StreamMessageWriter(child.stdin));
const waiting = new Map();
conn.onNotification('textDocument/publishDiagnostics', (p) => {
  const key = `${p.uri}@${p.version}`;
  const w = waiting.get(key);
  if (w) {
    waiting.delete(key);
    w(now());
  }
});
conn.onRequest(() => null);
conn.onNotification(() => undefined);
conn.listen();
const published = (uri, version) => new Promise((res) => waiting.set(`${uri}@${version}`, res));

await conn.sendRequest('initialize', { processId: process.pid, rootUri: null, capabilities: {}, initializationOptions: { diagnosticsDelayMs: 0, themeKind: 'dark' } });
await conn.sendNotification('initialized', {});

const text = generatedNote(200);
const lines = text.split('\n');
const editLine = lines.findIndex((l) => l.startsWith('V100 = '));
if (editLine < 0) throw new Error('generated note has no block 100');

// Full evaluation: open the note under a fresh URI (a fresh cache) each time. The first opens warm
// the server up (as a session's first minutes do) and are not counted: steady state is compared.
const WARM_UP = 4;
const full = [];
const fullServer = [];
for (let i = 0; i < WARM_UP + 9; i++) {
  const uri = `file:///bench/full-${i}.md`;
  const done = published(uri, 1);
  const t0 = now();
  await conn.sendNotification('textDocument/didOpen', { textDocument: { uri, languageId: 'markdown', version: 1, text } });
  const took = (await done) - t0;
  const server = (await conn.sendRequest('tauline/evaluationStats', { uri })).evaluationMs;
  if (i >= WARM_UP) {
    full.push(took);
    fullServer.push(server);
  }
  await conn.sendNotification('textDocument/didClose', { textDocument: { uri } });
}

// One-line edits in block 100: the value of V100 changes, the layout does not.
const uri = 'file:///bench/edit.md';
let version = 1;
{
  const done = published(uri, 1);
  await conn.sendNotification('textDocument/didOpen', { textDocument: { uri, languageId: 'markdown', version, text } });
  await done;
}
const edit = [];
const editServer = [];
const editAnalysis = [];
const editPublish = [];
let reused = 0;
for (let i = 0; i < WARM_UP * 2 + 30; i++) {
  version++;
  const newLine = `V100 = ${(60 + (i % 10)).toFixed(1)} kN`;
  const done = published(uri, version);
  const t0 = now();
  await conn.sendNotification('textDocument/didChange', {
    textDocument: { uri, version },
    contentChanges: [{ range: { start: { line: editLine, character: 0 }, end: { line: editLine, character: lines[editLine].length } }, text: newLine }],
  });
  const took = (await done) - t0;
  lines[editLine] = newLine;
  const stats = await conn.sendRequest('tauline/evaluationStats', { uri });
  reused = stats.reused;
  if (i < WARM_UP * 2) continue;
  edit.push(took);
  editServer.push(stats.evaluationMs);
  editAnalysis.push(stats.analysisMs);
  editPublish.push(stats.publishMs);
}

// A line added in block 100 moves every later block down; the core re-evaluates a block whose
// lines moved, so this edit costs more than one that keeps the layout. Measured for the record.
const insert = [];
let insertReused = 0;
for (let i = 0; i < 6; i++) {
  version++;
  const done = published(uri, version);
  const add = i % 2 === 0;
  const t0 = now();
  await conn.sendNotification('textDocument/didChange', {
    textDocument: { uri, version },
    contentChanges: [add
      ? { range: { start: { line: editLine + 1, character: 0 }, end: { line: editLine + 1, character: 0 } }, text: `# note ${i}\n` }
      : { range: { start: { line: editLine + 1, character: 0 }, end: { line: editLine + 2, character: 0 } }, text: '' }],
  });
  insert.push((await done) - t0);
  insertReused = Math.min(insertReused || Infinity, (await conn.sendRequest('tauline/evaluationStats', { uri })).reused);
}

// Hover latency: section names, quantities, calls and checks all over the note.
const targets = [];
lines.forEach((l, n) => {
  let m;
  if ((m = /^section (S\d+)/.exec(l))) targets.push({ line: n, character: 9 });
  else if ((m = /^(t\d+) = tau_max/.exec(l))) targets.push({ line: n, character: 1 }, { line: n, character: l.indexOf('tau_max') + 2 });
  else if (/^check /.test(l)) targets.push({ line: n, character: 2 });
});
const hover = [];
for (let i = 0; i < 300; i++) {
  const position = targets[(i * 37) % targets.length];
  const t0 = now();
  await conn.sendRequest('textDocument/hover', { textDocument: { uri }, position });
  hover.push(now() - t0);
}

await conn.sendRequest('shutdown');
await conn.sendNotification('exit');
setTimeout(() => child.kill(), 200);

const fullRound = median(full);
const editRound = median(edit);
console.log(`(steady state after ${WARM_UP} warm-up opens and ${WARM_UP * 2} warm-up edits)`);
console.log(`note: 200 blocks, ${lines.length} lines; edit on line ${editLine + 1} (block 100); ${reused} of 200 blocks reused per edit`);
console.log(`full evaluation, open to diagnostics over stdio:   median ${ms(fullRound)} (server evaluation ${ms(median(fullServer))})`);
console.log(`one-line edit, keystroke to diagnostics over stdio: median ${ms(editRound)} (server evaluation ${ms(median(editServer))})`);
console.log(`  of which: whole analysis ${ms(median(editAnalysis))}, evaluation to diagnostics handed to the transport ${ms(median(editPublish))}`);
console.log(`ratio edit / full, round trip:       ${(100 * editRound / fullRound).toFixed(1)} %  (target < 5 %)`);
console.log(`ratio edit / full, evaluation only:  ${(100 * median(editServer) / median(fullServer)).toFixed(1)} %`);
console.log(`line-adding edit in block 100: median ${ms(median(insert))} (${(100 * median(insert) / fullRound).toFixed(1)} % of full; as few as ${insertReused} of 200 blocks reused)`);
console.log(`hover latency over stdio (${hover.length} hovers): p50 ${ms(percentile(hover, 50))}, p95 ${ms(percentile(hover, 95))}`);

// Bundles.
for (const f of ['dist/extension.js', 'dist/server.js', 'dist/browser/extension.js', 'dist/browser/server.js']) {
  try {
    const size = statSync(join(root, f)).size;
    const gz = gzipSync(readFileSync(join(root, f))).length;
    console.log(`bundle ${f}: ${(size / 1024).toFixed(0)} KiB (${(gz / 1024).toFixed(0)} KiB gzipped)`);
  } catch {
    console.log(`bundle ${f}: not built`);
  }
}

// Loading the extension bundle (parse and top-level code) with a stand-in `vscode` module; the
// activation itself needs an editor (see test/e2e for the real thing).
{
  const Module = require('node:module');
  const original = Module._load;
  Module._load = function (request, parent, isMain) {
    if (request === 'vscode') return new Proxy({}, { get: () => new Proxy(function () {}, { get: () => ({}) }) });
    return original.call(this, request, parent, isMain);
  };
  const t0 = now();
  require(join(root, 'dist', 'extension.js'));
  console.log(`extension bundle load: ${ms(now() - t0)}`);
  Module._load = original;
}
