// Copies KaTeX's stylesheet and its woff2 fonts into media/katex/, where the Markdown preview
// (markdown.previewStyles), the report panel and the exported sheets load them from. Only woff2
// is shipped: every browser engine VS Code runs supports it, so the other formats are dropped from
// the stylesheet's src lists.
import { copyFileSync, mkdirSync, readdirSync, readFileSync, writeFileSync } from 'node:fs';
import { dirname, join } from 'node:path';
import { createRequire } from 'node:module';
import { fileURLToPath } from 'node:url';

const root = join(dirname(fileURLToPath(import.meta.url)), '..');
const require = createRequire(join(root, 'package.json'));
const katexDist = dirname(require.resolve('katex/dist/katex.min.css'));
const out = join(root, 'media', 'katex');
mkdirSync(join(out, 'fonts'), { recursive: true });

const css = readFileSync(join(katexDist, 'katex.min.css'), 'utf8').replace(
  /src:url\((fonts\/[A-Za-z0-9_-]+\.woff2)\) format\("woff2"\)[^;}]*/g,
  'src:url($1) format("woff2")',
);
writeFileSync(join(out, 'katex.min.css'), css);
let fonts = 0;
for (const name of readdirSync(join(katexDist, 'fonts'))) {
  if (!name.endsWith('.woff2')) continue;
  const target = join(out, 'fonts', name);
  copyFileSync(join(katexDist, 'fonts', name), target);
  fonts++;
}
console.log(`copied KaTeX ${require('katex/package.json').version} stylesheet and ${fonts} fonts to media/katex`);
