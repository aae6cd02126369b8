/**
 * Small SVG pictures for hovers: the section to scale beside its tau(y) diagram, a sparkline of a
 * distribution, a utilisation bar, and V(x)/M(x) diagrams of a beam.
 *
 * Hovers strip inline SVG, so each picture travels as a base64 `data:image/svg+xml` image. Such an
 * image is an isolated document: it cannot read the editor's theme variables, so colours are baked
 * in from the theme kind the client reports; with no report, the picture carries its own light card
 * so it reads on light and dark hovers alike. Every picture has an explicit width and height (a
 * viewBox alone is shown at 300×150) and stays a few kilobytes (the hover text is cut at 100 000
 * characters, which would break the image). Text is escaped; nothing from the note becomes markup.
 * Pure string building: runs in Node and in the browser worker.
 */
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
// Section beside its tau(y) diagram

export type OutlineShape =
  | { kind: 'polygon'; xs: ArrayLike<number>; ys: ArrayLike<number> }
  | { kind: 'circle'; cx: number; cy: number; r: number };

export interface SectionPictureInput {
  title: string;
  /** Outline in metres: x in the caller's frame, y from the lowest point; sign -1 is a void. */
  outline: { sign: 1 | -1; shape: OutlineShape }[];
  left: number;
  width: number;
  depth: number;
  centroidY: number;
  /** tau(y) in display units; y ascending (a height may repeat at a width jump). */
  profile: { y: ArrayLike<number>; tau: ArrayLike<number> };
  /** Heights of tau_max and its value (display units). */
  tauMax: { value: number; ys: number[] };
  labels: { tauMax: string; stressTitle: string; size: string; neutralAxis: string };
}

export const SECTION_PICTURE = { width: 380, height: 200 };

export function sectionPicture(input: SectionPictureInput, p: Palette): string {
  const { width: W, height: H } = SECTION_PICTURE;
  const top = 22;
  const bottom = H - 30;
  const plotH = bottom - top;
  const secW = 140;
  const secX0 = 14;
  const scale = Math.min(secW / Math.max(input.width, 1e-12), plotH / Math.max(input.depth, 1e-12));
  const drawnW = input.width * scale;
  const drawnH = input.depth * scale;
  const ox = secX0 + (secW - drawnW) / 2;
  const oy = bottom - (plotH - drawnH) / 2; // screen y of the section's lowest point
  const sx = (x: number) => ox + (x - input.left) * scale;
  const sy = (y: number) => oy - y * scale;
  const shape = (s: OutlineShape, fill: string) => {
    if (s.kind === 'circle') return `<circle cx="${n(sx(s.cx))}" cy="${n(sy(s.cy))}" r="${n(s.r * scale)}" fill="${fill}"/>`;
    let d = '';
    for (let i = 0; i < s.xs.length; i++) d += `${i ? 'L' : 'M'}${n(sx(s.xs[i]!))} ${n(sy(s.ys[i]!))}`;
    return `<path d="${d}Z" fill="${fill}"/>`;
  };
  let svg = svgOpen(W, H, p, input.title);
  // Material: solids painted white in a mask, voids black, so holes show the background through.
  const solids = input.outline.filter((o) => o.sign > 0).map((o) => shape(o.shape, '#fff')).join('');
  const voids = input.outline.filter((o) => o.sign < 0).map((o) => shape(o.shape, '#000')).join('');
  svg += `<defs><mask id="m" maskUnits="userSpaceOnUse" x="0" y="0" width="${W}" height="${H}"><rect width="${W}" height="${H}" fill="#000"/>${solids}${voids}</mask></defs>`;
  svg += `<rect x="0" y="0" width="${W}" height="${H}" fill="${p.material}" mask="url(#m)"/>`;
  svg += `<g fill="none" stroke="${p.materialStroke}" stroke-width="1">${input.outline.map((o) => shape(o.shape, 'none')).join('')}</g>`;
  svg += text(secX0 + secW / 2, H - 14, input.labels.size, p.muted, 'middle');
  svg += text(secX0, 13, input.title, p.text, 'start', ' font-weight="600"');

  // tau(y): same vertical scale as the section, so heights line up across the two panels.
  const tx0 = secX0 + secW + 28;
  const tW = W - tx0 - 16;
  const maxTau = Math.max(Math.abs(input.tauMax.value), ...Array.from(input.profile.tau, (t) => Math.abs(t)), 1e-30);
  const tx = (t: number) => tx0 + (Math.abs(t) / maxTau) * tW * 0.78;
  svg += `<line x1="${n(tx0)}" y1="${n(sy(0))}" x2="${n(tx0)}" y2="${n(sy(input.depth))}" stroke="${p.grid}"/>`;
  const ys = input.profile.y;
  const ts = input.profile.tau;
  if (ys.length > 1) {
    let d = `M${n(tx0)} ${n(sy(ys[0]!))}`;
    for (let i = 0; i < ys.length; i++) d += `L${n(tx(ts[i]!))} ${n(sy(ys[i]!))}`;
    d += `L${n(tx0)} ${n(sy(ys[ys.length - 1]!))}Z`;
    svg += `<path d="${d}" fill="${p.stress}" fill-opacity="0.85" stroke="${p.stressStroke}" stroke-width="1.2" stroke-linejoin="round"/>`;
  }
  svg += text(tx0, 13, input.labels.stressTitle, p.text, 'start', ' font-weight="600"');
  // Neutral axis across both panels.
  const ya = sy(input.centroidY);
  svg += `<line x1="${n(secX0 - 6)}" y1="${n(ya)}" x2="${n(W - 8)}" y2="${n(ya)}" stroke="${p.axis}" stroke-dasharray="4 3"/>`;
  svg += text(secX0 - 6, ya - 3, input.labels.neutralAxis, p.axis);
  for (const y of input.tauMax.ys.slice(0, 2)) {
    const cx = tx(input.tauMax.value);
    const cy = sy(y);
    svg += `<circle cx="${n(cx)}" cy="${n(cy)}" r="3" fill="${p.marker}"/>`;
  }
  if (input.tauMax.ys.length) {
    const cy = sy(input.tauMax.ys[0]!);
    const labelY = Math.min(bottom, Math.max(top + 10, cy + (cy - top < 24 ? 14 : -7)));
    svg += text(W - 10, labelY, input.labels.tauMax, p.marker, 'end');
  }
  svg += text(tx0, H - 14, '0', p.muted, 'middle');
  return svg + '</svg>';
}

// ---------------------------------------------------------------------------------------------
// Sparkline of a distribution over the depth (tau or shear flow against height)

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

export const RATIO_BAR = { width: 260, height: 30 };

export function ratioBar(input: { ratio: number; pass: boolean; label: string }, p: Palette): string {
  const { width: W, height: H } = RATIO_BAR;
  const x0 = 8;
  const barW = W - 70;
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

// ---------------------------------------------------------------------------------------------
// V(x) and M(x) of a beam

export interface BeamPictureInput {
  title: string;
  span: number;
  x: ArrayLike<number>;
  V: ArrayLike<number>;
  M: ArrayLike<number>;
  supports: { x: number; fixed: boolean }[];
  /** Labels of the extremes, already formatted with units. */
  labels: { span: string; Vmax: string; Mmax: string; Vname: string; Mname: string };
  /** Positions (x) of the extremes to mark. */
  marks: { Vx: number; Vvalue: number; Mx: number; Mvalue: number };
}

export const BEAM_PICTURE = { width: 320, height: 176 };

export function beamPicture(input: BeamPictureInput, p: Palette): string {
  const { width: W, height: H } = BEAM_PICTURE;
  const x0 = 30;
  const x1 = W - 12;
  const sx = (x: number) => x0 + (x / Math.max(input.span, 1e-30)) * (x1 - x0);
  let svg = svgOpen(W, H, p, input.title);
  // The beam and its supports.
  const beamY = 20;
  svg += `<line x1="${x0}" y1="${beamY}" x2="${x1}" y2="${beamY}" stroke="${p.text}" stroke-width="2.5"/>`;
  for (const s of input.supports) {
    const x = sx(s.x);
    if (s.fixed) {
      const wx = s.x <= input.span / 2 ? x - 2 : x + 2;
      svg += `<line x1="${n(wx)}" y1="${beamY - 9}" x2="${n(wx)}" y2="${beamY + 9}" stroke="${p.muted}" stroke-width="3"/>`;
    } else {
      svg += `<path d="M${n(x)} ${beamY + 1}L${n(x - 5)} ${beamY + 9}L${n(x + 5)} ${beamY + 9}Z" fill="${p.muted}"/>`;
    }
  }
  svg += text(x1, beamY - 6, input.labels.span, p.muted, 'end');
  const panel = (values: ArrayLike<number>, top: number, height: number, name: string, label: string, markX: number, markV: number, invert: boolean) => {
    let max = 1e-30;
    for (let i = 0; i < values.length; i++) max = Math.max(max, Math.abs(values[i]!));
    const mid = top + height / 2;
    // Sagging moment is drawn below the axis, as engineers draw it on the tension side.
    const py = (v: number) => mid - ((invert ? -v : v) / max) * (height / 2);
    let d = `M${n(sx(input.x[0] ?? 0))} ${n(mid)}`;
    for (let i = 0; i < input.x.length; i++) d += `L${n(sx(input.x[i]!))} ${n(py(values[i]!))}`;
    d += `L${n(sx(input.x[input.x.length - 1] ?? input.span))} ${n(mid)}Z`;
    let s = `<path d="${d}" fill="${p.stress}" fill-opacity="0.8" stroke="${p.stressStroke}" stroke-width="1.1" stroke-linejoin="round"/>`;
    s += `<line x1="${x0}" y1="${n(mid)}" x2="${x1}" y2="${n(mid)}" stroke="${p.grid}"/>`;
    s += text(4, mid + 3, name, p.text, 'start', ' font-weight="600"');
    const mx = sx(markX);
    const my = py(markV);
    s += `<circle cx="${n(mx)}" cy="${n(my)}" r="2.5" fill="${p.marker}"/>`;
    const anchor = mx > (x0 + x1) / 2 ? 'end' : 'start';
    const ly = my < mid ? Math.max(top + 8, my - 4) : Math.min(top + height + 2, my + 11);
    s += text(mx + (anchor === 'end' ? -5 : 5), ly, label, p.marker, anchor);
    return s;
  };
  svg += panel(input.V, 38, 58, input.labels.Vname, input.labels.Vmax, input.marks.Vx, input.marks.Vvalue, false);
  svg += panel(input.M, 108, 58, input.labels.Mname, input.labels.Mmax, input.marks.Mx, input.marks.Mvalue, true);
  return svg + '</svg>';
}
