/**
 * Messages between the extension and the report panel's page script, declared once. The page only
 * receives: it never asks the extension to do anything, so there is nothing to allow-list.
 */

/** Extension → page: replace the sheet with a new rendering (same document: keep the scroll position). */
export interface SheetUpdate {
  type: 'update';
  /** Opaque key of the document shown (its URI), for the per-document scroll memory. */
  documentKey: string;
  title: string;
  /** HTML of the title block and of the sheet body, rendered and escaped by the extension. */
  header: string;
  body: string;
}

export type ToSheetPage = SheetUpdate;

/** What the page keeps with getState/setState: the document shown and a scroll position per document. */
export interface SheetPageState {
  document?: string;
  scroll: Record<string, number>;
}

/** Scroll positions remembered for at most this many documents. */
export const MAX_REMEMBERED_SCROLLS = 50;

export function isSheetUpdate(m: unknown): m is SheetUpdate {
  if (!m || typeof m !== 'object') return false;
  const o = m as Record<string, unknown>;
  return o.type === 'update' && typeof o.documentKey === 'string' && typeof o.title === 'string' && typeof o.header === 'string' && typeof o.body === 'string';
}

/** Reads state saved by an earlier page of the panel, dropping anything malformed. */
export function readPageState(raw: unknown): SheetPageState {
  const state: SheetPageState = { scroll: {} };
  if (!raw || typeof raw !== 'object') return state;
  const o = raw as Record<string, unknown>;
  if (typeof o.document === 'string') state.document = o.document;
  if (o.scroll && typeof o.scroll === 'object') {
    for (const [k, v] of Object.entries(o.scroll as Record<string, unknown>)) {
      if (typeof v === 'number' && Number.isFinite(v) && v >= 0) state.scroll[k] = v;
    }
  }
  return state;
}
