/**
 * SVG figures drawn by our own code: a cross-section to scale beside its tau(y) diagram on one
 * height axis, a sparkline of tau(y), and V(x) / M(x) diagrams of a beam.
 *
 * Every function returns one self-contained `<svg>` string with width, height and viewBox, so the
 * same picture works inline in a page (where the page's CSS may restyle the `tl-fig-*` classes with
 * theme variables) and as an image on its own, e.g. a base64 data URI in a hover (where only the
 * colours baked into the attributes apply). Text from a note (names, titles, marks) is escaped.
 * Inputs are plain numbers in SI; nothing here throws on degenerate input: a figure that cannot be
 * drawn comes back as a small labelled placeholder.
 */
import type { BeamDiagram, BeamLoad, BeamResult, DiagramSamples, EnvelopeSamples, SupportKind } from '../core/beam';
import { formatNumber } from '../core/format';
import type { Section } from '../core/section';
import { DIM, type Dimension, preferredUnit, type UnitSystem } from '../core/units';
import { escapeHtml, num } from './escape';

/** How a figure is coloured. `currentColor` follows the surrounding text colour and reads on light and dark backgrounds. */
export type FigureColors = 'light' | 'dark' | 'currentColor';

export interface FigureOptions {
  colors?: FigureColors;
  /** Unit system of the labels. */
  system?: UnitSystem;
  significantFigures?: number;
  /** Accessible title of the picture (escaped). */
  title?: string;
}

export interface SectionFigureOptions extends FigureOptions {
  /** Largest drawing size of the section itself, px (default 180 × 200). */
  maxWidth?: number;
  maxHeight?: number;
}

/** A height worth marking on the diagram, e.g. a weld line the note evaluates. */
export interface HeightMark {
  /** Height above the section's lowest point, m. */
  y: number;
  label: string;
}

export interface TauFigureOptions extends SectionFigureOptions {
  marks?: HeightMark[];
  /** Width of the tau plot, px (default 150). */
  plotWidth?: number;
}

export interface SparklineOptions extends FigureOptions {
  width?: number;
  height?: number;
  /** A height to mark on the curve, m. */
  mark?: number;
}

export interface BeamFigureOptions extends FigureOptions {
  /** Overall width, px (default 560). */
  width?: number;
  /** Draw one combination (by name) instead of the envelope over all combinations. */
  combination?: string;
  /** The loads as written (SI, downward positive), drawn on the beam sketch. */
  loads?: readonly BeamLoad[];
}

interface Palette {
  ink: string;
  muted: string;
  grid: string;
  material: string;
  materialOpacity: number;
  edge: string;
  accent: string;
  accentOpacity: number;
  axis: string;
  positive: string;
  negative: string;
  fillOpacity: number;
}

const PALETTES: Record<FigureColors, Palette> = {
  light: {
    ink: '#1f2733', muted: '#5d6877', grid: '#cfd6df', material: '#8fa3b8', materialOpacity: 0.45, edge: '#33465c',
    accent: '#b65a1e', accentOpacity: 0.22, axis: '#2b6ea6', positive: '#2b6ea6', negative: '#b65a1e', fillOpacity: 0.2,
  },
  dark: {
    ink: '#e2e6eb', muted: '#9ba6b3', grid: '#3d4550', material: '#7f93a8', materialOpacity: 0.4, edge: '#c3cfdc',
    accent: '#f0a264', accentOpacity: 0.25, axis: '#7db8e8', positive: '#7db8e8', negative: '#f0a264', fillOpacity: 0.22,
  },
  currentColor: {
    ink: 'currentColor', muted: 'currentColor', grid: 'currentColor', material: 'currentColor', materialOpacity: 0.16, edge: 'currentColor',
    accent: '#d0742c', accentOpacity: 0.22, axis: '#3d8fd1', positive: '#3d8fd1', negative: '#d0742c', fillOpacity: 0.2,
  },
};

const FONT = "system-ui,-apple-system,'Segoe UI',Roboto,sans-serif";

function paletteOf(o: FigureOptions): Palette {
  const c = o.colors ?? 'currentColor';
  return Object.prototype.hasOwnProperty.call(PALETTES, c) ? PALETTES[c] : PALETTES.currentColor;
}

function svgOpen(width: number, height: number, title: string | undefined, cls: string, p: Palette): string {
  const w = Math.max(1, Math.ceil(width));
  const h = Math.max(1, Math.ceil(height));
  const color = p.ink === 'currentColor' ? '' : ` color="${p.ink}"`;
  return (
    `<svg xmlns="http://www.w3.org/2000/svg" class="tl-fig ${cls}" width="${w}" height="${h}" viewBox="0 0 ${w} ${h}"` +
    ` font-family="${FONT}" font-size="11"${color} role="img">` +
    (title ? `<title>${escapeHtml(title)}</title>` : '')
  );
}

function text(x: number, y: number, body: string, p: Palette, attrs = '', cls = 'tl-fig-ink'): string {
  const fill = cls === 'tl-fig-na-label' ? p.axis : cls === 'tl-fig-muted' ? p.muted : p.ink;
  return `<text class="${cls}" x="${num(x)}" y="${num(y)}" fill="${fill}"${attrs}>${escapeHtml(body)}</text>`;
}

function line(x1: number, y1: number, x2: number, y2: number, stroke: string, cls: string, attrs = ''): string {
  return `<line class="${cls}" x1="${num(x1)}" y1="${num(y1)}" x2="${num(x2)}" y2="${num(y2)}" stroke="${stroke}"${attrs}/>`;
}

function placeholder(message: string, o: FigureOptions, width = 220, height = 40): string {
  const p = paletteOf(o);
  return `${svgOpen(width, height, o.title ?? message, 'tl-fig-empty', p)}${text(8, height / 2 + 4, message, p, '', 'tl-fig-muted')}</svg>`;
}

/** A value with its unit, e.g. "12.4 MPa", in the unit `unit` (or the system's choice). */
function formatIn(si: number, dim: Dimension, unit: { text: string; factor: number } | undefined, o: FigureOptions): string {
  const u = unit ?? preferredUnit(dim, si, o.system ?? 'SI');
  if (!u) return formatNumber(si, { significantFigures: o.significantFigures });
  const n = formatNumber(si / u.factor, { significantFigures: o.significantFigures });
  return u.text ? `${n} ${u.text}` : n;
}

function lengthUnit(section: Section, o: FigureOptions): { text: string; factor: number } {
  if ((o.system ?? 'SI') === 'US') return { text: 'in', factor: 0.0254 };
  return section.depth >= 10 ? { text: 'm', factor: 1 } : { text: 'mm', factor: 1e-3 };
}

/** Keeps labels apart: a label is placed only where no earlier label is within `gap` px vertically (and overlapping horizontally). */
class LabelSpace {
  private taken: { y: number; x0: number; x1: number }[] = [];
  constructor(private readonly gap = 12) {}
  free(y: number, x0 = -Infinity, x1 = Infinity): boolean {
    return !this.taken.some((t) => Math.abs(t.y - y) < this.gap && x0 < t.x1 && x1 > t.x0);
  }
  take(y: number, x0 = -Infinity, x1 = Infinity): void {
    this.taken.push({ y, x0, x1 });
  }
  place(y: number, x0 = -Infinity, x1 = Infinity): boolean {
    if (!this.free(y, x0, x1)) return false;
    this.take(y, x0, x1);
    return true;
  }
}

/** Rough text width for label layout: the figures use an 11 px sans-serif. */
function textWidth(s: string, size = 11): number {
  return s.length * size * 0.62;
}

/** A path through points at 0.1 px, repeated points dropped: curves of a hundred samples stay small. */
function polyline(points: [number, number][]): string {
  let d = '';
  let last = '';
  for (const [x, y] of points) {
    const pt = `${num(x, 1)} ${num(y, 1)}`;
    if (pt === last) continue;
    d += (d ? 'L' : 'M') + pt;
    last = pt;
  }
  return d;
}

// ---- the section ---------------------------------------------------------------------------

interface SectionGeometry {
  /** px per metre, horizontally and vertically (equal unless the depth had to be exaggerated). */
  sx: number;
  sy: number;
  width: number;
  height: number;
  exaggerated: boolean;
}

function sectionGeometry(section: Section, o: SectionFigureOptions): SectionGeometry {
  const maxW = o.maxWidth ?? 180;
  const maxH = o.maxHeight ?? 200;
  const w = section.width > 0 ? section.width : section.depth;
  const d = section.depth;
  let s = Math.min(maxW / w, maxH / d);
  let sy = s;
  let exaggerated = false;
  const minH = Math.min(70, maxH);
  if (d * s < minH) {
    sy = minH / d;
    exaggerated = true;
  }
  if (!Number.isFinite(s) || s <= 0) s = sy = 1;
  return { sx: s, sy, width: w * s, height: d * sy, exaggerated };
}

function circlePath(cx: number, cy: number, r: number): string {
  return `M${num(cx - r)} ${num(cy)}A${num(r)} ${num(r)} 0 1 0 ${num(cx + r)} ${num(cy)}A${num(r)} ${num(r)} 0 1 0 ${num(cx - r)} ${num(cy)}Z`;
}

/** The section's parts drawn at (x0, top): material filled (voids cut out), part edges, holes dashed, centroid and neutral axis. */
function drawSection(section: Section, g: SectionGeometry, x0: number, top: number, p: Palette): string {
  const X = (x: number) => x0 + (x - section.left) * g.sx;
  const Y = (y: number) => top + g.height - y * g.sy;
  const outline = section.outline();
  const holeParts = new Set(section.parts().filter((s) => s.hole).map((s) => s.index));
  let fill = '';
  let edges = '';
  for (const item of outline) {
    const s = item.shape;
    let d: string;
    if (s.kind === 'circle') {
      // Circles stay circles only at equal scales; an exaggerated depth draws them as ellipses.
      if (g.sx === g.sy) d = circlePath(X(s.cx), Y(s.cy), s.r * g.sx);
      else {
        const rx = s.r * g.sx, ry = s.r * g.sy, cx = X(s.cx), cy = Y(s.cy);
        d = `M${num(cx - rx)} ${num(cy)}A${num(rx)} ${num(ry)} 0 1 0 ${num(cx + rx)} ${num(cy)}A${num(rx)} ${num(ry)} 0 1 0 ${num(cx - rx)} ${num(cy)}Z`;
      }
    } else {
      const pts: string[] = [];
      for (let i = 0; i < s.xs.length; i++) pts.push(`${i === 0 ? 'M' : 'L'}${num(X(s.xs[i]!))} ${num(Y(s.ys[i]!))}`);
      d = pts.join('') + 'Z';
    }
    fill += d;
    const hole = item.sign < 0 || holeParts.has(item.part);
    edges += `<path class="tl-fig-edge" d="${d}" fill="none" stroke="${p.edge}" stroke-width="${hole ? 1 : 1.2}"${holeParts.has(item.part) ? ' stroke-dasharray="3 2"' : ''}/>`;
  }
  let out = `<path class="tl-fig-material" d="${fill}" fill="${p.material}" fill-opacity="${p.materialOpacity}" fill-rule="evenodd" stroke="none"/>` + edges;
  const cx = X(section.centroidX), cy = Y(section.centroidY);
  out +=
    `<g class="tl-fig-centroid"><circle cx="${num(cx)}" cy="${num(cy)}" r="4.5" fill="none" stroke="${p.ink}" stroke-width="1"/>` +
    `<path d="M${num(cx)} ${num(cy - 4.5)}A4.5 4.5 0 0 1 ${num(cx + 4.5)} ${num(cy)}L${num(cx)} ${num(cy)}Z M${num(cx)} ${num(cy + 4.5)}A4.5 4.5 0 0 1 ${num(cx - 4.5)} ${num(cy)}L${num(cx)} ${num(cy)}Z" fill="${p.ink}" stroke="none"/></g>`;
  return out;
}

/** Left height axis: 0, the neutral axis and the top, in the note's length unit. */
function heightAxis(section: Section, g: SectionGeometry, axisX: number, top: number, p: Palette, o: FigureOptions, labels: LabelSpace): string {
  const unit = lengthUnit(section, o);
  const Y = (y: number) => top + g.height - y * g.sy;
  let out = line(axisX, Y(0), axisX, Y(section.depth), p.muted, 'tl-fig-axis', ' stroke-width="1"');
  const tick = (y: number, label: string, always = false) => {
    const py = Y(y);
    if (!always && !labels.place(py, 0, axisX)) return;
    if (always) labels.take(py, 0, axisX);
    out += line(axisX - 4, py, axisX, py, p.muted, 'tl-fig-axis');
    out += text(axisX - 6, py + 3.5, label, p, ' text-anchor="end"', 'tl-fig-muted');
  };
  tick(0, '0', true);
  tick(section.depth, formatNumber(section.depth / unit.factor, { significantFigures: o.significantFigures }), true);
  tick(section.centroidY, formatNumber(section.centroidY / unit.factor, { significantFigures: o.significantFigures }));
  out += text(2, top - 8, `y (${unit.text})`, p, '', 'tl-fig-muted');
  return out;
}

/** The section drawn to scale with its parts, holes, centroid and neutral axis, and a height axis. */
export function sectionFigure(section: Section, options: SectionFigureOptions = {}): string {
  if (!(section.depth > 0) || !(section.area > 0)) return placeholder('no section to draw', options);
  const p = paletteOf(options);
  const g = sectionGeometry(section, options);
  const left = 52, top = 24, bottom = 30, right = 64;
  const width = left + g.width + right;
  const height = top + g.height + bottom;
  const labels = new LabelSpace();
  let out = svgOpen(width, height, options.title ?? 'Cross-section', 'tl-fig-section', p);
  out += heightAxis(section, g, left - 10, top, p, options, labels);
  out += drawSection(section, g, left, top, p);
  const na = top + g.height - section.centroidY * g.sy;
  out += line(left - 6, na, left + g.width + 8, na, p.axis, 'tl-fig-na', ' stroke-dasharray="6 3" stroke-width="1"');
  out += text(left + g.width + 10, na + 3.5, 'NA', p, '', 'tl-fig-na-label');
  out += widthDimension(section, g, left, top + g.height + 14, p, options);
  if (g.exaggerated) out += text(left, height - 2, 'depth exaggerated', p, ' font-size="9"', 'tl-fig-muted');
  return out + '</svg>';
}

function widthDimension(section: Section, g: SectionGeometry, x0: number, y: number, p: Palette, o: FigureOptions): string {
  const unit = lengthUnit(section, o);
  const label = `${formatNumber(section.width / unit.factor, { significantFigures: o.significantFigures })} ${unit.text}`;
  const x1 = x0 + g.width;
  return (
    line(x0, y, x1, y, p.muted, 'tl-fig-dim', ' stroke-width="0.8"') +
    line(x0, y - 3, x0, y + 3, p.muted, 'tl-fig-dim', ' stroke-width="0.8"') +
    line(x1, y - 3, x1, y + 3, p.muted, 'tl-fig-dim', ' stroke-width="0.8"') +
    text((x0 + x1) / 2, y + 12, label, p, ' text-anchor="middle"', 'tl-fig-muted')
  );
}

// ---- tau(y) --------------------------------------------------------------------------------

interface TauScale {
  /** tau per V (1/m²) times this = the plotted value. */
  factor: number;
  /** Formats a plotted value with its unit, and without. */
  label: (value: number) => string;
  bare: (value: number) => string;
  axis: string;
}

/** With a force, tau in stress units; without one, tau in multiples of V/A (the shape factor). */
function tauScale(section: Section, V: number | undefined, peakPerV: number, o: FigureOptions): TauScale {
  if (V === undefined || !Number.isFinite(V) || V === 0) {
    const bare = (v: number) => formatNumber(v, { significantFigures: o.significantFigures });
    return { factor: section.area, label: (v) => `${bare(v)} V/A`, bare, axis: 'τ (× V/A)' };
  }
  const peak = Math.abs(V) * peakPerV;
  const unit = preferredUnit(DIM.stress, peak, o.system ?? 'SI');
  return {
    factor: Math.abs(V),
    label: (v) => formatIn(v, DIM.stress, unit, o),
    bare: (v) => formatNumber(v / (unit?.factor ?? 1), { significantFigures: o.significantFigures }),
    axis: `τ (${unit?.text ?? 'Pa'})`,
  };
}

interface TauPanel {
  svg: string;
  /** Right edge of what was drawn, px. */
  right: number;
}

function drawTau(
  section: Section,
  V: number | undefined,
  g: SectionGeometry,
  x0: number,
  top: number,
  plotWidth: number,
  p: Palette,
  o: TauFigureOptions,
  labels: LabelSpace,
): TauPanel {
  const profile = section.profile(121);
  const max = section.tauMax(1);
  let peakPerV = max.problem ? 0 : max.perV;
  for (let i = 0; i < profile.tauPerV.length; i++) peakPerV = Math.max(peakPerV, Math.abs(profile.tauPerV[i]!));
  const Y = (y: number) => top + g.height - y * g.sy;
  let out = line(x0, Y(0), x0, Y(section.depth), p.muted, 'tl-fig-axis', ' stroke-width="1"');
  if (!(peakPerV > 0) || !Number.isFinite(peakPerV)) {
    return { svg: out + text(x0 + 6, Y(section.depth / 2), 'no tau diagram', p, '', 'tl-fig-muted'), right: x0 + 100 };
  }
  const scale = tauScale(section, V, peakPerV, o);
  const sx = plotWidth / peakPerV;
  const X = (perV: number) => x0 + Math.abs(perV) * sx;
  // One path, filled and stroked: down the axis is part of its outline, where the axis line is drawn anyway.
  out += `<path class="tl-fig-tau tl-fig-tau-fill" d="${polyline([[x0, Y(profile.y[0]!)], ...Array.from(profile.y, (y, i) => [X(profile.tauPerV[i]!), Y(y)] as [number, number]), [x0, Y(profile.y[profile.y.length - 1]!)]])}Z" fill="${p.accent}" fill-opacity="${p.accentOpacity}" stroke="${p.accent}" stroke-width="1.6" stroke-linejoin="round"/>`;
  let right = x0 + plotWidth;

  const label = (py: number, px: number, body: string, cls = 'tl-fig-ink'): boolean => {
    const w = textWidth(body);
    if (!labels.place(py, px, px + w)) return false;
    out += text(px, py + 3.5, body, p, '', cls);
    right = Math.max(right, px + w);
    return true;
  };

  // tau_max first: it is the number the engineer looks for.
  if (!max.problem && max.locations.length) {
    for (const loc of max.locations) {
      const px = X(max.perV), py = Y(loc.y);
      out += `<circle class="tl-fig-tau-max" cx="${num(px)}" cy="${num(py)}" r="3" fill="${p.accent}" stroke="none"/>`;
    }
    const loc = max.locations[0]!;
    label(Y(loc.y), X(max.perV) + 6, `τmax ${scale.label(max.perV * scale.factor)}`, 'tl-fig-ink tl-fig-strong');
  }
  // Width jumps: both sides of the junction, narrow side first.
  const jumps = section
    .breakpoints()
    .filter((b) => b.widthBelow > 0 && b.widthAbove > 0 && Math.abs(b.widthBelow - b.widthAbove) > 1e-9 * Math.max(b.widthBelow, b.widthAbove))
    .map((b) => {
      const narrow = Math.min(b.widthBelow, b.widthAbove), wide = Math.max(b.widthBelow, b.widthAbove);
      const tNarrow = b.firstMoment / (section.I * narrow), tWide = b.firstMoment / (section.I * wide);
      return { y: b.y, tNarrow, tWide, weight: Math.abs(tNarrow - tWide) };
    })
    .filter((j) => j.weight > 0.02 * peakPerV)
    .sort((a, b) => b.weight - a.weight)
    .slice(0, 6);
  const marks = (o.marks ?? []).filter((m) => m.y >= 0 && m.y <= section.depth);
  const sameHeight = (a: number, b: number) => Math.abs(a - b) <= 1e-9 * section.depth;
  for (const j of jumps) {
    const py = Y(j.y);
    out += line(X(j.tWide), py, X(j.tNarrow), py, p.accent, 'tl-fig-jump', ' stroke-width="1" stroke-dasharray="2 2"');
    out += `<circle class="tl-fig-jump-end" cx="${num(X(j.tNarrow))}" cy="${num(py)}" r="2.2" fill="${p.accent}"/>`;
    out += `<circle class="tl-fig-jump-end" cx="${num(X(j.tWide))}" cy="${num(py)}" r="2.2" fill="none" stroke="${p.accent}"/>`;
    const body = `${scale.bare(j.tNarrow * scale.factor)} | ${scale.label(j.tWide * scale.factor)}`;
    // A height the note asks about that falls on a junction is named in the junction's label.
    const named = marks.filter((m) => sameHeight(m.y, j.y));
    for (const m of named) marks.splice(marks.indexOf(m), 1);
    label(py, X(Math.max(j.tNarrow, j.tWide)) + 6, named.length ? `${named.map((m) => m.label).join(', ')}: ${body}` : body);
  }
  for (const m of marks) {
    const py = Y(m.y);
    const t = section.tau(1, m.y);
    out += line(x0, py, X(t.value) + 2, py, p.muted, 'tl-fig-mark', ' stroke-width="0.8" stroke-dasharray="1 2"');
    label(py, X(Math.max(t.value, peakPerV * 0.15)) + 6, `${m.label}: ${scale.label(t.value * scale.factor)}`, 'tl-fig-muted');
  }
  // The tau axis along the bottom: 0 and the peak.
  const axisY = Y(0) + 10;
  out += line(x0, axisY, x0 + plotWidth, axisY, p.muted, 'tl-fig-axis', ' stroke-width="0.8"');
  out += line(x0, axisY - 3, x0, axisY + 3, p.muted, 'tl-fig-axis');
  out += line(x0 + plotWidth, axisY - 3, x0 + plotWidth, axisY + 3, p.muted, 'tl-fig-axis');
  out += text(x0, axisY + 13, '0', p, ' text-anchor="middle"', 'tl-fig-muted');
  out += text(x0 + plotWidth, axisY + 13, scale.label(peakPerV * scale.factor), p, ' text-anchor="end"', 'tl-fig-muted');
  out += text(x0, top - 8, scale.axis, p, '', 'tl-fig-muted');
  return { svg: out, right };
}

/** tau(y) alone on its height axis; V in N, or undefined for the shape in multiples of V/A. */
export function tauFigure(section: Section, V: number | undefined, options: TauFigureOptions = {}): string {
  if (!(section.depth > 0) || !(section.area > 0)) return placeholder('no section to draw', options);
  const p = paletteOf(options);
  const g = sectionGeometry(section, options);
  const left = 52, top = 24, bottom = 34;
  const plotWidth = options.plotWidth ?? 150;
  const labels = new LabelSpace();
  let body = heightAxis(section, g, left - 10, top, p, options, labels);
  const tau = drawTau(section, V, g, left, top, plotWidth, p, options, labels);
  body += tau.svg;
  const width = tau.right + 12;
  return svgOpen(width, top + g.height + bottom, options.title ?? 'Shear stress over the depth', 'tl-fig-tau', p) + body + '</svg>';
}

/** The section to scale beside its tau(y) diagram, sharing one height axis and the neutral axis line. */
export function sectionWithTau(section: Section, V: number | undefined, options: TauFigureOptions = {}): string {
  if (!(section.depth > 0) || !(section.area > 0)) return placeholder('no section to draw', options);
  const p = paletteOf(options);
  const g = sectionGeometry(section, options);
  const left = 52, top = 24, bottom = 36, gap = 30;
  const plotWidth = options.plotWidth ?? 150;
  const labels = new LabelSpace();
  let body = heightAxis(section, g, left - 10, top, p, options, labels);
  // Faint lines at every breakpoint tie a junction in the drawing to its jump in the diagram.
  const tauX = left + g.width + gap;
  for (const b of section.breakpoints()) {
    const py = top + g.height - b.y * g.sy;
    body += line(left, py, tauX + plotWidth, py, p.grid, 'tl-fig-grid', ` stroke-width="0.6"${p.grid === 'currentColor' ? ' stroke-opacity="0.2"' : ''}`);
  }
  body += drawSection(section, g, left, top, p);
  const tau = drawTau(section, V, g, tauX, top, plotWidth, p, options, labels);
  body += tau.svg;
  const na = top + g.height - section.centroidY * g.sy;
  body += line(left - 6, na, tauX + plotWidth, na, p.axis, 'tl-fig-na', ' stroke-dasharray="6 3" stroke-width="1"');
  if (labels.place(na, tauX - gap + 2, tauX - 2)) body += text(tauX - gap / 2, na - 3, 'NA', p, ' text-anchor="middle" font-size="9"', 'tl-fig-na-label');
  body += widthDimension(section, g, left, top + g.height + 14, p, options);
  if (g.exaggerated) body += text(left, top + g.height + 34, 'depth exaggerated', p, ' font-size="9"', 'tl-fig-muted');
  const width = tau.right + 12;
  return svgOpen(width, top + g.height + bottom, options.title ?? 'Section and shear stress over the depth', 'tl-fig-section-tau', p) + body + '</svg>';
}

/** A small tau(y) curve: height along the horizontal axis (bottom at the left), tau upward; an optional marked height. */
export function sparkline(section: Section, V: number | undefined, options: SparklineOptions = {}): string {
  const width = options.width ?? 96;
  const height = options.height ?? 24;
  const p = paletteOf(options);
  if (!(section.depth > 0) || !(section.area > 0)) return placeholder('', { ...options, title: options.title ?? 'no section' }, width, height);
  const profile = section.profile(61);
  let peak = 0;
  for (let i = 0; i < profile.tauPerV.length; i++) peak = Math.max(peak, Math.abs(profile.tauPerV[i]!));
  let out = svgOpen(width, height, options.title ?? 'Shear stress over the depth', 'tl-fig-spark', p);
  const pad = 2;
  const X = (y: number) => pad + (y / section.depth) * (width - 2 * pad);
  const Y = (t: number) => height - pad - (peak > 0 ? (Math.abs(t) / peak) * (height - 2 * pad) : 0);
  out += line(pad, height - pad, width - pad, height - pad, p.muted, 'tl-fig-axis', ` stroke-width="0.6"${p.muted === 'currentColor' ? ' stroke-opacity="0.5"' : ''}`);
  const d = polyline([[X(profile.y[0]!), Y(0)], ...Array.from(profile.y, (y, i) => [X(y), Y(profile.tauPerV[i]!)] as [number, number]), [X(profile.y[profile.y.length - 1]!), Y(0)]]) + 'Z';
  out += `<path class="tl-fig-tau-fill" d="${d}" fill="${p.accent}" fill-opacity="${p.accentOpacity}" stroke="${p.accent}" stroke-width="1" stroke-linejoin="round"/>`;
  const na = X(section.centroidY);
  out += line(na, pad, na, height - pad, p.axis, 'tl-fig-na', ' stroke-width="0.6" stroke-dasharray="2 1.5"');
  if (options.mark !== undefined && options.mark >= 0 && options.mark <= section.depth) {
    const t = section.tau(1, options.mark);
    out += `<circle class="tl-fig-mark" cx="${num(X(options.mark))}" cy="${num(Y(t.value))}" r="2.2" fill="${p.ink}"/>`;
  }
  void V;
  return out + '</svg>';
}

// ---- beams ---------------------------------------------------------------------------------

type BeamSource = BeamResult | BeamDiagram;

interface BeamPlotData {
  span: number;
  supports: { kind: SupportKind; x: number; R: number; M?: number }[];
  x: Float64Array;
  Vhi: Float64Array;
  Vlo: Float64Array;
  Mhi: Float64Array;
  Mlo: Float64Array;
  Vpeak: { V: number; x: number };
  Mmax: { M: number; x: number };
  Mmin: { M: number; x: number };
  caption: string;
}

function isResult(b: BeamSource): b is BeamResult {
  return (b as BeamResult).envelope !== undefined;
}

function plotData(beam: BeamSource, combination: string | undefined, n: number): BeamPlotData | undefined {
  let diagram: BeamDiagram | undefined;
  if (!isResult(beam)) diagram = beam;
  else if (combination !== undefined) diagram = beam.combination(combination);
  else if (beam.combinations.length === 1) diagram = beam.combinations[0];
  if (diagram) {
    const s: DiagramSamples = diagram.sample(n);
    return {
      span: diagram.span,
      supports: diagram.reactions.map((r) => ({ kind: r.kind, x: r.x, R: r.R, M: r.M })),
      x: s.x,
      Vhi: s.V,
      Vlo: s.V,
      Mhi: s.M,
      Mlo: s.M,
      Vpeak: diagram.Vmax,
      Mmax: diagram.Mmax,
      Mmin: diagram.Mmin,
      caption: diagram.name,
    };
  }
  if (!isResult(beam)) return undefined;
  const s: EnvelopeSamples = beam.sample(n);
  const env = beam.envelope;
  return {
    span: beam.span,
    supports: env.reactions.map((r) => ({ kind: r.kind, x: r.x, R: r.R.value, M: r.M?.value })),
    x: s.x,
    Vhi: s.Vmax,
    Vlo: s.Vmin,
    Mhi: s.Mmax,
    Mlo: s.Mmin,
    Vpeak: env.Vmax,
    Mmax: env.Mmax,
    Mmin: env.Mmin,
    caption: `envelope of ${beam.combinations.length} combinations`,
  };
}

/**
 * V(x) and M(x) of a solved beam under a sketch of the beam and its supports, with the reactions,
 * the values either side of each support and the extremes labelled. A BeamResult draws the
 * envelope over its combinations (or the one combination named in the options).
 */
export function beamDiagrams(beam: BeamSource, options: BeamFigureOptions = {}): string {
  const data = plotData(beam, options.combination, 160);
  if (!data || !(data.span > 0) || data.x.length < 2) return placeholder('no beam diagram', options);
  const p = paletteOf(options);
  const width = Math.max(320, options.width ?? 640);
  const left = 70, right = 30;
  const plotW = width - left - right;
  const X = (x: number) => left + (x / data.span) * plotW;
  const system = options.system ?? 'SI';
  const lengthU = system === 'US' ? { text: 'ft', factor: 0.3048 } : { text: 'm', factor: 1 };
  let out = '';
  let y = 10;

  // The loads above the beam, then the beam and its supports, reactions beneath.
  const loads = (options.loads ?? []).filter((l) => loadInSpan(l, data.span));
  if (loads.length) {
    const sketch = loadSketch(loads, X, y + 4, width, p, options);
    out += sketch.svg;
    y += sketch.height + 4;
  }
  const beamY = y + 16;
  out += line(X(0), beamY, X(data.span), beamY, p.ink, 'tl-fig-beam', ' stroke-width="3" stroke-linecap="square"');
  const supportLabels = new LabelSpace(0);
  for (const s of data.supports) out += supportGlyph(s.kind, X(s.x), beamY, s.x <= data.span / 2, p);
  y = beamY + 30;
  const reactionRow = y;
  for (const s of data.supports) {
    const body = `R = ${formatIn(s.R, DIM.force, undefined, options)}`;
    const w = textWidth(body, 10);
    let px = X(s.x) - w / 2;
    px = Math.max(2, Math.min(width - w - 2, px));
    if (!supportLabels.place(reactionRow, px - 4, px + w + 4)) continue;
    out += text(px, reactionRow, body, p, ' font-size="10"', 'tl-fig-muted');
    if (s.M !== undefined && s.M !== 0) out += text(px, reactionRow + 12, `M = ${formatIn(s.M, DIM.moment, undefined, options)}`, p, ' font-size="10"', 'tl-fig-muted');
  }
  y = reactionRow + (data.supports.some((s) => s.M) ? 22 : 12);

  const panelH = 96;
  const vPanel = drawDiagramPanel({
    title: `V (${preferredUnit(DIM.force, Math.abs(data.Vpeak.V), system)?.text ?? 'N'})`,
    x: data.x, hi: data.Vhi, lo: data.Vlo, top: y + 14, height: panelH, X, left, plotW, p, options, dim: DIM.force,
    className: 'tl-fig-shear',
    extremes: [{ x: data.Vpeak.x, value: data.Vpeak.V }],
    supports: data.supports.map((s) => s.x),
    span: data.span,
  });
  out += vPanel;
  y += 14 + panelH + 24;
  const mPeak = Math.max(Math.abs(data.Mmax.M), Math.abs(data.Mmin.M));
  out += drawDiagramPanel({
    title: `M (${preferredUnit(DIM.moment, mPeak, system)?.text ?? 'N·m'})`,
    x: data.x, hi: data.Mhi, lo: data.Mlo, top: y + 14, height: panelH, X, left, plotW, p, options, dim: DIM.moment,
    className: 'tl-fig-moment',
    extremes: [{ x: data.Mmax.x, value: data.Mmax.M }, { x: data.Mmin.x, value: data.Mmin.M }],
    supports: [],
    span: data.span,
  });
  y += 14 + panelH + 22;
  // x axis: the ends and every support.
  const ticks = [0, data.span, ...data.supports.map((s) => s.x)].sort((a, b) => a - b);
  const tickSpace = new LabelSpace(0);
  out += line(X(0), y, X(data.span), y, p.muted, 'tl-fig-axis', ' stroke-width="0.8"');
  for (const t of ticks) {
    const body = formatNumber(t / lengthU.factor, { significantFigures: options.significantFigures });
    const w = textWidth(body, 10);
    out += line(X(t), y - 3, X(t), y + 3, p.muted, 'tl-fig-axis');
    if (tickSpace.place(y, X(t) - w / 2 - 3, X(t) + w / 2 + 3)) out += text(X(t), y + 14, body, p, ' text-anchor="middle" font-size="10"', 'tl-fig-muted');
  }
  out += text(left - 12, y + 4, `x (${lengthU.text})`, p, ' text-anchor="end" font-size="10"', 'tl-fig-muted');
  y += 22;
  const title = options.title ?? `Shear force and bending moment (${data.caption})`;
  return svgOpen(width, y, title, 'tl-fig-beam', p) + out + '</svg>';
}

/** One kip per foot, N/m. */
const KLF = 4448.2216152605 / 0.3048;

function loadInSpan(l: BeamLoad, span: number): boolean {
  if (l.kind === 'point' || l.kind === 'moment') return l.x >= 0 && l.x <= span;
  return l.x1 >= 0 && l.x2 <= span && l.x2 > l.x1;
}

/**
 * Loads drawn above the beam, whose top edge is at the returned `height` below `top`: each line load
 * as a band (height following its intensity, small arrows), stacked in rows where line loads
 * overlap along the beam; point loads as a long arrow with the value; applied moments as an arc.
 * Upward point loads point up. Labels flip to the left near the right edge.
 */
function loadSketch(loads: readonly BeamLoad[], X: (x: number) => number, top: number, width: number, p: Palette, o: BeamFigureOptions): { svg: string; height: number } {
  const band = 10;
  const rowGap = 13;
  const lineLoads = loads.filter((l): l is Extract<BeamLoad, { kind: 'udl' | 'ramp' }> => l.kind === 'udl' || l.kind === 'ramp');
  const rows: number[] = [];
  lineLoads.forEach((l, i) => {
    let row = 0;
    while (lineLoads.slice(0, i).some((m, j) => rows[j] === row && m.x1 < l.x2 && l.x1 < m.x2)) row++;
    rows.push(row);
  });
  const rowCount = rows.length ? Math.max(...rows) + 1 : 0;
  const height = Math.max(30, rowCount * rowGap + 16);
  const base = top + height;
  const lineMax = Math.max(1e-30, ...lineLoads.flatMap((l) => (l.kind === 'udl' ? [Math.abs(l.w)] : [Math.abs(l.w1), Math.abs(l.w2)])));
  let out = '';
  const arrow = (x: number, y1: number, y2: number) => {
    const dir = y2 > y1 ? 1 : -1;
    return line(x, y1, x, y2, p.accent, 'tl-fig-load', ' stroke-width="1"') + `<path class="tl-fig-load" d="M${num(x - 2.5)},${num(y2 - 4 * dir)} L${num(x)},${num(y2)} L${num(x + 2.5)},${num(y2 - 4 * dir)}" fill="none" stroke="${p.accent}" stroke-width="1"/>`;
  };
  const labels = new LabelSpace(0);
  const label = (x: number, y: number, body: string, preferLeft = false) => {
    const w = textWidth(body, 9);
    let px = preferLeft || x + 4 + w > width - 2 ? x - 4 - w : x + 4;
    px = Math.max(2, Math.min(width - w - 2, px));
    return labels.place(y, px - 2, px + w + 2) ? text(px, y, body, p, ' font-size="9"', 'tl-fig-muted') : '';
  };
  lineLoads.forEach((l, i) => {
    const w1 = l.kind === 'udl' ? l.w : l.w1;
    const w2 = l.kind === 'udl' ? l.w : l.w2;
    const foot = base - 1 - rows[i]! * rowGap;
    const h1 = Math.max(1.5, (Math.abs(w1) / lineMax) * band);
    const h2 = Math.max(1.5, (Math.abs(w2) / lineMax) * band);
    const x1 = X(l.x1);
    const x2 = X(l.x2);
    out += `<path class="tl-fig-load" d="M${num(x1)},${num(foot)} L${num(x1)},${num(foot - h1)} L${num(x2)},${num(foot - h2)} L${num(x2)},${num(foot)} Z" fill="${p.accent}" fill-opacity="0.12" stroke="${p.accent}" stroke-width="0.8"/>`;
    if (rows[i] === 0) {
      const n = Math.max(2, Math.min(24, Math.round((x2 - x1) / 18)));
      for (let k = 0; k <= n; k++) {
        const xk = x1 + ((x2 - x1) * k) / n;
        const hk = h1 + ((h2 - h1) * k) / n;
        if (hk > 3) out += arrow(xk, foot - hk, foot);
      }
    }
    const group = l.group && l.group !== 'default' ? `${l.group} ` : '';
    // Beam line loads read in kN/m, or plf/klf in US units (shear flows elsewhere read per inch).
    const unit = (o.system ?? 'SI') === 'US' ? (Math.max(Math.abs(w1), Math.abs(w2)) >= KLF ? { text: 'klf', factor: KLF } : { text: 'plf', factor: KLF / 1000 }) : undefined;
    const body = group + (l.kind === 'udl' ? formatIn(w1, DIM.lineLoad, unit, o) : `${formatIn(w1, DIM.lineLoad, unit, o)} → ${formatIn(w2, DIM.lineLoad, unit, o)}`);
    out += label(x1 + 1, foot - Math.max(h1, h2) - 2, body);
  });
  for (const l of loads) {
    if (l.kind === 'point') {
      const x = X(l.x);
      out += l.P >= 0 ? arrow(x, top, base - 1) : arrow(x, base - 1, top);
      out += label(x, top + 7, (l.group && l.group !== 'default' ? `${l.group} ` : '') + formatIn(Math.abs(l.P), DIM.force, undefined, o));
    } else if (l.kind === 'moment') {
      const x = X(l.x);
      const r = 8;
      out += `<path class="tl-fig-load" d="M${num(x - r)},${num(base - 4)} A${r},${r} 0 1 1 ${num(x + r)},${num(base - 4)}" fill="none" stroke="${p.accent}" stroke-width="1"/>`;
      out += label(x + r, base - 14, formatIn(l.M, DIM.moment, undefined, o));
    }
  }
  return { svg: out, height };
}

function supportGlyph(kind: SupportKind, x: number, beamY: number, leftHalf: boolean, p: Palette): string {
  const top = beamY + 2;
  if (kind === 'fixed') {
    const wx = leftHalf ? x - 2 : x + 2;
    const dir = leftHalf ? -1 : 1;
    let hatch = '';
    for (let k = -12; k <= 8; k += 5) hatch += `M${num(wx)} ${num(beamY + k)}l${num(6 * dir)} 5`;
    return `<g class="tl-fig-support">${line(wx, beamY - 13, wx, beamY + 13, p.ink, 'tl-fig-support', ' stroke-width="1.6"')}<path d="${hatch}" stroke="${p.ink}" stroke-width="0.8" fill="none"/></g>`;
  }
  let g = `<path class="tl-fig-support" d="M${num(x)} ${num(top)}l-7 11h14z" fill="none" stroke="${p.ink}" stroke-width="1.2"/>`;
  if (kind === 'roller') g += `<circle cx="${num(x - 4)}" cy="${num(top + 14)}" r="2.4" fill="none" stroke="${p.ink}"/><circle cx="${num(x + 4)}" cy="${num(top + 14)}" r="2.4" fill="none" stroke="${p.ink}"/>`;
  else g += line(x - 9, top + 12, x + 9, top + 12, p.ink, 'tl-fig-support', ' stroke-width="1"');
  return g;
}

interface PanelInput {
  title: string;
  x: Float64Array;
  hi: Float64Array;
  lo: Float64Array;
  top: number;
  height: number;
  X: (x: number) => number;
  left: number;
  plotW: number;
  p: Palette;
  options: BeamFigureOptions;
  dim: Dimension;
  className: string;
  extremes: { x: number; value: number }[];
  supports: number[];
  span: number;
}

function drawDiagramPanel(d: PanelInput): string {
  const { p, X } = d;
  let maxV = 0, minV = 0;
  for (let i = 0; i < d.x.length; i++) {
    maxV = Math.max(maxV, d.hi[i]!, d.lo[i]!);
    minV = Math.min(minV, d.hi[i]!, d.lo[i]!);
  }
  const range = maxV - minV || 1;
  const Y = (v: number) => d.top + ((maxV - v) / range) * d.height;
  const zero = Y(0);
  // The panel's name sits in the left margin, clear of the value labels.
  let out = text(d.left - 12, d.top + d.height / 2 + 4, d.title, p, ' text-anchor="end"', 'tl-fig-muted');
  // Envelope band: the upper bound clipped at zero from below, the lower bound from above.
  const band: [number, number][] = [];
  for (let i = 0; i < d.x.length; i++) band.push([X(d.x[i]!), Y(Math.max(d.hi[i]!, 0))]);
  for (let i = d.x.length - 1; i >= 0; i--) band.push([X(d.x[i]!), Y(Math.min(d.lo[i]!, 0))]);
  out += `<path class="${d.className}-fill" d="${polyline(band)}Z" fill="${p.positive}" fill-opacity="${p.fillOpacity}" stroke="none"/>`;
  const curve = (vals: Float64Array) => polyline(Array.from(d.x, (x, i) => [X(x), Y(vals[i]!)] as [number, number]));
  out += `<path class="${d.className}" d="${curve(d.hi)}" fill="none" stroke="${p.positive}" stroke-width="1.5" stroke-linejoin="round"/>`;
  if (d.lo !== d.hi) out += `<path class="${d.className}" d="${curve(d.lo)}" fill="none" stroke="${p.positive}" stroke-width="1.5" stroke-linejoin="round"/>`;
  out += line(X(0), zero, X(d.span), zero, p.muted, 'tl-fig-axis', ' stroke-width="0.8"');
  const labels = new LabelSpace(11);
  const say = (x: number, v: number, strong: boolean) => {
    const body = formatIn(v, d.dim, preferredUnit(d.dim, Math.max(Math.abs(maxV), Math.abs(minV)), d.options.system ?? 'SI'), d.options);
    const w = textWidth(body, 10);
    const above = v >= 0;
    let py = above ? Y(v) - 5 : Y(v) + 13;
    py = Math.max(d.top - 2, Math.min(d.top + d.height + 13, py));
    let px = X(x) - w / 2;
    px = Math.max(2, Math.min(d.left + d.plotW + 24 - w, px));
    if (!labels.place(py, px - 2, px + w + 2)) return;
    out += `<circle class="${d.className}-point" cx="${num(X(x))}" cy="${num(Y(v))}" r="2.2" fill="${p.ink}"/>`;
    out += text(px, py, body, p, ` font-size="10"${strong ? ' font-weight="600"' : ''}`, strong ? 'tl-fig-ink tl-fig-strong' : 'tl-fig-ink');
  };
  for (const e of d.extremes) if (e.value !== 0) say(e.x, e.value, true);
  // Values just left and right of each support (from the duplicated samples at a jump).
  for (const sx of d.supports) {
    const idx: number[] = [];
    for (let i = 0; i < d.x.length; i++) if (Math.abs(d.x[i]! - sx) <= 1e-9 * d.span) idx.push(i);
    for (const i of idx) {
      const v = Math.abs(d.hi[i]!) >= Math.abs(d.lo[i]!) ? d.hi[i]! : d.lo[i]!;
      if (Math.abs(v) > 1e-9 * Math.max(Math.abs(maxV), Math.abs(minV))) say(d.x[i]!, v, false);
    }
  }
  return out;
}
