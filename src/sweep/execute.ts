// Executing one planned run: a measured solve, then timed repeats when the run succeeded.
import type { Method, Problem } from '../core/types.js';
import type { RunResult } from '../results/contract.js';
import { appendMessage, measureRun, type RunOptions } from '../measure/run-one.js';
import { timeRecord, timeRun, type TimingOptions } from '../measure/timing.js';
import type { PlannedRun } from './plan.js';
import { SELF_REFERENCE_CAUTION, selfReferenced } from './self-reference.js';

export interface ExecuteOptions extends RunOptions {
  /** null skips timing (time stays null). */
  timing: TimingOptions | null;
}

export interface SweepProgress {
  done: number;
  total: number;
  failed: number;
  last: RunResult;
}

export interface SweepOptions extends ExecuteOptions {
  onRun?: (p: SweepProgress) => void;
  /** Checked between runs: when it returns true, no further run starts. */
  shouldStop?: () => boolean;
  /** False: runs go to onRun only and are not collected (a caller that writes them as they come). */
  keepRuns?: boolean;
}

export async function executeRun(
  problem: Problem,
  method: Method,
  planned: PlannedRun,
  options: ExecuteOptions,
): Promise<RunResult> {
  const self = problem.reference.kind === 'self';
  const measured = self ? selfReferenced(problem, method, options.maxSteps) : problem;
  const run = measureRun(measured, method, planned.setting, options);
  run.planIndex = planned.planIndex;
  if (self) {
    run.selfReference = measured.reference.source ?? 'self-reference';
    run.message = appendMessage(run.message, SELF_REFERENCE_CAUTION);
  }
  // One drift trace per sample would make a dispersion's results mostly traces (about 11 kB a
  // run on an orbit); the drift maxima stay, and results.json says the traces were left out.
  // (Set to undefined, not deleted: a deleted property turns each run into a slower, larger dictionary object.)
  if (problem.dispersion) run.trace = undefined;
  if (run.status === 'step-limit' && problem.stiff && !method.stiff) {
    run.message = appendMessage(
      run.message,
      `${problem.id} is stiff: an explicit method's step size is held down by stability, not accuracy; use an implicit method`,
    );
  }
  if (options.timing && run.status === 'ok') {
    const t = await timeRun(problem, method, planned.setting, options, options.timing);
    if (t) run.time = timeRecord(t);
  }
  return run;
}
