// The timing phase of a timed sweep. A run's time must not depend on what else the sweep ran:
// code shared by every method (the engines, the measuring harness) and by every problem (a step
// kernel calling each problem's f) collects V8 type feedback from all of them, and the same solve
// measured up to 1.7x slower after others had run in its process than alone (bench/README.md).
// So the runs are first measured as usual (errors, counts; in parallel lanes or in this
// process), and then each (problem, method) pair's successful runs are timed together in a
// fresh worker process ("clock") that has run nothing else: the time recorded for a run is the
// time the same run gets in a sweep of that run alone. A clock is started per pair and ended
// after it; `jobs` clocks run at once.
import type { Problem } from '../core/types.js';
import type { RunResult } from '../results/contract.js';
import { appendMessage, type RunOptions } from '../measure/run-one.js';
import { timeRecord, type TimingOptions, type TimingResult } from '../measure/timing.js';
import type { PlannedRun } from './plan.js';
import type { TimeTask } from './worker.js';
import { createClocks } from './lanes.js';
import { runLimited } from './pool.js';

/** Extra seconds a clock gets past its runs' allowance before it is ended. */
const CLOCK_GRACE_SECONDS = 2;

export interface ClockInput {
  /** Measured runs that succeeded, each with its plan entry. */
  runs: readonly { run: RunResult; planned: PlannedRun }[];
  jobs: number;
  problems: Pick<ReadonlyMap<string, Problem>, 'get'>;
  problemEntries: ReadonlyMap<string, string>;
  methodEntries: ReadonlyMap<string, string>;
  options: RunOptions;
  timing: TimingOptions;
  uncertified?: ReadonlyMap<string, string>;
  /** Called with each run once its time is in (or known to be missing). */
  onTimed: (run: RunResult) => void;
  shouldStop?: () => boolean;
}

interface PairGroup {
  problemEntry: string;
  /** The problem itself: an entry may yield several (the samples of a dispersion). */
  problemId: string;
  methodEntry: string;
  members: { run: RunResult; planned: PlannedRun }[];
}

/** The runs grouped by (problem, method), in the order they came. */
function pairGroups(input: ClockInput): PairGroup[] {
  const groups = new Map<string, PairGroup>();
  for (const member of input.runs) {
    const problemEntry = input.problemEntries.get(member.planned.problem) ?? member.planned.problem;
    const methodEntry = input.methodEntries.get(member.planned.method) ?? member.planned.method;
    const key = JSON.stringify([problemEntry, member.planned.problem, methodEntry]);
    let g = groups.get(key);
    if (!g) groups.set(key, (g = { problemEntry, problemId: member.planned.problem, methodEntry, members: [] }));
    g.members.push(member);
  }
  return [...groups.values()];
}

export function setTime(run: RunResult, t: TimingResult): void {
  run.time = timeRecord(t);
}

/** Times every run of `input` on clocks (see the header); the runs' `time` is filled in place. */
export async function timeOnClocks(input: ClockInput): Promise<void> {
  const groups = pairGroups(input);
  if (groups.length === 0) return;
  const pool = createClocks(input.jobs);
  // With a run timeout each timed solve is bounded; the clock's limit allows the group's solves
  // their timing budget (doubled up to three times, see timeRun) and its warm-up.
  const perRunMs = input.options.runTimeoutSeconds ? (input.options.runTimeoutSeconds + input.timing.budgetSeconds * 8 + 2) * 1000 : 0;
  let next = 0;
  const feed = async (): Promise<void> => {
    for (let g = groups[next++]; g; g = groups[next++]) {
      if (input.shouldStop?.()) return;
      const task: TimeTask = {
        kind: 'time',
        problemEntry: g.problemEntry,
        problemId: g.problemId,
        methodEntry: g.methodEntry,
        settings: g.members.map((m) => m.planned.setting),
        options: input.options,
        timing: input.timing,
      };
      const why = input.uncertified?.get(g.problemEntry);
      if (why !== undefined) task.uncertified = why;
      const limit = perRunMs > 0 ? perRunMs * g.members.length + CLOCK_GRACE_SECONDS * 1000 : 0;
      const outcome = await runLimited(pool, task, limit);
      g.members.forEach(({ run }, k) => {
        if (outcome.ok) {
          const t = (outcome.value as (TimingResult | null)[])[k];
          if (t) setTime(run, t);
        } else {
          run.message = appendMessage(run.message, outcome.timedOut ? 'not timed: the timed repeats exceeded --run-timeout' : 'not timed: its timing process failed');
        }
        input.onTimed(run);
      });
    }
  };
  try {
    await Promise.all(Array.from({ length: Math.max(1, input.jobs) }, feed));
  } finally {
    await pool.destroy();
  }
}
