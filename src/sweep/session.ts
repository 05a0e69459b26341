// A sweep that writes a folder, as a session: the folder's lock, the request (new, or resumed
// from the folder), workers started early, the journal of finished runs, Ctrl-C, and the write.
// The CLI only parses flags, passes hooks that print, and prints the outcome.
import type { Method } from '../core/types.js';
import type { ResultsFile, RunResult } from '../results/contract.js';
import type { StreamedRuns } from '../results/streamed-results.js';
import { outputRun, unchangedReviser } from './unchanged-settings.js';
import { collectGarbage } from '../core/collect-garbage.js';
import { Journal } from './journal.js';
import { takeLock } from './lock.js';
import { prestartLanes, workerLaneCount, type PrestartedLanes } from './lanes.js';
import { interruptedSweep } from './resume.js';
import { stopSignals } from './stop-signals.js';
import type { PlannedRun, SweepPlan } from './plan.js';
import type { SweepProgress, SweepRequest } from './run.js';

/** Runs between the full collections a streamed sweep asks for (see core/collect-garbage.ts). */
const COLLECT_EVERY_RUNS = 5000;

export interface SessionHooks {
  /** The plan is known (the selection already checked against a resumed sweep's plan). */
  onPlan?: (plan: SweepPlan, selected: readonly PlannedRun[], methods: readonly Method[], request: SweepRequest) => void;
  onRun?: (p: SweepProgress) => void;
  onWarning?: (message: string) => void;
  onNote?: (message: string) => void;
  /** The first Ctrl-C arrived: no new run starts, the finished ones will be written. */
  onStopAsked?: () => void;
  /** The runs are over (finished, stopped or failed), before anything is written. */
  onRunsEnded?: () => void;
}

export interface SweepSession {
  /**
   * Runs the sweep, then `write`s its folder from `results` (its runs left out) and the runs kept
   * in the journal; the journal goes once the folder is written. The answer's runs are what
   * `write` answered (a summary view of each, see summaryView).
   */
  run(hooks: SessionHooks, write: (results: ResultsFile, runs: StreamedRuns) => Promise<RunResult[]>): Promise<ResultsFile>;
  /** Ends the workers the sweep did not take and releases the folder. */
  close(): Promise<void>;
}

export interface SessionTarget {
  outDir: string;
  /** Names the folder in messages, e.g. "--out reports/x". */
  label: string;
  /** Continue the interrupted sweep in `outDir` instead of starting `request`. */
  resume: boolean;
}

/**
 * Takes the folder (one sweep per folder; a killed one leaves its lock to be taken over), settles
 * the request and starts the workers before the sweep modules load, so both load at once.
 */
export async function openSweepSession(request: SweepRequest, target: SessionTarget): Promise<SweepSession> {
  const lock = takeLock(target.outDir, target.label);
  let lanes: PrestartedLanes | undefined;
  try {
    const { sweepInputs, assertSameInputs, assertSamePlan } = await import('./inputs.js');
    let req: SweepRequest;
    let checkPlan: ((sha256: string) => void) | undefined;
    if (target.resume) {
      const state = interruptedSweep(target.outDir, target.label);
      const now = sweepInputs(state.request);
      assertSameInputs(state.request.inputs, now, state.where);
      req = { ...state.request, finished: state.finished, jobs: request.jobs ?? 1, inputs: now };
      checkPlan = (sha256) => assertSamePlan(state.planSha256, sha256, state.where);
    } else req = { ...request, inputs: sweepInputs(request) };
    const laneCount = workerLaneCount(req);
    lanes = laneCount > 0 ? prestartLanes(laneCount) : undefined;
    if (lanes) req.lanes = lanes;
    const taken = lanes;
    return {
      run: (hooks, write) => journaledSweep(req, target.outDir, hooks, write, checkPlan),
      close: async () => {
        try {
          await taken?.release();
        } finally {
          lock.release();
        }
      },
    };
  } catch (e) {
    await lanes?.release();
    lock.release();
    throw e;
  }
}

async function journaledSweep(
  req: SweepRequest,
  outDir: string,
  hooks: SessionHooks,
  write: (results: ResultsFile, runs: StreamedRuns) => Promise<RunResult[]>,
  checkPlan?: (sha256: string) => void,
): Promise<ResultsFile> {
  const { runSweep, sweepRequestRecord } = await import('./run.js');
  let journal: Journal | undefined;
  // No run is kept (streamRuns): the journal serialises each as it finishes, while the workers run,
  // and the folder is written from its lines (bench/README.md), so memory does not grow with the
  // runs. Runs with a reported output keep what the unchanged-setting check needs.
  let journaled = 0;
  const outputs: NonNullable<ReturnType<typeof outputRun>>[] = [];
  for (const r of req.finished ?? []) {
    const o = outputRun(r);
    if (o) outputs.push(o);
  }
  const signals = stopSignals(() => hooks.onStopAsked?.());
  const sweep: SweepRequest = {
    ...req,
    streamRuns: true,
    onPlan: (plan, selected, methods) => {
      checkPlan?.(plan.sha256);
      hooks.onPlan?.(plan, selected, methods, req);
      journal = new Journal(outDir, { planSha256: plan.sha256, request: sweepRequestRecord(req) }, req.finished ?? []);
      // Only once the runs start: loading problem files and certifying their references happen
      // before, in this process, and until then Ctrl-C quits at once (nothing is written yet), so
      // no problem file can make those steps ignore it.
      signals.listen();
    },
    onRun: (p) => {
      if (journal) {
        journal.append(p.last);
        if (++journaled % COLLECT_EVERY_RUNS === 0) collectGarbage();
      }
      const o = outputRun(p.last);
      if (o) outputs.push(o);
      hooks.onRun?.(p);
    },
    shouldStop: signals.stopping,
  };
  if (hooks.onWarning) sweep.onWarning = hooks.onWarning;
  if (hooks.onNote) sweep.onNote = hooks.onNote;
  let results: ResultsFile;
  try {
    results = await runSweep(sweep);
  } catch (e) {
    // A sweep that failed before any run finished (a worker that could not start, say) leaves
    // nothing to resume.
    if (journal && journaled === 0 && (req.finished?.length ?? 0) === 0) journal.remove();
    throw e;
  } finally {
    journal?.close();
    signals.close();
    hooks.onRunsEnded?.();
  }
  if (!journal) throw new Error('the sweep ended without a plan');
  const planned = (results.plan as { runs: number }).runs;
  results.runs = await write(results, { lines: journal.runLines((i) => i >= 0 && i < planned), revise: unchangedReviser(outputs) });
  journal.remove();
  return results;
}
