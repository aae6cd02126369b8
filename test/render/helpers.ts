/**
 * Helpers for the renderer's tests: render a note the way the sheet does, read the cards back as
 * plain data (rows, formulas' text, notes, verdicts, diagnostics), and compare with reviewable
 * snapshot files (UPDATE_SNAPSHOTS=1 rewrites them).
 */
import { existsSync, mkdirSync, readFileSync, writeFileSync } from 'node:fs';
import { dirname, join } from 'node:path';
import { expect } from 'vitest';
import { createSheetMarkdown, type ShearRenderEnv } from '../../src/render/page';
import type { NoteResult } from '../../src/core/note';

export const ROOT = join(__dirname, '..', '..');
export const ARTIFACTS = join(ROOT, 'test-artifacts', 'render');

export function renderWithResult(text: string, doc = 'test:note'): { html: string; result: NoteResult } {
  const md = createSheetMarkdown();
  const env: ShearRenderEnv & { currentDocument: string } = { tauline: {}, currentDocument: doc };
  const html = md.render(text, env);
  if (!env.tauline?.result) throw new Error('the plugin left no evaluation in env.tauline');
  return { html, result: env.tauline.result };
}

export function decode(s: string): string {
  return s.replace(/&lt;/g, '<').replace(/&gt;/g, '>').replace(/&quot;/g, '"').replace(/&#39;/g, "'").replace(/&amp;/g, '&');
}

export interface RowView {
  kind: string;
  line: number;
  /** Plain text of each formula step, in order (the aria-label KaTeX output is read by). */
  steps: string[];
  notes: string[];
  verdict?: string;
  ratio?: string;
  diagnostics: string[];
  /** Property table cells, label → value. */
  props: Record<string, string>;
  figures: number;
  html: string;
}

export interface CardView {
  title: string;
  status: string;
  rows: RowView[];
}

const all = (re: RegExp, s: string) => [...s.matchAll(re)].map((m) => decode(m[1]!));

/** Reads our own card markup back; rows are siblings, so splitting on the row opener is enough. */
export function readCards(html: string): CardView[] {
  const cards: CardView[] = [];
  const parts = html.split(/<div (?=[^>]*class="[^"]*\btl-card(?=[\s"]))/).slice(1);
  for (const part of parts) {
    const title = decode(/tl-card-title">([^<]*)</.exec(part)?.[1] ?? '');
    const status = decode(/class="tl-status [^"]*">([^<]*)</.exec(part)?.[1] ?? '');
    const rows: RowView[] = [];
    for (const seg of part.split(/<div class="tl-row /).slice(1)) {
      const kind = /^tl-row-([a-z]+)/.exec(seg)?.[1] ?? '?';
      const line = Number(/data-line="(\d+)"/.exec(seg)?.[1] ?? -1);
      const props: Record<string, string> = {};
      for (const m of seg.matchAll(/<tr><th scope="row">(.*?)<\/th><td>(.*?)<\/td><\/tr>/g)) props[decode(m[1]!.replace(/<[^>]+>/g, ''))] = decode(m[2]!);
      rows.push({
        kind,
        line,
        steps: all(/class="tl-math" role="math" aria-label="([^"]*)"/g, seg),
        notes: all(/<div class="tl-note">([^<]*)</g, seg),
        verdict: /tl-verdict-word">([^<]*)</.exec(seg)?.[1],
        ratio: /tl-ratio">([^<]*)</.exec(seg)?.[1],
        diagnostics: all(/tl-diag-message">([^<]*)</g, seg),
        props,
        figures: (seg.match(/<svg /g) ?? []).length,
        html: seg,
      });
    }
    cards.push({ title, status, rows });
  }
  return cards;
}

/** A reviewable text form of cards, for snapshot files. */
export function outline(cards: CardView[]): string {
  let out = '';
  for (const c of cards) {
    out += `## ${c.title} [${c.status}]\n`;
    for (const r of c.rows) {
      out += `- ${r.kind} @${r.line + 1}`;
      if (r.steps.length) out += `: ${r.steps.join(' ')}`;
      out += '\n';
      for (const [k, v] of Object.entries(r.props)) out += `    ${k}: ${v}\n`;
      for (const n of r.notes) out += `    note: ${n}\n`;
      if (r.verdict) out += `    verdict: ${r.verdict}, ${r.ratio}\n`;
      for (const d of r.diagnostics) out += `    diagnostic: ${d}\n`;
      if (r.figures) out += `    figures: ${r.figures}\n`;
    }
  }
  return out;
}

/** Compares with test/render/__snapshots__/NAME; UPDATE_SNAPSHOTS=1 writes the file instead. */
export function matchSnapshot(name: string, content: string): void {
  const file = join(__dirname, '__snapshots__', name);
  if (process.env.UPDATE_SNAPSHOTS === '1' || !existsSync(file)) {
    mkdirSync(dirname(file), { recursive: true });
    writeFileSync(file, content);
    if (process.env.UPDATE_SNAPSHOTS !== '1') console.log(`wrote new snapshot ${name}`);
    return;
  }
  expect(content, `snapshot ${name} differs; run with UPDATE_SNAPSHOTS=1 after reviewing`).toBe(readFileSync(file, 'utf8'));
}

/** Parses a number as this tool formats it ("13200", "692×10⁶", "-1.25") back to a number. */
export function parseShown(text: string): number {
  const t = text.replace(/−/g, '-').trim();
  const m = /^(-?[0-9.]+)(?:×10([⁻⁰¹²³⁴⁵⁶⁷⁸⁹]+))?/.exec(t);
  if (!m) throw new Error(`not a number: ${text}`);
  let exp = 0;
  if (m[2]) exp = Number(m[2].replace(/[⁻⁰¹²³⁴⁵⁶⁷⁸⁹]/g, (c) => '-0123456789'['⁻⁰¹²³⁴⁵⁶⁷⁸⁹'.indexOf(c)]!));
  return Number(m[1]) * 10 ** exp;
}

/** Relative closeness, for numbers shown to 3 significant figures (half a unit in the third figure). */
export function closeTo3(shown: number, exact: number): boolean {
  return Math.abs(shown - exact) <= 0.005 * Math.abs(exact) + 1e-12;
}
