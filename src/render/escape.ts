/**
 * HTML escaping for everything the renderer writes. Every string that comes from a note (titles,
 * comments, names, diagnostics, part lines) goes through one of these before it reaches markup.
 */

const HTML_ESCAPES: Record<string, string> = { '&': '&amp;', '<': '&lt;', '>': '&gt;', '"': '&quot;', "'": '&#39;' };

/** Text content and attribute values alike: quotes are escaped too, so one function serves both. */
export function escapeHtml(text: string): string {
  return text.replace(/[&<>"']/g, (c) => HTML_ESCAPES[c]!);
}

/** A number for an SVG coordinate or size: finite, short, never exponent notation. */
export function num(value: number, decimals = 2): string {
  if (!Number.isFinite(value)) return '0';
  const r = Number(value.toFixed(decimals));
  return Object.is(r, -0) ? '0' : String(r);
}
