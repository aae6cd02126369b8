/**
 * Replacing a note on disk so that a crash at any moment leaves either the old file or the new one,
 * never a mix: the new bytes go to a temporary file in the same folder (same file system, so the
 * rename is atomic), are flushed with fsync, and the temporary file is renamed over the note; the
 * folder is then flushed so the rename itself survives a power cut. The note keeps its permission
 * bits (and owner, where the process may set it). A symbolic link is followed, so the link stays
 * a link and its target gets the new content.
 *
 * Refusals (each an AtomicWriteError with a plain message, the note untouched):
 * - the note is read-only (no write bit set; checked on the bits, so it holds for root too);
 * - the note vanished, or its content is no longer what the caller read (someone edited it).
 */
import { closeSync, constants, fchmodSync, fchownSync, fsyncSync, openSync, readFileSync, realpathSync, renameSync, statSync, unlinkSync, writeSync, accessSync } from 'node:fs';
import { basename, dirname, join } from 'node:path';
import { randomBytes } from 'node:crypto';
import { describeFsError } from './note-task';

export class AtomicWriteError extends Error {}

export interface AtomicWriteOptions {
  /** The content the caller read; the write is refused when the file holds anything else now. */
  expected?: string;
}

/** Test hook: milliseconds to wait between the flushed temporary file and the rename, so a test can kill the process there. */
const PAUSE_ENV = 'TAULINE_TEST_PAUSE_BEFORE_RENAME_MS';

export function writeFileAtomic(path: string, content: string, options: AtomicWriteOptions = {}): void {
  let target: string;
  try {
    target = realpathSync(path);
  } catch (e) {
    throw new AtomicWriteError(describeFsError(e));
  }
  let st;
  try {
    st = statSync(target);
  } catch (e) {
    throw new AtomicWriteError(describeFsError(e));
  }
  if (!st.isFile()) throw new AtomicWriteError('not a regular file');
  if ((st.mode & 0o222) === 0) throw new AtomicWriteError('the file is read-only; make it writable (chmod u+w) to stamp it');
  try {
    accessSync(target, constants.W_OK);
  } catch (e) {
    throw new AtomicWriteError(describeFsError(e));
  }
  if (options.expected !== undefined) {
    let now: string;
    try {
      now = readFileSync(target, 'utf8');
    } catch (e) {
      throw new AtomicWriteError(describeFsError(e));
    }
    if (now !== options.expected) throw new AtomicWriteError('the file changed while it was being stamped; run tauline stamp again');
  }

  const dir = dirname(target);
  const temp = join(dir, `.${basename(target)}.tauline-${process.pid}-${randomBytes(4).toString('hex')}.tmp`);
  let fd: number | undefined;
  try {
    fd = openSync(temp, 'wx', st.mode & 0o777);
    fchmodSync(fd, st.mode & 0o7777);
    if (typeof process.getuid === 'function' && process.getuid() === 0) {
      try {
        fchownSync(fd, st.uid, st.gid);
      } catch {
        // keeping the owner is best effort
      }
    }
    const bytes = Buffer.from(content, 'utf8');
    for (let off = 0; off < bytes.length; ) off += writeSync(fd, bytes, off, bytes.length - off);
    fsyncSync(fd);
    closeSync(fd);
    fd = undefined;
    pauseForTests();
    try {
      statSync(target);
    } catch {
      throw new AtomicWriteError('no such file (it was moved or deleted while being stamped)');
    }
    renameSync(temp, target);
  } catch (e) {
    if (fd !== undefined) {
      try {
        closeSync(fd);
      } catch {
        // already closed
      }
    }
    try {
      unlinkSync(temp);
    } catch {
      // the temporary file may not exist
    }
    if (e instanceof AtomicWriteError) throw e;
    throw new AtomicWriteError(`cannot write in ${dir}: ${describeFsError(e)}`);
  }
  flushFolder(dir);
}

function flushFolder(dir: string): void {
  let fd: number | undefined;
  try {
    fd = openSync(dir, 'r');
    fsyncSync(fd);
  } catch {
    // Some platforms cannot open or flush a folder; the rename is still atomic there.
  } finally {
    if (fd !== undefined) closeSync(fd);
  }
}

function pauseForTests(): void {
  const ms = Number(process.env[PAUSE_ENV] ?? '');
  if (!Number.isFinite(ms) || ms <= 0) return;
  Atomics.wait(new Int32Array(new SharedArrayBuffer(4)), 0, 0, Math.min(ms, 60_000));
}
