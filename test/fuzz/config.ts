/**
 * How hard the fuzz suites push. The default test run is a fixed-seed slice, so a failure there is
 * reproducible on any machine. The long run (`npm run fuzz`, or TAULINE_FUZZ_RUNS /
 * TAULINE_FUZZ_SECONDS set) takes a fresh seed unless TAULINE_FUZZ_SEED pins one, raises the number
 * of runs, and stops each property at its time limit, whichever comes first.
 *
 *   TAULINE_FUZZ_RUNS=N       runs per property (long run default: 1,000,000, i.e. bounded by time)
 *   TAULINE_FUZZ_SECONDS=S    seconds per property (long run default: 30)
 *   TAULINE_FUZZ_SEED=N       seed (slice default: 20261; long run: a fresh one, printed)
 *   TAULINE_FUZZ_PATH=P       with the seed, replays the failing case fast-check reported (run one test with -t)
 *
 * fast-check prints the seed and the path of a failing case; set TAULINE_FUZZ_SEED to that seed
 * (and the slice size or runs) to replay it.
 */
import type { Parameters } from 'fast-check';

const env = process.env;
const asNumber = (v: string | undefined): number | undefined => {
  if (v === undefined || v.trim() === '') return undefined;
  const n = Number(v);
  return Number.isFinite(n) && n > 0 ? n : undefined;
};

const runsFromEnv = asNumber(env.TAULINE_FUZZ_RUNS);
const secondsFromEnv = asNumber(env.TAULINE_FUZZ_SECONDS);

/** True for `npm run fuzz` and whenever a run count or time is given. */
export const LONG_RUN = env.npm_lifecycle_event === 'fuzz' || runsFromEnv !== undefined || secondsFromEnv !== undefined;

const seedFromEnv = env.TAULINE_FUZZ_SEED !== undefined && env.TAULINE_FUZZ_SEED.trim() !== '' ? Number(env.TAULINE_FUZZ_SEED) | 0 : undefined;
export const SEED = seedFromEnv ?? (LONG_RUN ? (Date.now() ^ (process.pid << 8)) | 0 : 20261);

const SECONDS = secondsFromEnv ?? 30;
const RUNS = runsFromEnv ?? 1_000_000;

/** Milliseconds one property may run in the long run. */
export const PROPERTY_TIME_MS = LONG_RUN ? SECONDS * 1000 : Infinity;

/** A vitest timeout that leaves the property its time plus room for the slowest single case. */
export function testTimeout(sliceMs = 60_000): number {
  return LONG_RUN ? SECONDS * 1000 + 120_000 : sliceMs;
}

/** TAULINE_FUZZ_PATH replays one failing case (with its seed): fast-check prints both. */
const PATH = env.TAULINE_FUZZ_PATH?.trim() || undefined;

/** fast-check parameters: `sliceRuns` in the default test run, the long-run budget otherwise. */
export function fuzzParameters<T>(sliceRuns: number, extra: Parameters<T> = {}): Parameters<T> {
  const replay: Parameters<T> = PATH ? { path: PATH, endOnFailure: true } : {};
  if (!LONG_RUN) return { numRuns: sliceRuns, seed: SEED, ...replay, ...extra };
  return { numRuns: RUNS, seed: SEED, interruptAfterTimeLimit: PROPERTY_TIME_MS, markInterruptAsFailure: false, ...replay, ...extra };
}

/**
 * A call that has not returned after this long is a hang, not a slow case: the fuzz inputs are a
 * few kilobytes and every block has a time budget far below it. (This is a liveness guard, not a
 * speed target; speed is measured in bench/.)
 */
export const HANG_MS = 20_000;

if (LONG_RUN) {
  // One line per worker, so a long run's log always says how to replay it.
  console.log(`tauline fuzz: long run, seed ${SEED}, ${RUNS} runs or ${SECONDS} s per property`);
}
