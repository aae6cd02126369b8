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
  /**
   * Set when the fence sits in Markdown nested deeper than MAX_NESTING levels (lists, quotes):
   * markdown-it stops reading there, so the block's content is unknown and it must be reported,
   * never silently left out of a check.
   */
  nestedTooDeep?: true;
}

/**
 * Container nesting markdown-it reads (its default preset's limit, as in VS Code's preview). Deeper
 * nesting is where its recursive parser would run out of stack (about 3,000 levels of lists), and
 * reading it costs time quadratic in the depth.
 */
export const MAX_NESTING = 100;

// Only block structure matters here: inline parsing of the prose is switched off, which makes
// finding the blocks several times cheaper than rendering the note.
const parser = new MarkdownIt('commonmark');
parser.core.ruler.disable(['inline', 'text_join']);
// markdown-it reads this option at parse time; its typings do not list it.
(parser.options as { maxNesting?: number }).maxNesting = MAX_NESTING;

/** A line that opens a `shear` fence, behind any quote or list markers. */
const FENCE_OPENER = /^(?:[ \t]*(?:>|[-+*]|\d{1,9}[.)])(?=[ \t]|$))*[ \t]*(?:`{3,}|~{3,})[ \t]*shear(?:[ \t]|$)/i;
const LEAF_TOKENS = new Set(['fence', 'code_block', 'html_block', 'paragraph_open', 'heading_open', 'hr']);

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
  return withHiddenFences(blocks, tokens, mdLines);
}

/**
 * markdown-it stops reading a container nested past maxNesting and skips the rest of it, which can be
 * the rest of the file. A `shear` fence in lines no leaf token covers was skipped that way: it comes
 * back as a block with no content, marked, so the parser reports it on its fence line.
 */
function withHiddenFences(blocks: Block[], tokens: ReturnType<typeof parser.parse>, mdLines: string[]): Block[] {
  const covered = new Uint8Array(mdLines.length);
  for (const t of tokens) {
    if (!t.map || !LEAF_TOKENS.has(t.type)) continue;
    covered.fill(1, t.map[0], Math.min(t.map[1], mdLines.length));
  }
  let hidden: Block[] | undefined;
  for (let i = 0; i < mdLines.length; i++) {
    if (covered[i] || !FENCE_OPENER.test(mdLines[i]!)) continue;
    const title = /shear(?:[ \t]+(.*))?$/i.exec(mdLines[i]!)?.[1]?.trim() ?? '';
    // The source can never equal a readable block's content, so the cache never mistakes one for the other.
    (hidden ??= []).push({ index: 0, fenceLine: i, endLine: i, closed: false, title, lines: [], source: `\u0000${mdLines[i]}`, nestedTooDeep: true });
  }
  if (!hidden) return blocks;
  return [...blocks, ...hidden].sort((a, b) => a.fenceLine - b.fenceLine).map((b, index) => ({ ...b, index }));
}
