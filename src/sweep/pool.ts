// Parallel execution on worker threads (tinypool), one run per task, at most `jobs` in flight so
// a run's timeout clock starts when it really starts. A run past its timeout has its worker
// terminated and replaced; the run is recorded with status `timeout` and the sweep goes on.
import { existsSync } from 'node:fs';
import { dirname, join } from 'node:path';
import { fileURLToPath } from 'node:url';
import Tinypool from 'tinypool';
import type { Problem } from '../core/types.js';
import type { RunResult } from '../core/results.js';
import { messageOf } from '../core/errors.js';
import { failedRun } from '../measure/run-one.js';
import type { PlannedRun } from './plan.js';
import type { SweepOptions } from './run.js';
import type { StiffnessTask, WorkerTask } from './worker.js';

/** Extra seconds a worker gets past the solver's own deadline before it is terminated. */
const TERMINATE_GRACE_SECONDS = 2;

/** The compiled worker: workers cannot load TypeScript, so tests running from src use dist. */
function workerFile(): string {
  const here = fileURLToPath(import.meta.url);
  if (here.endsWith('.js')) return join(dirname(here), 'worker.js');
  const built = join(dirname(here), '..', '..', 'dist', 'src', 'sweep', 'worker.js');
  if (!existsSync(built)) throw new Error(`parallel runs need the compiled worker at ${built}; run npm run build`);
  return built;
}

export interface PoolInput {
  runs: readonly PlannedRun[];
  jobs: number;
  problems: ReadonlyMap<string, Problem>;
  problemEntries: ReadonlyMap<string, string>;
  methodEntries: ReadonlyMap<string, string>;
  options: SweepOptions;
}

export async function executeOnPool(input: PoolInput): Promise<RunResult[]> {
  const { options } = input;
  const pool = new Tinypool({ filename: workerFile(), minThreads: 1, maxThreads: input.jobs, isolateWorkers: false });
  const out: RunResult[] = [];
  let failed = 0;
  let next = 0;
  // Callbacks stay here; workers get only the serialisable run options.
  const { onRun, shouldStop, ...taskOptions } = options;

  const one = async (planned: PlannedRun): Promise<RunResult> => {
    const task: WorkerTask = {
      planned,
      problemEntry: input.problemEntries.get(planned.problem) ?? planned.problem,
      methodEntry: input.methodEntries.get(planned.method) ?? planned.method,
      options: taskOptions,
    };
    const controller = new AbortController();
    const limit = options.runTimeoutSeconds;
    // Timing repeats the solve, so the hard limit allows for the timing budget as well.
    const hard = limit ? (limit + (options.timing?.budgetSeconds ?? 0) * 2 + TERMINATE_GRACE_SECONDS) * 1000 : 0;
    const timer = hard ? setTimeout(() => controller.abort(), hard) : undefined;
    try {
      return (await pool.run(task, { signal: controller.signal })) as RunResult;
    } catch (e) {
      const problem = input.problems.get(planned.problem)!;
      const run = failedRun(problem, { id: planned.method }, planned.setting, messageOf(e));
      if (controller.signal.aborted) {
        run.status = 'timeout';
        run.message = `run exceeded --run-timeout ${limit} s and its worker was terminated`;
      }
      run.planIndex = planned.planIndex;
      return run;
    } finally {
      if (timer) clearTimeout(timer);
    }
  };

  // Costliest first, so no lane is left with one long run at the end (results return in plan order).
  const queue = [...input.runs].sort((a, b) => b.expectedCost - a.expectedCost || a.planIndex - b.planIndex);
  const lane = async (): Promise<void> => {
    while (next < queue.length) {
      if (shouldStop?.()) return;
      const planned = queue[next++]!;
      const run = await one(planned);
      if (run.status !== 'ok') failed++;
      out.push(run);
      onRun?.({ done: out.length, total: input.runs.length, failed, last: run });
    }
  };
  try {
    await Promise.all(Array.from({ length: Math.max(1, input.jobs) }, lane));
  } finally {
    await pool.destroy();
  }
  return out.sort((a, b) => (a.planIndex ?? 0) - (b.planIndex ?? 0));
}

/**
 * Stiffness ratios of user problems computed on a worker under a time limit: the ratio calls the
 * model's f and Jacobian, and a model that never returns must not hang the sweep after its runs
 * were timed out. A ratio not computed in time is null.
 */
export async function stiffnessOnPool(entries: ReadonlyMap<string, string>, timeoutSeconds: number): Promise<Map<string, number | null>> {
  const out = new Map<string, number | null>();
  if (entries.size === 0) return out;
  const pool = new Tinypool({ filename: workerFile(), minThreads: 1, maxThreads: 1, isolateWorkers: false });
  try {
    for (const [id, entry] of entries) {
      const controller = new AbortController();
      const timer = setTimeout(() => controller.abort(), (timeoutSeconds + TERMINATE_GRACE_SECONDS) * 1000);
      try {
        const task: StiffnessTask = { kind: 'stiffness', problemEntry: entry };
        out.set(id, (await pool.run(task, { signal: controller.signal })) as number | null);
      } catch {
        out.set(id, null);
      } finally {
        clearTimeout(timer);
      }
    }
  } finally {
    await pool.destroy();
  }
  return out;
}
