// The worker processes of a parallel sweep ("lanes", one worker each) and their early start.
//
// The workers are tinypool's child processes started with V8's --single-threaded, not worker
// threads. Every V8 process runs garbage collection and optimising compilation on background
// threads; worker threads share one process's, and on a 2-core machine those threads take the
// second core from the other worker (measurements in bench/README.md).
//
// A worker spends its first fifth of a second starting Node and loading the integrators. The CLI
// starts its lanes before it loads the sweep machinery itself (prestartLanes), and runSweep, when
// its caller started none, before it resolves and plans, so the loads overlap instead of
// following each other.
import { existsSync } from 'node:fs';
import { dirname, join } from 'node:path';
import { fileURLToPath } from 'node:url';
import Tinypool from 'tinypool';

/** Messages a lane keeps on its worker at once when no run timeout is set (see executeOnPool). */
export const LANE_DEPTH = 2;

/** The compiled worker: workers cannot load TypeScript, so tests running from src use dist. */
function workerFile(): string {
  const here = fileURLToPath(import.meta.url);
  if (here.endsWith('.js')) return join(dirname(here), 'worker.js');
  const built = join(dirname(here), '..', '..', 'dist', 'src', 'sweep', 'worker.js');
  if (!existsSync(built)) throw new Error(`parallel runs need the compiled worker at ${built}; run npm run build`);
  return built;
}

/**
 * A lane whose worker process stopped before it could run anything (a broken install, a worker
 * module that fails to load): tinypool starts no replacement then, and every task queued on the
 * lane would wait forever, so the sweep stops with this error instead.
 */
export class LaneStartError extends Error {}

/** A task that only proves its worker started; the worker answers it at once. */
export interface PingTask {
  kind: 'ping';
}

const starts = new WeakMap<Tinypool, Promise<void>>();

function startError(cause: unknown): LaneStartError {
  // A child process's error reaches the pool as a plain object with its message.
  const message = (cause as { message?: unknown } | null)?.message;
  const why = typeof message === 'string' ? message : String(cause);
  return new LaneStartError(`a worker process stopped before it could run anything (${why}); its own error output, if any, is above; --jobs 1 runs the sweep without workers`);
}

/** Resolves once the lane's worker has answered its first task; rejects with LaneStartError if it never will. */
export function laneStarted(pool: Tinypool): Promise<void> {
  return starts.get(pool) ?? Promise.resolve();
}

/**
 * One lane: a pool of exactly one single-threaded V8 child process (see the header), running the
 * sweep's worker module (tests pass another to see a worker that fails to start).
 */
export function createLane(filename = workerFile()): Tinypool {
  const pool = newPool(filename);
  // A worker that dies while no task is in flight makes tinypool emit 'error' on the pool; after
  // the first answer it has already started a replacement, so only a death before it matters (the
  // listener also keeps the event from ending the process). One that dies with the ping in flight
  // rejects the ping.
  const started = new Promise<void>((resolve, reject) => {
    pool.on('error', (e: unknown) => reject(startError(e)));
    pool.run({ kind: 'ping' } satisfies PingTask).then(
      () => resolve(),
      (e: unknown) => reject(startError(e)),
    );
  });
  // Observed by laneStarted's callers; a lane ended before anyone asked must not be unhandled.
  started.catch(() => {});
  starts.set(pool, started);
  return pool;
}

/**
 * The clocks of a timed sweep (clocks.ts): `count` worker processes of the lanes' kind, each
 * ended after one task and replaced by a fresh one, so every task runs in a process that has
 * run nothing before it.
 */
export function createClocks(count: number, filename = workerFile()): Tinypool {
  return newPool(filename, { isolate: true, workers: Math.max(1, count) });
}

function newPool(filename: string, clocks?: { isolate: true; workers: number }): Tinypool {
  return new Tinypool({
    filename,
    runtime: 'child_process',
    // tinypool starts its child processes with an empty environment unless given one; a worker
    // must see what this process sees (STEPGAUGE_CACHE, anything a user module reads, the PATH
    // an external program is started from), or --jobs 1 and --jobs 2 would differ.
    env: { ...process.env } as Record<string, string>,
    // A 4 MB young generation (V8's default grows to 16 MB per half): a worker's live data is a few
    // runs' buffers, and the smaller nursery keeps each worker near 60 MB resident instead of 90
    // with no measurable change in sweep time (bench/sweep.ts samples the whole process tree).
    // Feedback vectors from a function's first call: a worker compiles on the thread that runs
    // (a fifth of its time on the catalogue goes to V8's optimising compiler), and its many short
    // runs reach optimised code sooner; the catalogue's --jobs 2 sweep took 2-3% less time
    // (19 alternating pairs, bench/README.md). It changes when code is optimised, never a result.
    execArgv: ['--single-threaded', '--max-semi-space-size=4', '--no-lazy-feedback-allocation'],
    // Structured clone, as between threads: JSON would turn a NaN or infinite error into null.
    serialization: 'advanced',
    minThreads: clocks ? 0 : 1,
    maxThreads: clocks ? clocks.workers : 1,
    concurrentTasksPerWorker: clocks ? 1 : LANE_DEPTH,
    isolateWorkers: clocks !== undefined,
  });
}

/**
 * How many worker lanes a sweep with these settings runs on; 0: it runs in the calling process.
 * A run timeout needs workers even for one job (only a worker can be ended mid-run).
 */
export function workerLaneCount(settings: { jobs?: number; runTimeoutSeconds?: number }): number {
  const jobs = Math.max(1, settings.jobs ?? 1);
  return jobs > 1 || settings.runTimeoutSeconds ? jobs : 0;
}

/**
 * Lanes started ahead of a sweep. The sweep takes what it needs and owns those from then on
 * (it ends them); `release` ends the ones never taken, e.g. when the input turned out bad.
 */
export interface PrestartedLanes {
  take(): Tinypool | undefined;
  release(): Promise<void>;
}

/** Starts `count` lanes now; each begins loading the worker module at once. */
export function prestartLanes(count: number): PrestartedLanes {
  const waiting = Array.from({ length: Math.max(0, count) }, () => createLane());
  return {
    take: () => waiting.shift(),
    release: async () => {
      const left = waiting.splice(0);
      await Promise.all(left.map((lane) => lane.destroy()));
    },
  };
}
