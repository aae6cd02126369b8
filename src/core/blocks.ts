/**
 * Finds the `shear` blocks of a Markdown note with markdown-it's own CommonMark block parser, so
 * ``` and ~~~ fences, indented fences, fences in lists and block quotes, and unclosed fences behave
 * exactly as a Markdown user expects. Each content line keeps its Markdown line number and the
 * column where its text starts, so diagnostics land on the right characters.
 */
import MarkdownIt from 'markdown-it';

export const BLOCK_LANGUAGE = 'shear';

export interface BlockLine {
  /** 0-based line of the Markdown file. */
  line: number;
  /** Column in the Markdown line where `text` starts (after list or quote markers and fence indentation). */
  column: number;
  text: string;
}

export interface Block {
  /** Position among the note's `shear` blocks, from 0. */
  index: number;
  /** 0-based line of the opening fence. */
  fenceLine: number;
  /** 0-based line of the closing fence, or the last line of the file when the fence is never closed. */
  endLine: number;
  closed: boolean;
  /** The title written after the info string, e.g. "Girder G2" in "```shear Girder G2". */
  title: string;
  lines: BlockLine[];
  /** The block's content as written, for caching. */
  source: string;
}

// Only block structure matters here: inline parsing of the prose is switched off, which makes
// finding the blocks several times cheaper than rendering the note.
const parser = new MarkdownIt('commonmark');
parser.core.ruler.disable(['inline', 'text_join']);

/** Splits text into lines the way markdown-it counts them (\n, \r\n and lone \r all end a line). */
export function splitLines(text: string): string[] {
  return text.split(/\r\n|\r|\n/);
}

export function extractBlocks(text: string): Block[] {
  const src = text.charCodeAt(0) === 0xfeff ? text.slice(1) : text;
  const tokens = parser.parse(src, {});
  const mdLines = splitLines(src);
  const blocks: Block[] = [];
  for (const tok of tokens) {
    if (tok.type !== 'fence' || !tok.map) continue;
    const info = tok.info.trim();
    const m = /^(\S+)(?:\s+(.*))?$/.exec(info);
    if (!m || m[1]!.toLowerCase() !== BLOCK_LANGUAGE) continue;
    const [startLine, endLineExclusive] = tok.map;
    const content = tok.content.endsWith('\n') ? tok.content.slice(0, -1) : tok.content;
    const contentLines = content.length === 0 && tok.content.length === 0 ? [] : content.split('\n');
    const lines: BlockLine[] = contentLines.map((t, i) => {
      const line = startLine + 1 + i;
      const raw = mdLines[line] ?? '';
      const column = raw.endsWith(t) ? raw.length - t.length : Math.max(0, raw.indexOf(t));
      return { line, column, text: t };
    });
    const lastContent = startLine + contentLines.length;
    const closed = endLineExclusive - 1 > lastContent;
    blocks.push({
      index: blocks.length,
      fenceLine: startLine,
      endLine: endLineExclusive - 1,
      closed,
      title: (m[2] ?? '').trim(),
      lines,
      source: content,
    });
  }
  return blocks;
}
