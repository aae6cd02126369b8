/**
 * The report panel's page script (bundled to dist/webview.js, loaded by nonce). It does two things
 * only: remember the scroll position per document with getState/setState, and swap in a new
 * rendering when the extension posts one. It never runs anything from the note and never posts to
 * the extension; the VS Code API object stays inside this closure.
 */
import { isSheetUpdate, MAX_REMEMBERED_SCROLLS, readPageState, type SheetPageState } from './messages';

interface WebviewApi {
  getState(): unknown;
  setState(state: unknown): void;
}
declare function acquireVsCodeApi(): WebviewApi;

// The project type-checks without the DOM library (the core must not see it); this page needs only these.
interface PageElement {
  innerHTML: string;
}
interface MessageEvent {
  data: unknown;
}
declare const window: {
  scrollY: number;
  history: { scrollRestoration: string };
  scrollTo(x: number, y: number): void;
  addEventListener(type: 'scroll', listener: () => void, options?: { passive: boolean }): void;
  addEventListener(type: 'message', listener: (event: MessageEvent) => void): void;
  addEventListener(type: 'load', listener: () => void): void;
};
declare const document: {
  title: string;
  body: { dataset: Record<string, string | undefined> };
  querySelector(selector: string): PageElement | null;
};
declare function requestAnimationFrame(callback: () => void): number;

(() => {
  const api = acquireVsCodeApi();
  let state: SheetPageState = readPageState(api.getState());
  const current = () => document.body.dataset.document ?? '';

  const save = () => {
    const key = current();
    delete state.scroll[key];
    state.scroll[key] = Math.round(window.scrollY);
    const keys = Object.keys(state.scroll);
    for (const k of keys.slice(0, Math.max(0, keys.length - MAX_REMEMBERED_SCROLLS))) delete state.scroll[k];
    state.document = key;
    api.setState(state);
  };
  const restore = () => {
    const y = state.scroll[current()];
    window.scrollTo(0, typeof y === 'number' ? y : 0);
  };

  // The position is ours to restore; and again once fonts and styles have settled the layout.
  window.history.scrollRestoration = 'manual';
  restore();
  // Until the page has loaded, scroll events are our own restoring against a layout still growing: not saved.
  let settled = false;
  window.addEventListener('load', () => {
    restore();
    settled = true;
    save();
  });
  let queued = false;
  window.addEventListener(
    'scroll',
    () => {
      if (queued || !settled) return;
      queued = true;
      requestAnimationFrame(() => {
        queued = false;
        save();
      });
    },
    { passive: true },
  );

  window.addEventListener('message', (event: MessageEvent) => {
    const m: unknown = event.data;
    if (!isSheetUpdate(m)) return;
    const switching = m.documentKey !== current();
    const y = window.scrollY;
    if (switching) save();
    const header = document.querySelector('.tl-sheet-head');
    const main = document.querySelector('.tl-sheet');
    if (!header || !main) return;
    header.innerHTML = m.header;
    main.innerHTML = m.body;
    document.title = m.title;
    document.body.dataset.document = m.documentKey;
    if (switching) restore();
    else window.scrollTo(0, y);
    save();
  });
})();
