/**
 * Worker thread of the note pool (bundled to dist/worker.js): receives a batch { ids, tasks },
 * answers { ids, outcomes } in the same order. An unexpected exception becomes an unreadable-file
 * outcome rather than a dead worker, so one bad note never stops the others.
 */
import { parentPort } from 'node:worker_threads';
import { type NoteOutcome, type NoteTask, runNoteTask } from './note-task';

parentPort?.on('message', (m: { ids: number[]; tasks: NoteTask[] }) => {
  const outcomes = m.tasks.map((task): NoteOutcome => {
    try {
      return runNoteTask(task);
    } catch (e) {
      const readError = `internal error: ${e instanceof Error ? e.message : String(e)}`;
      return { path: task.path, file: { path: task.path, blocks: [], error: 'unreadable' }, unitSystem: 'SI', stale: [], readError };
    }
  });
  parentPort!.postMessage({ ids: m.ids, outcomes });
});
