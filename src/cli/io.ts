/** What every command gets from the entry point: the working folder and the two output streams. */
export interface CommandIO {
  cwd: string;
  out: (s: string) => void;
  err: (s: string) => void;
}
