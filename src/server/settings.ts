/**
 * Settings the server reads. The VS Code extension sends them as initializationOptions and again
 * with workspace/didChangeConfiguration ({ tauline: {...} }); any other LSP client may send the same
 * shape, or nothing and get the defaults.
 */

export type ThemeKind = 'light' | 'dark' | 'highContrast' | 'highContrastLight' | 'unknown';

export interface ServerSettings {
  unitSystem: 'auto' | 'SI' | 'US';
  significantFigures: number;
  /** Results at line ends (inlay hints). */
  inlineResults: boolean;
  /** False in an untrusted workspace when the user has turned evaluation off: parse diagnostics only. */
  evaluate: boolean;
  /** Milliseconds between the last keystroke and re-evaluation. */
  diagnosticsDelayMs: number;
  /** Colours of the hover pictures are baked in for this theme kind (an <img> cannot read theme variables). */
  themeKind: ThemeKind;
}

export const DEFAULT_SETTINGS: ServerSettings = {
  unitSystem: 'auto',
  significantFigures: 3,
  inlineResults: true,
  evaluate: true,
  diagnosticsDelayMs: 150,
  themeKind: 'unknown',
};

/** Reads a loose settings object (client input: anything may be missing or of the wrong type). */
export function mergeSettings(base: ServerSettings, raw: unknown): ServerSettings {
  if (!raw || typeof raw !== 'object') return base;
  const r = raw as Record<string, unknown>;
  const out: ServerSettings = { ...base };
  if (r.unitSystem === 'auto' || r.unitSystem === 'SI' || r.unitSystem === 'US') out.unitSystem = r.unitSystem;
  if (typeof r.significantFigures === 'number' && Number.isFinite(r.significantFigures)) {
    out.significantFigures = Math.min(10, Math.max(1, Math.round(r.significantFigures)));
  }
  const inline = r.inlineResults;
  if (typeof inline === 'boolean') out.inlineResults = inline;
  else if (inline && typeof inline === 'object' && typeof (inline as { enabled?: unknown }).enabled === 'boolean') out.inlineResults = (inline as { enabled: boolean }).enabled;
  if (typeof r.evaluate === 'boolean') out.evaluate = r.evaluate;
  if (typeof r.diagnosticsDelayMs === 'number' && Number.isFinite(r.diagnosticsDelayMs)) out.diagnosticsDelayMs = Math.min(5000, Math.max(0, r.diagnosticsDelayMs));
  if (r.themeKind === 'light' || r.themeKind === 'dark' || r.themeKind === 'highContrast' || r.themeKind === 'highContrastLight') out.themeKind = r.themeKind;
  return out;
}
