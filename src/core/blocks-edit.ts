import type { Block, BlockLine } from './blocks';

/**
 * The blocks of `text` derived from the blocks of `previous` without re-parsing, when the edit
 * between them stays inside the content of one top-level fenced block and cannot change Markdown
 * structure (no backtick, tilde or carriage return in the changed text). Returns undefined when
 * that cannot be shown, and the caller parses the whole note. Keystrokes inside a block, the common
 * case in an editor, then cost a string comparison instead of a Markdown parse.
 */
export function extractBlocksAfterEdit(previousText: string, previous: Block[], text: string): Block[] | undefined {
  if (previousText === text) return previous;
  if (text.charCodeAt(0) === 0xfeff || previousText.charCodeAt(0) === 0xfeff) return undefined;
  // Line numbers here count \n only; markdown-it also ends a line at a lone \r (anywhere in the note).
  if (text.includes('\r') || previousText.includes('\r')) return undefined;
  let start = 0;
  const limit = Math.min(previousText.length, text.length);
  while (start < limit && previousText.charCodeAt(start) === text.charCodeAt(start)) start++;
  let endOld = previousText.length;
  let endNew = text.length;
  while (endOld > start && endNew > start && previousText.charCodeAt(endOld - 1) === text.charCodeAt(endNew - 1)) {
    endOld--;
    endNew--;
  }
  const removed = previousText.slice(start, endOld);
  const added = text.slice(start, endNew);
  // Whole lines around the change, before and after: splitting or joining lines can turn content
  // such as "```shear" into a fence, so no touched line may hold a fence character.
  // Whole lines replaced at a line start (the common "new line before the closing fence") touch
  // no line after them; any other edit touches the lines from the first to the last changed one.
  const wholeLines = (start === 0 || previousText.charCodeAt(start - 1) === 10) && (removed === '' || removed.endsWith('\n')) && (added === '' || added.endsWith('\n'));
  const from = previousText.lastIndexOf('\n', start - 1) + 1;
  const toOld = wholeLines ? endOld : lineEndAt(previousText, endOld);
  const toNew = wholeLines ? endNew : lineEndAt(text, endNew);
  if (/[`~\r]/.test(previousText.slice(from, toOld)) || /[`~\r]/.test(text.slice(from, toNew))) return undefined;
  // Lines touched by the edit, in the old text.
  const firstLine = countNewlines(previousText, 0, start);
  const lastLine = firstLine + countNewlines(removed, 0, removed.length);
  const lastTouched = wholeLines ? lastLine - 1 : lastLine;
  const block = previous.find((b) => b.fenceLine < firstLine && firstLine <= b.endLine && lastTouched < b.endLine);
  if (!block || !block.closed || block.lines.some((l) => l.column !== 0) || !/^(`{3,}|~{3,})/.test(text.slice(lineStart(text, block.fenceLine)))) return undefined;
  const delta = countNewlines(added, 0, added.length) - (lastLine - firstLine);
  const lines = text.split('\n');
  const content: BlockLine[] = [];
  for (let line = block.fenceLine + 1; line < block.endLine + delta; line++) content.push({ line, column: 0, text: lines[line] ?? '' });
  // markdown-it reads NUL as U+FFFD; leave such a block to the full parse, so both paths agree.
  if (content.some((l) => l.text.includes('\0'))) return undefined;
  const edited: Block = { ...block, endLine: block.endLine + delta, lines: content, source: content.map((l) => l.text).join('\n') };
  return previous.map((b) => {
    if (b === block) return edited;
    if (b.fenceLine < block.fenceLine || delta === 0) return b;
    return { ...b, fenceLine: b.fenceLine + delta, endLine: b.endLine + delta, lines: b.lines.map((l) => ({ ...l, line: l.line + delta })) };
  });
}

function lineEndAt(s: string, at: number): number {
  const i = s.indexOf('\n', at);
  return i < 0 ? s.length : i;
}

function countNewlines(s: string, from: number, to: number): number {
  let n = 0;
  for (let i = from; i < to; i++) if (s.charCodeAt(i) === 10) n++;
  return n;
}

function lineStart(s: string, line: number): number {
  let at = 0;
  for (let i = 0; i < line; i++) {
    const next = s.indexOf('\n', at);
    if (next < 0) return s.length;
    at = next + 1;
  }
  return at;
}
