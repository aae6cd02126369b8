/**
 * Hover pictures. The section-with-tau(y), tau sparkline and V(x)/M(x) figures come from the
 * shared figure module (src/render/figures.ts, also used by the calculation sheet); this file adds
 * what only hovers need: colours per theme kind, a card behind a figure when the theme is unknown,
 * the base64 data URI, a utilisation bar, and a sparkline of any distribution (shear flow).
 *
 * Hovers strip inline SVG, so each picture travels as a base64 `data:image/svg+xml` image. Such an
 * image is an isolated document: it cannot read the editor's theme variables, so colours are baked
 * in from the theme kind the client reports; with no report, the picture carries its own light card
 * so it reads on light and dark hovers alike. Every picture has an explicit width and height (a
 * viewBox alone is shown at 300×150) and stays a few kilobytes (the hover text is cut at 100 000
 * characters, which would break the image). Text is escaped; nothing from the note becomes markup.
 * Pure string building: runs in Node and in the browser worker.
 */
import type { FigureColors } from '../../render/figures';
import type { ThemeKind } from '../settings';

export interface Palette {
  /** Card drawn behind the picture, or undefined for a transparent background. */
  card?: string;
  text: string;
  muted: string;
  grid: string;
  material: string;
  materialStroke: string;
  stress: string;
  stressStroke: string;
  axis: string;
  marker: string;
  pass: string;
  fail: string;
}

const LIGHT: Palette = {
  text: '#1f2328',
  muted: '#57606a',
  grid: '#c8d1da',
  material: '#a9cbe9',
  materialStroke: '#1f5f99',
  stress: '#f5c08f',
  stressStroke: '#a34d00',
  axis: '#6f42c1',
  marker: '#cf222e',
  pass: '#1a7f37',
  fail: '#cf222e',
};

const DARK: Palette = {
  text: '#e6edf3',
  muted: '#9da7b3',
  grid: '#3d444d',
  material: '#2b5a85',
  materialStroke: '#8cc8ff',
  stress: '#7a4a1f',
  stressStroke: '#ffb570',
  axis: '#d2a8ff',
  marker: '#ff7b72',
  pass: '#3fb950',
  fail: '#ff7b72',
};

const HIGH_CONTRAST_DARK: Palette = { ...DARK, text: '#ffffff', muted: '#ffffff', materialStroke: '#ffffff', stressStroke: '#ffffff', grid: '#7f7f7f' };
const HIGH_CONTRAST_LIGHT: Palette = { ...LIGHT, text: '#000000', muted: '#000000', materialStroke: '#000000', stressStroke: '#000000', grid: '#7f7f7f' };

export function paletteFor(kind: ThemeKind): Palette {
  switch (kind) {
    case 'light':
      return LIGHT;
    case 'dark':
      return DARK;
    case 'highContrast':
      return HIGH_CONTRAST_DARK;
    case 'highContrastLight':
      return HIGH_CONTRAST_LIGHT;
    default:
      return { ...LIGHT, card: '#fbfbfb' };
  }
}

export function escapeXml(s: string): string {
  return s.replace(/[&<>"']/g, (c) => ({ '&': '&amp;', '<': '&lt;', '>': '&gt;', '"': '&quot;', "'": '&#39;' })[c]!);
}

/** A coordinate with one decimal: enough for a picture, and it keeps the image small. */
function n(v: number): string {
  if (!Number.isFinite(v)) return '0';
  const r = Math.round(v * 10) / 10;
  return Object.is(r, -0) ? '0' : String(r);
}

function svgOpen(width: number, height: number, p: Palette, title: string): string {
  const card = p.card ? `<rect x="0.5" y="0.5" width="${width - 1}" height="${height - 1}" rx="6" fill="${p.card}" stroke="${p.grid}"/>` : '';
  return `<svg xmlns="http://www.w3.org/2000/svg" width="${width}" height="${height}" viewBox="0 0 ${width} ${height}" font-family="Segoe UI, Helvetica, Arial, sans-serif" font-size="10"><title>${escapeXml(title)}</title>${card}`;
}

function text(x: number, y: number, s: string, fill: string, anchor: 'start' | 'middle' | 'end' = 'start', extra = ''): string {
  return `<text x="${n(x)}" y="${n(y)}" fill="${fill}" text-anchor="${anchor}"${extra}>${escapeXml(s)}</text>`;
}

/** Base64 of the UTF-8 bytes of a string, without Buffer or btoa (both environments). */
export function base64(s: string): string {
  const bytes = new TextEncoder().encode(s);
  const abc = 'ABCDEFGHIJKLMNOPQRSTUVWXYZabcdefghijklmnopqrstuvwxyz0123456789+/';
  let out = '';
  let i = 0;
  for (; i + 2 < bytes.length; i += 3) {
    const v = (bytes[i]! << 16) | (bytes[i + 1]! << 8) | bytes[i + 2]!;
    out += abc[(v >> 18) & 63]! + abc[(v >> 12) & 63]! + abc[(v >> 6) & 63]! + abc[v & 63]!;
  }
  const rest = bytes.length - i;
  if (rest === 1) {
    const v = bytes[i]! << 16;
    out += abc[(v >> 18) & 63]! + abc[(v >> 12) & 63]! + '==';
  } else if (rest === 2) {
    const v = (bytes[i]! << 16) | (bytes[i + 1]! << 8);
    out += abc[(v >> 18) & 63]! + abc[(v >> 12) & 63]! + abc[(v >> 6) & 63]! + '=';
  }
  return out;
}

export function svgDataUri(svg: string): string {
  return `data:image/svg+xml;base64,${base64(svg)}`;
}

/** Markdown image for a hover; the alt text is the picture's words for clients that show no images. */
export function markdownImage(alt: string, svg: string): string {
  return `![${alt.replace(/[\[\]\\]/g, '')}](${svgDataUri(svg)})`;
}

// ---------------------------------------------------------------------------------------------
// Sparkline of a distribution over the depth (shear flow against height)

export const SPARKLINE = { width: 240, height: 64 };

export function sparkline(input: { title: string; y: ArrayLike<number>; value: ArrayLike<number>; mark?: { y: number; value: number }; left: string; right: string }, p: Palette): string {
  const { width: W, height: H } = SPARKLINE;
  const x0 = 8;
  const x1 = W - 8;
  const y0 = H - 16;
  const y1 = 8;
  const ys = input.y;
  const lo = ys.length ? ys[0]! : 0;
  const hi = ys.length ? ys[ys.length - 1]! : 1;
  const max = Math.max(1e-30, ...Array.from(input.value, (v) => Math.abs(v)), input.mark ? Math.abs(input.mark.value) : 0);
  const px = (y: number) => x0 + ((y - lo) / Math.max(hi - lo, 1e-30)) * (x1 - x0);
  const py = (v: number) => y0 - (Math.abs(v) / max) * (y0 - y1);
  let svg = svgOpen(W, H, p, input.title);
  if (ys.length > 1) {
    let d = `M${n(px(lo))} ${n(y0)}`;
    for (let i = 0; i < ys.length; i++) d += `L${n(px(ys[i]!))} ${n(py(input.value[i]!))}`;
    d += `L${n(px(hi))} ${n(y0)}Z`;
    svg += `<path d="${d}" fill="${p.stress}" fill-opacity="0.8" stroke="${p.stressStroke}" stroke-width="1.2" stroke-linejoin="round"/>`;
  }
  svg += `<line x1="${x0}" y1="${y0}" x2="${x1}" y2="${y0}" stroke="${p.grid}"/>`;
  if (input.mark) {
    const mx = px(input.mark.y);
    svg += `<line x1="${n(mx)}" y1="${y1}" x2="${n(mx)}" y2="${y0}" stroke="${p.marker}" stroke-dasharray="2 2"/>`;
    svg += `<circle cx="${n(mx)}" cy="${n(py(input.mark.value))}" r="3" fill="${p.marker}"/>`;
  }
  svg += text(x0, H - 4, input.left, p.muted);
  svg += text(x1, H - 4, input.right, p.muted, 'end');
  return svg + '</svg>';
}

// ---------------------------------------------------------------------------------------------
// Utilisation bar of a check

export const RATIO_BAR = { width: 280, height: 30 };

export function ratioBar(input: { ratio: number; pass: boolean; label: string }, p: Palette): string {
  const { width: W, height: H } = RATIO_BAR;
  const x0 = 8;
  const barW = W - 96;
  const full = 1.5; // the bar runs to a utilisation of 1.5; beyond it is drawn full
  const f = Math.min(Math.max(input.ratio, 0), full) / full;
  const colour = input.pass ? p.pass : p.fail;
  let svg = svgOpen(W, H, p, input.label);
  svg += `<rect x="${x0}" y="9" width="${barW}" height="12" rx="2" fill="none" stroke="${p.grid}"/>`;
  svg += `<rect x="${x0}" y="9" width="${n(barW * f)}" height="12" rx="2" fill="${colour}"/>`;
  const one = x0 + barW / full;
  svg += `<line x1="${n(one)}" y1="5" x2="${n(one)}" y2="25" stroke="${p.text}" stroke-width="1.5"/>`;
  svg += text(one, H - 1, '1.0', p.muted, 'middle', ' font-size="8"');
  svg += text(W - 8, 19, input.label, colour, 'end', ' font-weight="600"');
  return svg + '</svg>';
}

/** The shared figures' colour scheme for a theme kind (high-contrast themes take the plain light/dark ones). */
export function figureColors(kind: ThemeKind): FigureColors {
  return kind === 'dark' || kind === 'highContrast' ? 'dark' : 'light';
}

/**
 * A figure ready for a hover: as drawn when the theme kind is known; on a light card of its own
 * when it is not, so dark ink never lands on a dark hover.
 */
export function forHover(figure: string, kind: ThemeKind): string {
  const svg = strictXml(figure);
  const p = paletteFor(kind);
  if (!p.card) return svg;
  const m = /^<svg\b[^>]*\bwidth="([\d.]+)"[^>]*\bheight="([\d.]+)"/.exec(svg);
  if (!m) return svg;
  const w = Math.ceil(Number(m[1])) + 12;
  const h = Math.ceil(Number(m[2])) + 12;
  const inner = svg.replace(/^<svg\b/, '<svg x="6" y="6"');
  return `<svg xmlns="http://www.w3.org/2000/svg" width="${w}" height="${h}" viewBox="0 0 ${w} ${h}"><rect x="0.5" y="0.5" width="${w - 1}" height="${h - 1}" rx="6" fill="${p.card}" stroke="${p.grid}"/>${inner}</svg>`;
}

/**
 * An SVG shown as an image is parsed as XML, where a repeated attribute makes the whole picture
 * fail (inline in HTML the browser would forgive it). Keeps the last of repeated attributes in each
 * tag, the one a figure adds on purpose after its defaults.
 */
export function strictXml(svg: string): string {
  return svg.replace(/<([A-Za-z][\w:-]*)((?:\s+[\w:-]+="[^"]*")+)(\s*\/?)>/g, (whole, tag: string, attrs: string, close: string) => {
    const seen = new Map<string, string>();
    for (const m of attrs.matchAll(/\s+([\w:-]+)="([^"]*)"/g)) {
      seen.delete(m[1]!);
      seen.set(m[1]!, m[2]!);
    }
    if (seen.size === (attrs.match(/="/g) ?? []).length) return whole;
    return `<${tag}${[...seen].map(([k, v]) => ` ${k}="${v}"`).join('')}${close}>`;
  });
}
