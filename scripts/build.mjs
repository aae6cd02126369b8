// Bundles each runtime target with esbuild: one entry per target. Type-checking is separate (npm run typecheck).
import { build } from 'esbuild';
import { existsSync } from 'node:fs';

const targets = [
  { entry: 'src/cli/index.ts', outfile: 'dist/cli.js', platform: 'node' },
  { entry: 'src/cli/worker.ts', outfile: 'dist/worker.js', platform: 'node' },
  { entry: 'src/server/node.ts', outfile: 'dist/server.js', platform: 'node' },
  { entry: 'src/extension/extension.ts', outfile: 'dist/extension.js', platform: 'node', external: ['vscode'] },
  { entry: 'src/extension/browser.ts', outfile: 'dist/browser/extension.js', platform: 'browser', format: 'cjs', external: ['vscode'] },
  { entry: 'src/server/browser.ts', outfile: 'dist/browser/server.js', platform: 'browser', format: 'iife' },
  { entry: 'src/render/webview-script.ts', outfile: 'dist/webview.js', platform: 'browser', format: 'iife' },
];

const watch = process.argv.includes('--watch');
await Promise.all(
  targets
    .filter((t) => existsSync(t.entry))
    .map((t) =>
      build({
        entryPoints: [t.entry],
        outfile: t.outfile,
        bundle: true,
        platform: t.platform,
        format: t.format ?? 'cjs',
        target: t.platform === 'node' ? 'node20' : 'es2022',
        external: t.external ?? [],
        sourcemap: true,
        minify: !watch && t.platform === 'browser',
        logLevel: 'warning',
        legalComments: 'none',
      }),
    ),
);
console.log('built', targets.filter((t) => existsSync(t.entry)).map((t) => t.outfile).join(', '));
await import('./copy-media.mjs');
