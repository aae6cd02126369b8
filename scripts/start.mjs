#!/usr/bin/env node
// `npm start`: builds the extension and opens the demo notes (examples/) in a real VS Code running
// locally (code-server from npm on Node 24, installed on first use into the git-ignored `.e2e/`),
// then prints the address to open in a browser. Ctrl+C stops it.
//   TAULINE_PORT=8123 npm start      choose the port (default: 8123, or a free one)
//   npm start -- path/to/notes       open another folder
import { execFileSync } from 'node:child_process';
import { resolve, join } from 'node:path';
import { fileURLToPath } from 'node:url';
import { ensureCodeServer, freePort, startCodeServer } from '../test/e2e/code-server.mjs';
import { createServer } from 'node:net';

const root = resolve(fileURLToPath(import.meta.url), '..', '..');
const workspace = resolve(process.argv[2] ?? join(root, 'examples'));

function portFree(port) {
  return new Promise((res) => {
    const s = createServer();
    s.once('error', () => res(false));
    s.listen(port, '127.0.0.1', () => s.close(() => res(true)));
  });
}

console.log('tauline: building the extension…');
execFileSync(process.execPath, [join(root, 'scripts', 'build.mjs')], { cwd: root, stdio: 'inherit' });

try {
  ensureCodeServer(root, (line) => console.log(`tauline: ${line}`));
} catch (e) {
  console.error(`tauline: cannot start the editor: ${e instanceof Error ? e.message : e}`);
  process.exit(1);
}

const wanted = Number(process.env.TAULINE_PORT ?? 8123);
const port = (await portFree(wanted)) ? wanted : await freePort();
console.log('tauline: starting VS Code (code-server)…');
const server = await startCodeServer(root, {
  workspace,
  runDir: join(root, '.e2e', 'run-start'),
  port,
  trusted: true,
});
const url = `${server.url}/?folder=${encodeURIComponent(workspace)}`;
console.log(`\nTauline is running. Open this address in a browser:\n\n    ${url}\n\nOpen a note from the explorer (e.g. mezzanine-girder.md); results appear at line ends,\nhover a name for its value and picture. Press Ctrl+C to stop.\n`);

const stop = () => {
  server.stop();
  process.exit(0);
};
process.on('SIGINT', stop);
process.on('SIGTERM', stop);
server.child.on('exit', (code) => {
  console.log(`tauline: the editor stopped (exit ${code}).`);
  process.exit(code ?? 0);
});
