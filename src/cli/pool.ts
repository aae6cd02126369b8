/**
 * Evaluates many notes on worker threads, one pool sized to the machine's cores (the main thread
 * counts as one of them), and returns the outcomes in the order of the tasks, so output never
 * depends on which thread finished first.
 * A handful of notes run on the main thread (starting workers costs more than it saves). The
 * worker is dist/worker.js, bundled beside dist/cli.js; when it is absent (running from sources
 * in tests) everything runs on the main thread. TAULINE_JOBS=N sets the number of threads
 * (1 = main thread only).
 */
import { existsSync } from 'node:fs';
import { availableParallelism } from 'node:os';
import { join } from 'node:path';
import { Worker } from 'node:worker_threads';
import { type NoteOutcome, type NoteTask, runNoteTask } from './note-task';

/** Below this many notes everything runs on the main thread. */
export const POOL_THRESHOLD = 8;

export interface PoolOptions {
  /** Threads to use; defaults to TAULINE_JOBS, else the number of cores. */
  jobs?: number;
  /** The bundled worker script; defaults to worker.js beside the running cli.js. */
  workerPath?: string;
}

export function defaultJobs(): number {
  const fromEnv = Number.parseInt(process.env.TAULINE_JOBS ?? '', 10);
  if (Number.isFinite(fromEnv) && fromEnv >= 1) return Math.min(fromEnv, 64);
  return Math.max(1, availableParallelism());
}

function defaultWorkerPath(): string | undefined {
  const here = typeof __dirname === 'string' ? __dirname : undefined;
  if (!here) return undefined;
  const p = join(here, 'worker.js');
  // Only the bundle beside dist/cli.js is a worker; running from sources (tests) stays on one thread.
  return existsSync(p) ? p : undefined;
}

export async function runNoteTasks(tasks: readonly NoteTask[], options: PoolOptions = {}): Promise<NoteOutcome[]> {
  const jobs = Math.min(options.jobs ?? defaultJobs(), tasks.length);
  const workerPath = options.workerPath ?? defaultWorkerPath();
  if (jobs <= 1 || tasks.length <= POOL_THRESHOLD || !workerPath) return tasks.map(runNoteTask);

  const outcomes = new Array<NoteOutcome | undefined>(tasks.length);
  let next = 0;
  const runOne = (worker: Worker) =>
    new Promise<void>((resolve) => {
      const inFlight = new Set<number>();
      let done = false;
      const finish = () => {
        if (done) return;
        done = true;
        resolve();
      };
      const feed = () => {
        // Two batches in flight per worker hide the message round trip; batches shrink towards
        // the end of the queue so the threads finish together.
        while (inFlight.size < 2 && next < tasks.length) {
          const size = Math.max(1, Math.min(16, Math.floor((tasks.length - next) / (jobs * 8))));
          const ids: number[] = [];
          for (let k = 0; k < size && next < tasks.length; k++) ids.push(next++);
          inFlight.add(ids[0]!);
          worker.postMessage({ ids, tasks: ids.map((id) => tasks[id]) });
        }
        if (inFlight.size === 0) finish();
      };
      worker.on('message', (m: { ids: number[]; outcomes: NoteOutcome[] }) => {
        m.ids.forEach((id, k) => (outcomes[id] = m.outcomes[k]));
        inFlight.delete(m.ids[0]!);
        feed();
      });
      // A worker that dies leaves its notes to the main thread; the output stays complete.
      const fail = () => finish();
      worker.on('error', fail);
      worker.on('exit', fail);
      feed();
    });
  // The main thread is one of the `jobs` threads: it takes notes from the same queue while the
  // workers start up and run, yielding between notes so their messages are handled.
  const mainThread = async () => {
    while (next < tasks.length) {
      const id = next++;
      outcomes[id] = runNoteTask(tasks[id]!);
      await new Promise<void>((r) => setImmediate(r));
    }
  };
  const workers = Array.from({ length: jobs - 1 }, () => new Worker(workerPath));
  try {
    await Promise.all([...workers.map(runOne), mainThread()]);
  } finally {
    await Promise.all(workers.map((w) => w.terminate()));
  }
  for (let i = 0; i < tasks.length; i++) if (!outcomes[i]) outcomes[i] = runNoteTask(tasks[i]!);
  return outcomes as NoteOutcome[];
}
