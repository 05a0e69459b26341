// Parallel execution on tinypool workers, one worker per lane; the dealer (dealer.ts) decides
// which lane runs what. Without a run timeout short runs travel several to a message (see
// BATCH_MAX_RUNS). With a run timeout a worker holds one run at a time, one run to a message, so
// a run's timeout clock starts when it really starts; a run past its timeout has its worker
// terminated and replaced, the run is recorded with status `timeout` and the sweep goes on.
//
// The workers are single-threaded child processes (lanes.ts says why). What each of these choices
// bought on the catalogue sweep is in bench/README.md ("History kept out of the code").
import type Tinypool from 'tinypool';
import type { Problem } from '../core/types.js';
import type { RunResult } from '../results/contract.js';
import { messageOf } from '../core/errors.js';
import { failedRun } from '../measure/run-one.js';
import type { PlannedRun } from './plan.js';
import type { SweepOptions } from './execute.js';
import type { BatchAnswer, BatchTask, CertifyTask, StiffnessTask, WorkerTask } from './worker.js';
import { RunDealer } from './dealer.js';
import { createLane, LANE_DEPTH, laneStarted, type PrestartedLanes } from './lanes.js';

/** Extra seconds a worker gets past the solver's own deadline before it is terminated. */
const TERMINATE_GRACE_SECONDS = 2;

/**
 * Without a run timeout a message carries up to BATCH_MAX_RUNS runs, and its worker starts no
 * further run of it once BATCH_BUDGET_MS have passed, answering the rest as not started: a long
 * run still goes about alone, a short one travels with its neighbours. Each message costs the
 * two processes about 1 ms of CPU time on the cores the runs need, against a median catalogue
 * run of a few milliseconds (bench/README.md); the budget keeps the last messages of a sweep
 * short, so no lane waits long for another at the end.
 */
const BATCH_MAX_RUNS = 8;
const BATCH_BUDGET_MS = 20;

/** A task's answer, or how it failed (timedOut: its limit passed and its worker was ended). */
type Outcome = { ok: true; value: unknown } | { ok: false; error: unknown; timedOut: boolean };

/**
 * One task on a pool, within limitMs (no limit when 0), counted from when the lane's worker has
 * started. A lane whose worker never starts throws LaneStartError, which ends the sweep.
 */
export async function runLimited(pool: Tinypool, task: unknown, limitMs: number): Promise<Outcome> {
  await laneStarted(pool);
  const controller = new AbortController();
  const timer = limitMs > 0 ? setTimeout(() => controller.abort(), limitMs) : undefined;
  try {
    // tinypool never queues a task that has an abort signal behind another on the same worker,
    // so the signal goes only with a limit (which is when a lane holds one run at a time).
    return { ok: true, value: await pool.run(task, timer ? { signal: controller.signal } : {}) };
  } catch (error) {
    return { ok: false, error, timedOut: controller.signal.aborted };
  } finally {
    if (timer) clearTimeout(timer);
  }
}

/** A one-worker pool for the duration of `use`. */
async function withWorker<T>(use: (pool: Tinypool) => Promise<T>): Promise<T> {
  const pool = createLane();
  try {
    return await use(pool);
  } finally {
    await pool.destroy();
  }
}

export interface PoolInput {
  runs: readonly PlannedRun[];
  jobs: number;
  problems: Pick<ReadonlyMap<string, Problem>, 'get'>;
  problemEntries: ReadonlyMap<string, string>;
  methodEntries: ReadonlyMap<string, string>;
  options: SweepOptions;
  /** File entries whose reference was not certified in time, and why (see certifyOnPool). */
  uncertified?: ReadonlyMap<string, string>;
  /** Lanes already started (prestartLanes); those taken are ended here, like the ones made here. */
  lanes?: PrestartedLanes;
}

/**
 * Number arrays arrive from a worker (structured clone) holding one boxed number per element,
 * three times the memory of the flat double arrays a copy makes; a 10,000-run sweep keeps
 * megabytes of drift traces, so they are copied flat on arrival.
 */
function flattenNumberArrays(run: RunResult): RunResult {
  const flat = (a: number[]): number[] => a.map((v) => v);
  if (run.trace) {
    run.trace.t = flat(run.trace.t);
    for (const k of Object.keys(run.trace.drift)) run.trace.drift[k] = flat(run.trace.drift[k]!);
  }
  if (Array.isArray(run.yFinal)) run.yFinal = flat(run.yFinal);
  return run;
}

export async function executeOnPool(input: PoolInput): Promise<RunResult[]> {
  const { options } = input;
  const laneCount = Math.max(1, input.jobs);
  // One single-worker pool per lane, so a lane's runs stay on the worker that has warmed up.
  const pools = Array.from({ length: laneCount }, () => input.lanes?.take() ?? createLane());
  const out: RunResult[] = [];
  let failed = 0;
  // Callbacks stay here; workers get only the serialisable run options.
  const { onRun, shouldStop, keepRuns, ...taskOptions } = options;

  const workerTask = (planned: PlannedRun): WorkerTask => {
    const task: WorkerTask = {
      planned,
      problemEntry: input.problemEntries.get(planned.problem) ?? planned.problem,
      methodEntry: input.methodEntries.get(planned.method) ?? planned.method,
      options: taskOptions,
    };
    const uncertified = input.uncertified?.get(task.problemEntry);
    if (uncertified !== undefined) task.uncertified = uncertified;
    return task;
  };
  const failedAs = (planned: PlannedRun, message: string): RunResult => {
    const run = failedRun(input.problems.get(planned.problem)!, { id: planned.method }, planned.setting, message);
    run.planIndex = planned.planIndex;
    return run;
  };

  /**
   * Sends a batch in one message: the runs its worker did (failed ones included) and the runs it
   * did not start; `lost` when the worker failed under it (it answered nothing, not even an error).
   */
  const send = async (pool: Tinypool, batch: readonly PlannedRun[]): Promise<{ runs: RunResult[]; notStarted: PlannedRun[]; lost: boolean }> => {
    const limit = options.runTimeoutSeconds;
    // Timing repeats the solve, so the hard limit allows for the timing budget as well.
    const hard = limit ? (limit + (options.timing?.budgetSeconds ?? 0) * 2 + TERMINATE_GRACE_SECONDS) * 1000 : 0;
    const task: BatchTask = { kind: 'batch', runs: batch.map(workerTask), budgetMs: BATCH_BUDGET_MS };
    const outcome = await runLimited(pool, task, hard);
    if (outcome.ok) {
      const { results } = outcome.value as BatchAnswer;
      const runs = results.map((result, k) => ('thrown' in result ? failedAs(batch[k]!, result.thrown) : flattenNumberArrays(result)));
      return { runs, notStarted: batch.slice(results.length), lost: false };
    }
    const runs = batch.map((planned) => {
      const run = failedAs(planned, messageOf(outcome.error));
      if (outcome.timedOut) {
        run.status = 'timeout';
        run.message = `run exceeded --run-timeout ${limit} s and its worker was terminated`;
      }
      return run;
    });
    return { runs, notStarted: [], lost: !outcome.timedOut };
  };

  let done = 0;
  const record = (run: RunResult): void => {
    if (run.status !== 'ok') failed++;
    if (keepRuns !== false) out.push(run);
    onRun?.({ done: ++done, total: input.runs.length, failed, last: run });
  };

  const dealer = new RunDealer(input.runs, laneCount);
  // Without a run timeout a lane keeps a second message queued on its worker, which starts it
  // the moment the first is answered instead of a round trip later, and short runs travel
  // together (BATCH_MAX_RUNS). With a timeout one run at a time (see the header).
  const depth = options.runTimeoutSeconds ? 1 : LANE_DEPTH;
  const batchSize = options.runTimeoutSeconds ? 1 : BATCH_MAX_RUNS;
  // A worker that dies (a user module that exits or crashes the process) takes every run it
  // holds; with several held, the others did nothing wrong, so lost runs are run again, alone, at
  // the end, and only what fails alone is recorded as failed.
  const lost: PlannedRun[] = [];
  const feed = async (pool: Tinypool, laneIndex: number): Promise<void> => {
    for (let batch = dealer.take(laneIndex, batchSize); batch.length > 0; batch = dealer.take(laneIndex, batchSize)) {
      if (shouldStop?.()) return;
      const answer = await send(pool, batch);
      if (answer.lost && (depth > 1 || batch.length > 1)) lost.push(...batch);
      else answer.runs.forEach(record);
      dealer.giveBack(laneIndex, answer.notStarted);
    }
  };
  const lane = (pool: Tinypool, laneIndex: number): Promise<unknown> =>
    Promise.all(Array.from({ length: depth }, () => feed(pool, laneIndex)));
  try {
    await Promise.all(pools.map(lane));
    lost.sort((a, b) => a.planIndex - b.planIndex);
    for (const planned of lost) {
      if (shouldStop?.()) break;
      (await send(pools[0]!, [planned])).runs.forEach(record);
    }
  } finally {
    await Promise.all(pools.map((p) => p.destroy()));
  }
  return out.sort((a, b) => (a.planIndex ?? 0) - (b.planIndex ?? 0));
}

/**
 * Stiffness ratios of user problems computed on a worker under a time limit: the ratio calls the
 * model's f and Jacobian, and a model that never returns must not hang the sweep after its runs
 * were timed out. A ratio not computed in time is null.
 */
export async function stiffnessOnPool(
  entries: ReadonlyMap<string, string>,
  timeoutSeconds: number,
  uncertified?: ReadonlyMap<string, string>,
): Promise<Map<string, number | null>> {
  const out = new Map<string, number | null>();
  if (entries.size === 0) return out;
  const limitMs = (timeoutSeconds + TERMINATE_GRACE_SECONDS) * 1000;
  await withWorker(async (pool) => {
    for (const [id, entry] of entries) {
      const task: StiffnessTask = { kind: 'stiffness', problemEntry: entry, problemId: id };
      const why = uncertified?.get(entry);
      if (why !== undefined) task.uncertified = why;
      const outcome = await runLimited(pool, task, limitMs);
      out.set(id, outcome.ok ? (outcome.value as number | null) : null);
    }
  });
  return out;
}

/** A certification is two solves at a tight tolerance: it gets this many run timeouts. */
export const CERTIFY_TIMEOUT_RUNS = 4;

/**
 * Certify the references of problem files on a worker, each within CERTIFY_TIMEOUT_RUNS run
 * timeouts, before the main process loads them (which then reads the certificates from the
 * cache). Answers the entries left without a certificate (out of time, or certification
 * failed), with the reason to record. A file that fails to load is left for the main process,
 * which reports it as bad input.
 */
export async function certifyOnPool(entries: readonly string[], runTimeoutSeconds: number): Promise<Map<string, string>> {
  const out = new Map<string, string>();
  if (entries.length === 0) return out;
  const limit = CERTIFY_TIMEOUT_RUNS * runTimeoutSeconds;
  await withWorker(async (pool) => {
    for (const entry of entries) {
      const task: CertifyTask = { kind: 'certify', problemEntry: entry };
      const outcome = await runLimited(pool, task, (limit + TERMINATE_GRACE_SECONDS) * 1000);
      // A certification that failed quickly is not repeated in the main process either.
      if (outcome.ok && typeof outcome.value === 'string') out.set(entry, outcome.value);
      if (!outcome.ok && outcome.timedOut) {
        out.set(entry, `certifying a reference took longer than ${limit} s (${CERTIFY_TIMEOUT_RUNS} x --run-timeout) and was stopped`);
      }
    }
  });
  return out;
}
