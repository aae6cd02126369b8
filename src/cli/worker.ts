/**
 * Worker thread of the note pool (bundled to dist/worker.js): receives { id, task }, answers
 * { id, outcome }. An unexpected exception becomes an unreadable-file outcome rather than a dead
 * worker, so one bad note never stops the others.
 */
import { parentPort } from 'node:worker_threads';
import { type NoteOutcome, type NoteTask, runNoteTask } from './note-task';

parentPort?.on('message', (m: { id: number; task: NoteTask }) => {
  let outcome: NoteOutcome;
  try {
    outcome = runNoteTask(m.task);
  } catch (e) {
    const readError = `internal error: ${e instanceof Error ? e.message : String(e)}`;
    outcome = { path: m.task.path, file: { path: m.task.path, blocks: [], error: 'unreadable' }, unitSystem: 'SI', stale: [], readError };
  }
  parentPort!.postMessage({ id: m.id, outcome });
});
