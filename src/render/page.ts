/**
 * The calculation sheet as a whole HTML page, shared by the report panel (webview), HTML export and
 * `tauline report`: a title block (project, note title, date, revision, check status), the note
 * rendered by our own markdown-it (raw HTML off) with the shear plugin, and the cautions as a footer.
 *
 * Pure: callers read files (styles, fonts) and pass their text in; nothing here touches a disk.
 */
import MarkdownIt, { type StateBlock } from 'markdown-it';
import { CAUTION_LONG } from '../core/cautions';
import type { NoteResult } from '../core/note';
import { escapeHtml } from './escape';
import { shearPlugin, type ShearPluginOptions } from './plugin';

/** What the title block shows. Every field is text from a note or a file system and is escaped. */
export interface SheetHeader {
  title: string;
  project?: string;
  /** ISO date, e.g. 2026-11-30. */
  date?: string;
  /** Version-control revision, e.g. "3f2a9c1" or "3f2a9c1 (modified)". */
  revision?: string;
  /** The note's path as the engineer knows it. */
  source?: string;
}

export interface NoteSummary {
  blocks: number;
  checks: number;
  failed: number;
  errors: number;
  warnings: number;
}

export interface RenderedNote {
  /** The note's body as HTML (cards included). */
  html: string;
  title: string;
  project?: string;
  summary: NoteSummary;
  result?: NoteResult;
}

/** Where the plugin leaves the evaluation it did, for a host that wants the numbers too. */
export interface ShearRenderEnv {
  tauline?: { result?: NoteResult };
}

/** Notes larger than this are refused by the page renderer (a pasted log, not a calculation). */
export const MAX_NOTE_BYTES = 2_000_000;

/** Our own markdown-it for sheets: CommonMark plus tables, raw HTML off, links validated by markdown-it. */
export function createSheetMarkdown(options: ShearPluginOptions = {}): MarkdownIt {
  const md = new MarkdownIt({ html: false, linkify: false, typographer: false });
  md.use(shearPlugin, { caution: false, ...options });
  md.block.ruler.before('paragraph', 'tauline_comment', hiddenComment);
  md.renderer.rules.tauline_hidden = () => '';
  // A sheet fetches nothing: an image is shown only when it is embedded in the note itself.
  const image = md.renderer.rules.image!;
  md.renderer.rules.image = (tokens, idx, opts, env, self) => {
    const src = tokens[idx]!.attrGet('src') ?? '';
    if (/^data:image\/(png|jpe?g|gif|webp);/i.test(src)) return image(tokens, idx, opts, env, self);
    const alt = self.renderInlineAsText(tokens[idx]!.children ?? [], opts, env);
    return `<span class="tl-image-omitted">[image not embedded: ${md.utils.escapeHtml(alt || src)}]</span>`;
  };
  return md;
}

/**
 * With raw HTML off, an HTML comment would print as text. A comment block is hidden instead, as any
 * HTML renderer would, and a results stamp is hidden whole: the card above it shows the same
 * results, evaluated now.
 */
function hiddenComment(state: StateBlock, startLine: number, endLine: number, silent: boolean): boolean {
  if (state.sCount[startLine]! - state.blkIndent >= 4) return false;
  const textOf = (line: number) => state.src.slice(state.bMarks[line]! + state.tShift[line]!, state.eMarks[line]!);
  const first = textOf(startLine);
  if (!first.startsWith('<!--')) return false;
  const stamp = /^<!--\s*tauline-results/.test(first);
  let last = -1;
  for (let line = startLine; line < endLine; line++) {
    const text = textOf(line);
    if (stamp ? line > startLine && /^<!--\s*\/tauline-results/.test(text) : text.includes('-->')) {
      last = line;
      break;
    }
    if (stamp && line > startLine && /^<!--\s*tauline-results/.test(text)) break;
  }
  if (last < 0) return false;
  if (silent) return true;
  const token = state.push('tauline_hidden', '', 0);
  token.map = [startLine, last + 1];
  state.line = last + 1;
  return true;
}

let sharedMarkdown: MarkdownIt | undefined;

/** The note's title (its first level-1 heading) and project (front matter `project:` or a "Project:" line). */
export function noteInfo(text: string, fallbackTitle: string): { title: string; project?: string } {
  const lines = text.split(/\r\n|\r|\n/);
  let title: string | undefined;
  let project: string | undefined;
  let inFence: string | undefined;
  let inFront = lines[0]?.trim() === '---';
  for (let i = inFront ? 1 : 0; i < lines.length && i < 2000; i++) {
    const raw = lines[i]!;
    if (inFront) {
      if (/^(---|\.\.\.)\s*$/.test(raw)) {
        inFront = false;
        continue;
      }
      const m = /^(title|project)\s*:\s*(.+)$/i.exec(raw);
      if (m) {
        const value = m[2]!.trim().replace(/^["']|["']$/g, '');
        if (m[1]!.toLowerCase() === 'title') title ??= value;
        else project ??= value;
      }
      continue;
    }
    const fence = /^\s{0,3}(`{3,}|~{3,})/.exec(raw);
    if (fence) {
      if (!inFence) inFence = fence[1]![0]!;
      else if (fence[1]![0] === inFence) inFence = undefined;
      continue;
    }
    if (inFence) continue;
    const h = /^\s{0,3}#\s+(.*?)\s*#*\s*$/.exec(raw);
    if (h && title === undefined) title = plainInline(h[1]!);
    const p = /^\s{0,3}(?:\*\*|__)?Project(?:\*\*|__)?\s*:\s*(?:\*\*|__)?\s*(.+)$/i.exec(raw);
    if (p && project === undefined) project = plainInline(p[1]!).replace(/\.\s*$/, '');
  }
  const clip = (s: string | undefined) => (s === undefined ? undefined : s.slice(0, 300));
  return { title: clip(title) || fallbackTitle, project: clip(project) };
}

/** Markdown emphasis, code and link syntax stripped to the words. */
function plainInline(s: string): string {
  return s
    .replace(/!?\[([^\]]*)\]\([^)]*\)/g, '$1')
    .replace(/[*_`]+/g, '')
    .trim();
}

/** Renders a note to the sheet's body HTML, with its title, project and check summary. */
export function renderNote(text: string, fallbackTitle: string, md?: MarkdownIt): RenderedNote {
  const info = noteInfo(text, fallbackTitle);
  if (text.length > MAX_NOTE_BYTES) {
    return {
      html: `<p class="tl-too-large">This note is ${text.length} characters long; the sheet renders notes up to ${MAX_NOTE_BYTES}.</p>`,
      ...info,
      summary: { blocks: 0, checks: 0, failed: 0, errors: 1, warnings: 0 },
    };
  }
  const engine = md ?? (sharedMarkdown ??= createSheetMarkdown());
  const env: ShearRenderEnv & { currentDocument?: string } = { tauline: {}, currentDocument: `sheet:${fallbackTitle}` };
  const html = engine.render(text, env);
  const result = env.tauline?.result;
  return { html, ...info, summary: summarize(result), result };
}

export function summarize(result: NoteResult | undefined): NoteSummary {
  const s: NoteSummary = { blocks: 0, checks: 0, failed: 0, errors: 0, warnings: 0 };
  if (!result) return s;
  s.blocks = result.blocks.length;
  for (const b of result.blocks) {
    s.checks += b.checks.length;
    s.failed += b.checks.filter((c) => !c.pass).length;
    s.errors += b.diagnostics.filter((d) => d.severity === 'error').length;
    s.warnings += b.diagnostics.filter((d) => d.severity === 'warning' && d.code !== 'check.fails').length;
  }
  return s;
}

/** "3 checks pass", "1 of 4 checks fails, 2 errors": one line for the title block and the index. */
export function summaryText(s: NoteSummary): string {
  const parts: string[] = [];
  if (!s.blocks) parts.push('no shear blocks');
  else if (!s.checks) parts.push('no checks');
  else if (s.failed) parts.push(`${s.failed} of ${s.checks} check${s.checks === 1 ? '' : 's'} fail${s.failed === 1 ? 's' : ''}`);
  else parts.push(s.checks === 1 ? '1 check passes' : `all ${s.checks} checks pass`);
  if (s.errors) parts.push(`${s.errors} error${s.errors === 1 ? '' : 's'}`);
  if (s.warnings) parts.push(`${s.warnings} warning${s.warnings === 1 ? '' : 's'}`);
  return parts.join(', ');
}

export function summaryTone(s: NoteSummary): 'pass' | 'fail' | 'error' | 'none' {
  return s.errors ? 'error' : s.failed ? 'fail' : s.checks ? 'pass' : 'none';
}

/** The title block at the top of the sheet. */
export function sheetHeaderHtml(h: SheetHeader, summary?: NoteSummary): string {
  const cell = (label: string, value: string | undefined, cls = '') =>
    value ? `<div class="tl-sheet-cell${cls}"><span class="tl-sheet-label">${label}</span><span class="tl-sheet-value">${escapeHtml(value)}</span></div>` : '';
  return (
    `<div class="tl-sheet-brand">Tauline calculation sheet</div>` +
    `<div class="tl-sheet-grid">` +
    cell('Note', h.title, ' tl-sheet-title') +
    (summary ? `<div class="tl-sheet-cell tl-sheet-status tl-status-${summaryTone(summary)}"><span class="tl-sheet-label">Checks</span><span class="tl-sheet-value">${escapeHtml(summaryText(summary))}</span></div>` : '') +
    cell('Project', h.project) +
    cell('Date', h.date) +
    cell('Revision', h.revision) +
    cell('Source', h.source, ' tl-sheet-source') +
    `</div>`
  );
}

export function cautionsFooterHtml(): string {
  return `<div class="tl-cautions"><div class="tl-cautions-title">Cautions</div><ul>${CAUTION_LONG.map((c) => `<li>${escapeHtml(c)}</li>`).join('')}</ul></div>`;
}

/** The CSP of an exported or command-line sheet: no script at all, nothing fetched, fonts and images only from data: URIs. */
export const EXPORT_CSP = "default-src 'none'; img-src data:; style-src 'unsafe-inline'; font-src data:; base-uri 'none'; form-action 'none'";

/** The report panel's CSP: our stylesheets and fonts from the extension, one script by nonce, nothing remote. */
export function webviewCsp(cspSource: string, nonce: string): string {
  // cspSource comes from VS Code ("'self' https://*.vscode-cdn.net", "https://file+.vscode-resource…"): keep it whole, minus anything that could end the directive.
  const source = cspSource.replace(/[;,\r\n]/g, ' ');
  const n = nonce.replace(/[^A-Za-z0-9]/g, '');
  return `default-src 'none'; img-src ${source} data:; style-src ${source} 'unsafe-inline'; font-src ${source}; script-src 'nonce-${n}'; base-uri 'none'; form-action 'none'`;
}

export interface PageInput {
  kind: 'export' | 'webview';
  header: SheetHeader;
  summary?: NoteSummary;
  /** The rendered note (from renderNote). */
  body: string;
  csp: string;
  /** Inline stylesheet text (export), and stylesheet URLs (webview). */
  css?: string;
  stylesheets?: string[];
  /** The page script (webview only). */
  script?: { src: string; nonce: string };
  /** Opaque key of the document shown, for the page script's scroll memory. */
  documentKey?: string;
  /** Colour scheme of an exported page: follow the reader's setting, or fix one. */
  colorScheme?: 'auto' | 'light' | 'dark';
}

/** A whole HTML page for the sheet. */
export function buildPage(p: PageInput): string {
  const links = (p.stylesheets ?? []).map((href) => `<link rel="stylesheet" href="${escapeHtml(href)}">`).join('');
  const style = p.css ? `<style>${p.css.replace(/<\/style/gi, '<\\/style')}</style>` : '';
  const script = p.script ? `<script nonce="${escapeHtml(p.script.nonce)}" src="${escapeHtml(p.script.src)}"></script>` : '';
  const scheme = p.colorScheme && p.colorScheme !== 'auto' ? ` tl-scheme-${p.colorScheme}` : '';
  return (
    `<!DOCTYPE html>\n<html lang="en"><head><meta charset="utf-8">` +
    `<meta http-equiv="Content-Security-Policy" content="${escapeHtml(p.csp)}">` +
    `<meta name="viewport" content="width=device-width, initial-scale=1">` +
    `<meta name="generator" content="Tauline">` +
    `<title>${escapeHtml(p.header.title)}</title>${links}${style}</head>` +
    `<body class="tl-page tl-page-${p.kind}${scheme}"${p.documentKey ? ` data-document="${escapeHtml(p.documentKey)}"` : ''}>` +
    `<header class="tl-sheet-head">${sheetHeaderHtml(p.header, p.summary)}</header>` +
    `<main class="tl-sheet">${p.body}</main>` +
    `<footer class="tl-sheet-foot">${cautionsFooterHtml()}</footer>` +
    `${script}</body></html>\n`
  );
}

/** KaTeX font families the renderer's formulas use; the others are left out of exported pages. */
const USED_FONTS = /KaTeX_(Main|Math|Size[1-4]|AMS)\b/;

/**
 * KaTeX's stylesheet with the fonts the renderer uses inlined as woff2 data: URIs and every other
 * @font-face dropped, so an exported page is self-contained. `readFont` returns the bytes of a file
 * under KaTeX's fonts/ folder (e.g. "KaTeX_Main-Regular.woff2"), or undefined when missing.
 */
export function inlineKatexFonts(css: string, readFont: (file: string) => Uint8Array | undefined): string {
  return css.replace(/@font-face\s*\{[^}]*\}/g, (rule) => {
    const family = /font-family:\s*([^;}]+)/.exec(rule)?.[1]?.trim() ?? '';
    if (!USED_FONTS.test(family)) return '';
    const file = /url\((?:["']?)fonts\/([A-Za-z0-9_-]+\.woff2)(?:["']?)\)/.exec(rule)?.[1];
    if (!file) return '';
    const bytes = readFont(file);
    if (!bytes) return '';
    const src = `src:url(data:font/woff2;base64,${toBase64(bytes)}) format("woff2")`;
    return rule.replace(/src:[^;}]+/, src);
  });
}

function toBase64(bytes: Uint8Array): string {
  const B = (globalThis as { Buffer?: { from(b: Uint8Array): { toString(enc: string): string } } }).Buffer;
  if (B) return B.from(bytes).toString('base64');
  let s = '';
  for (let i = 0; i < bytes.length; i += 0x8000) s += String.fromCharCode(...bytes.subarray(i, i + 0x8000));
  return btoa(s);
}

/** A 32-character alphanumeric nonce from a cryptographic source. */
export function makeNonce(): string {
  const chars = 'ABCDEFGHIJKLMNOPQRSTUVWXYZabcdefghijklmnopqrstuvwxyz0123456789';
  const bytes = new Uint8Array(32);
  globalThis.crypto.getRandomValues(bytes);
  let out = '';
  for (const b of bytes) out += chars[b % chars.length];
  return out;
}

/** The index page of `tauline report`: every note with its status, linked to its sheet. */
export function buildIndexPage(entries: { href: string; source: string; title: string; summary: NoteSummary }[], header: { date?: string; revision?: string }, css: string): string {
  let rows = '';
  for (const e of entries) {
    rows +=
      `<tr class="tl-status-${summaryTone(e.summary)}"><td><a href="${escapeHtml(e.href)}">${escapeHtml(e.title)}</a></td>` +
      `<td><code>${escapeHtml(e.source)}</code></td><td>${e.summary.checks}</td>` +
      `<td class="tl-index-status">${escapeHtml(summaryText(e.summary))}</td></tr>`;
  }
  const totals = entries.reduce((t, e) => ({ checks: t.checks + e.summary.checks, failed: t.failed + e.summary.failed, errors: t.errors + e.summary.errors }), { checks: 0, failed: 0, errors: 0 });
  const headline = `${entries.length} note${entries.length === 1 ? '' : 's'}, ${totals.checks} check${totals.checks === 1 ? '' : 's'}: ${totals.failed ? `${totals.failed} failing` : 'none failing'}${totals.errors ? `, ${totals.errors} error${totals.errors === 1 ? '' : 's'}` : ''}`;
  const body =
    `<h1>Calculation notes</h1><p class="tl-index-headline">${escapeHtml(headline)}</p>` +
    `<table class="tl-index"><thead><tr><th scope="col">Note</th><th scope="col">File</th><th scope="col">Checks</th><th scope="col">Status</th></tr></thead><tbody>${rows}</tbody></table>`;
  return buildPage({
    kind: 'export',
    header: { title: 'Calculation notes', date: header.date, revision: header.revision },
    body,
    csp: EXPORT_CSP,
    css,
  });
}
