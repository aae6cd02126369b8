/**
 * Errors are data. Every problem a note can have is a Diagnostic with a stable code, a place in the
 * Markdown file and a message in an engineer's words. Lines and columns are 0-based here; the
 * command line's JSON contract adds one.
 */
export type Severity = 'error' | 'warning' | 'info';

export interface Diagnostic {
  /** Stable identifier, e.g. `unit.mismatch`, `section.zero-area`, `check.fails`. */
  code: string;
  severity: Severity;
  message: string;
  /** 0-based line of the Markdown file. */
  line: number;
  /** 0-based column where the problem starts, and where it ends (exclusive). */
  column: number;
  endColumn: number;
}

/** A range inside one line of a block, in columns of the Markdown file. */
export interface Span {
  line: number;
  start: number;
  end: number;
}

export class NoteError extends Error {
  constructor(
    readonly code: string,
    message: string,
    readonly span?: Span,
  ) {
    super(message);
  }
}
