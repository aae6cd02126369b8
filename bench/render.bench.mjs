// Renderer bench: the generated 200-block note rendered to a calculation sheet, in ratio to
// markdown-it's plain render of the same text (measured in this run), cold and after a one-line
// edit; and the size in bytes of the exported sheet. Plain Node after `npm run build`; the
// renderer is bundled from src/ here with esbuild.
import MarkdownIt from 'markdown-it';
import { generatedNote } from './generate.mjs';
import { loadTs, ratio, time } from './load.mjs';

const page = await loadTs('src/render/page.ts');
const math = await loadTs('src/render/math.ts');
const cli = await loadTs('src/cli/report.ts');

const text = generatedNote(200);
const plainMd = new MarkdownIt();
const plain = time(() => plainMd.render(text), 7, 3);

// Cold: a fresh engine (no evaluation cache) and an empty formula cache, every run.
const cold = time(() => {
  math.clearFormulaCache();
  page.createSheetMarkdown().render(text, {});
}, 3, 1);

// Editing: one engine kept, as the report panel keeps it; each run changes one block's force.
const sheetMd = page.createSheetMarkdown();
let k = 0;
const edit = time(() => {
  k++;
  sheetMd.render(text.replace('V7 = ', `V7 = ${k % 2 ? 1 : 2} * `), { currentDocument: 'bench:note' });
}, 7, 3);

const rendered = page.renderNote(text, 'bench');
const css = cli.sheetStyles();
const html = page.buildPage({ kind: 'export', header: { title: rendered.title, date: '2026-12-01' }, summary: rendered.summary, body: rendered.html, csp: page.EXPORT_CSP, css });
const bytes = Buffer.byteLength(html);
const cssBytes = Buffer.byteLength(css);

console.log(`200-block note: ${text.length} characters, ${rendered.summary.blocks} blocks, ${rendered.summary.checks} checks`);
console.log(`markdown-it plain render            ${plain.toFixed(2)} ms`);
console.log(`sheet render, cold                  ${cold.toFixed(1)} ms   ratio to plain ${ratio(cold, plain)}`);
console.log(`sheet render, one block edited      ${edit.toFixed(1)} ms   ratio to plain ${ratio(edit, plain)}`);
console.log(`exported sheet                      ${bytes} bytes (${(bytes / 1024).toFixed(0)} KiB; styles and inlined fonts ${(cssBytes / 1024).toFixed(0)} KiB, ${(bytes / rendered.summary.blocks / 1024).toFixed(1)} KiB per block)`);
