/**
 * The markdown-it plugin: every fenced block whose info string is `shear` becomes a result card.
 *
 * Contract with hosts (VS Code's Markdown preview, the report panel, `tauline report`):
 * - Rendering is synchronous and a pure function of the document text and the plugin's options.
 *   The note is evaluated once per render (and not again when the host re-renders cached tokens),
 *   incrementally through a NoteCache kept per document (`env.currentDocument`, else one shared).
 * - The fence renderer is wrapped: other info strings go to the previous renderer untouched.
 * - The fence token's attributes (VS Code's `data-line`, `class="code-line"`, `dir`) are kept on the
 *   card's wrapper, and each row carries the Markdown line it renders, so scroll sync keeps working.
 * - Every string from the note is escaped; formulas are typeset from the syntax tree with KaTeX's
 *   trust off; no script, event attribute, link or id is ever emitted.
 */
import type { default as MarkdownIt, Options, Renderer, RendererRule, StateCore, Token } from 'markdown-it';
import { BLOCK_LANGUAGE } from '../core/blocks';
import { type BlockResult, evaluateNote, NoteCache, type NoteOptions, type NoteResult } from '../core/note';
import { cautionHtml, defaultBudget, type RenderBudget, renderBlockBody, statusText, summarizeBlock } from './card';
import { escapeHtml } from './escape';
import type { FigureColors } from './figures';

export interface ShearPluginOptions {
  /** Evaluation settings handed to the core (unit system, significant figures, time per block). */
  note?: NoteOptions;
  /** Colours baked into the figures; pages restyle them with CSS variables in any case. */
  figureColors?: FigureColors;
  /**
   * Asked before each render; when it returns false the blocks are shown as source with a notice
   * and nothing is evaluated (e.g. in an untrusted workspace).
   */
  evaluate?: (env: unknown) => boolean;
  /** The notice shown when `evaluate` returns false. */
  notEvaluatedText?: string;
  /** Put the short caution under the last card of the document (default true). */
  caution?: boolean;
}

/** Per-document caches are bounded: the preview may see many documents in a session. */
const MAX_DOCUMENT_CACHES = 16;
/** The preview runs on the editor's extension host: a block may take this long before the rest of it is skipped. */
const PREVIEW_BLOCK_BUDGET_MS = 1000;

const SOURCE_META = 'taulineSource';

interface RenderState {
  /** The settings the evaluation was made with: cached tokens re-rendered under new settings evaluate again. */
  settings: string;
  result?: NoteResult;
  byFenceLine: Map<number, BlockResult>;
  lastFenceLine: number;
  budget: RenderBudget;
  evaluated: boolean;
}

function isShearInfo(info: string): boolean {
  const word = info.trim().split(/\s+/, 1)[0] ?? '';
  return word.toLowerCase() === BLOCK_LANGUAGE;
}

/**
 * Reconstructs a text with the same `shear` fences at the same lines, for hosts that render tokens
 * this plugin's core rule never saw. Only the blocks matter to the evaluator.
 */
function sourceFromTokens(tokens: Token[]): string {
  const lines: string[] = [];
  for (const t of tokens) {
    if (t.type !== 'fence' || !t.map || !isShearInfo(t.info)) continue;
    const [start, end] = t.map;
    while (lines.length < end) lines.push('');
    lines[start] = `${t.markup}${t.info}`;
    const content = t.content.endsWith('\n') ? t.content.slice(0, -1) : t.content;
    const body = content.length ? content.split('\n') : [];
    body.forEach((l, i) => {
      if (start + 1 + i < end) lines[start + 1 + i] = l;
    });
    if (end - 1 > start + body.length) lines[end - 1] = t.markup;
  }
  return lines.join('\n');
}

export function shearPlugin(md: MarkdownIt, options: ShearPluginOptions = {}): void {
  const caches = new Map<string, NoteCache>();
  const states = new WeakMap<Token[], RenderState>();
  const bodies = new WeakMap<BlockResult, { key: string; html: string }>();

  const cacheFor = (env: unknown): NoteCache => {
    const doc = env && typeof env === 'object' ? (env as { currentDocument?: unknown }).currentDocument : undefined;
    const key = doc === undefined || doc === null ? '' : String(doc);
    let cache = caches.get(key);
    if (cache) {
      caches.delete(key);
    } else {
      cache = new NoteCache();
      if (caches.size >= MAX_DOCUMENT_CACHES) caches.delete(caches.keys().next().value!);
    }
    caches.set(key, cache);
    return cache;
  };

  // The renderer never sees the source text, so the parse leaves it on the shear fences' tokens.
  // Tokens a host caches keep it, so a re-render of cached tokens needs no new parse.
  md.core.ruler.push('tauline_source', (state: StateCore) => {
    for (const t of state.tokens) {
      if (t.type === 'fence' && isShearInfo(t.info)) t.meta = { ...(t.meta ?? {}), [SOURCE_META]: state.src };
    }
  });

  const stateFor = (tokens: Token[], env: unknown): RenderState => {
    const evaluated = options.evaluate ? safeBoolean(() => options.evaluate!(env)) : true;
    const noteOptions: NoteOptions = { blockBudgetMs: PREVIEW_BLOCK_BUDGET_MS, ...options.note };
    const settings = `${evaluated}|${JSON.stringify(noteOptions)}`;
    let s = states.get(tokens);
    if (s && s.settings === settings) return s;
    let lastFenceLine = -1;
    let src: string | undefined;
    for (const t of tokens) {
      if (t.type === 'fence' && t.map && isShearInfo(t.info)) {
        lastFenceLine = t.map[0];
        src ??= typeof t.meta?.[SOURCE_META] === 'string' ? (t.meta[SOURCE_META] as string) : undefined;
      }
    }
    s = { settings, byFenceLine: new Map(), lastFenceLine, budget: defaultBudget(), evaluated };
    if (evaluated) {
      const text = src ?? sourceFromTokens(tokens);
      try {
        s.result = evaluateNote(text, noteOptions, cacheFor(env));
        for (const b of s.result.blocks) s.byFenceLine.set(b.block.fenceLine, b);
      } catch {
        s.result = undefined;
      }
    }
    states.set(tokens, s);
    return s;
  };

  const previous: RendererRule =
    md.renderer.rules.fence ?? ((tokens, idx, opts, _env, self) => self.renderToken(tokens, idx, opts));

  md.renderer.rules.fence = (tokens: Token[], idx: number, opts: Options, env: unknown, self: Renderer): string => {
    const token = tokens[idx]!;
    if (!isShearInfo(token.info)) return previous(tokens, idx, opts, env, self);
    const state = stateFor(tokens, env);
    const wanted = env && typeof env === 'object' ? (env as { tauline?: { result?: NoteResult } }).tauline : undefined;
    if (wanted && typeof wanted === 'object') wanted.result = state.result;
    const fenceLine = token.map ? token.map[0] : -1;
    const block = state.byFenceLine.get(fenceLine);
    const lineAnchors = (token.attrGet('class') ?? '').split(/\s+/).includes('code-line');
    const attrs = wrapperAttrs(token, self, block ? '' : ' tl-card-off');
    const title = block ? block.block.title : token.info.trim().slice(BLOCK_LANGUAGE.length).trim();
    if (!block) {
      const notice = state.evaluated ? 'not evaluated' : options.notEvaluatedText ?? 'not evaluated: this workspace is not trusted';
      return (
        `<div${attrs}>${headHtml(title, notice, 'none')}` +
        `<pre class="tl-source"><code>${escapeHtml(token.content)}</code></pre></div>\n`
      );
    }
    const system = block.unitSystem;
    const sig = options.note?.significantFigures;
    const key = `${lineAnchors ? 1 : 0}|${options.figureColors ?? ''}|${system}|${sig ?? ''}`;
    let body = bodies.get(block);
    if (!body || body.key !== key) {
      body = { key, html: renderBlockBody(block, { system, significantFigures: sig, figureColors: options.figureColors, lineAnchors, budget: state.budget }) };
      bodies.set(block, body);
    }
    const status = statusText(summarizeBlock(block));
    const caution = options.caution !== false && fenceLine === state.lastFenceLine ? cautionHtml() : '';
    return `<div${attrs}>${headHtml(title, status.text, status.tone)}<div class="tl-card-body">${body.html}</div>${caution}</div>\n`;
  };
}

function safeBoolean(f: () => boolean): boolean {
  try {
    return f() !== false;
  } catch {
    return false;
  }
}

/** The fence token's attributes (data-line, code-line, dir…) with our class added, without touching the (possibly cached) token. */
function wrapperAttrs(token: Token, self: Renderer, extraClass: string): string {
  const attrs: [string, string][] = (token.attrs ?? []).map(([k, v]) => [k, v]);
  const cls = attrs.find(([k]) => k === 'class');
  if (cls) cls[1] = `${cls[1]} tl-card${extraClass}`;
  else attrs.unshift(['class', `tl-card${extraClass}`]);
  return self.renderAttrs({ attrs } as Token);
}

function headHtml(title: string, status: string, tone: string): string {
  return (
    `<div class="tl-card-head"><span class="tl-card-tag">shear</span>` +
    `<span class="tl-card-title">${escapeHtml(title || 'Calculation')}</span>` +
    `<span class="tl-status tl-status-${tone}">${escapeHtml(status)}</span></div>`
  );
}

export default shearPlugin;
