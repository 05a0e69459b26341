// Running a planned sweep in this process and assembling the results file.
import type { ControllerKind, Method, Problem } from '../core/types.js';
import type { Environment, ProblemRecord, ResultsFile, RunResult } from '../results/contract.js';
import { RESULTS_FORMAT, RESULTS_VERSION } from '../results/contract.js';
import { sha256 } from '../core/hash.js';
import { environmentFingerprint } from '../measure/environment.js';
import { calibrationSeconds } from '../measure/timing.js';
import { problemStiffnessRatio } from '../measure/problem-stiffness.js';
import { resolve as resolvePath } from 'node:path';
import { executeRun, type SweepOptions } from './execute.js';
import { failedRun } from '../measure/run-one.js';
import type { SweepInputs } from './inputs.js';
import { messageOf } from '../core/errors.js';
import { markUnchangedSettings } from './unchanged-settings.js';
import { planStandIn, planSweep, type PlannedRun, type PlanProblem, type SweepPlan } from './plan.js';
import { fileEntries, isSampleSource, problemEntries, problemSources, resolveMethods, type ProblemSources } from './resolve.js';
import { sampleId } from '../problems/dispersion/expand.js';
import { InputError } from '../core/errors.js';
import { collectGarbage } from '../core/collect-garbage.js';
import { CERTIFY_TIMEOUT_RUNS, certifyOnPool, executeOnPool, stiffnessOnPool } from './pool.js';
import { timeOnClocks } from './clocks.js';
import { executionOrder } from './dealer.js';
import { prestartLanes, workerLaneCount, type PrestartedLanes } from './lanes.js';
import { selectShard } from './shard.js';
import type { TimingOptions } from '../measure/timing.js';
import { DEFAULT_MAX_STEPS } from '../core/defaults.js';

export type { SweepOptions, SweepProgress } from './execute.js';
import type { SweepProgress } from './execute.js';

/**
 * The unit of error.final for plot axes: the one unit every measured component shares under an
 * absolute error scale, "relative" under a relative one, else none.
 */
export function errorUnit(p: Problem): string | undefined {
  if (p.errorScale.kind === 'relative') return 'relative';
  const names = p.errorOn === 'outputs' ? (p.outputs?.names ?? []) : (p.stateNames ?? []);
  const table = p.errorOn === 'outputs' ? p.units?.outputs : p.units?.states;
  if (!table || names.length === 0) return undefined;
  const units = new Set(names.map((n) => table[n] ?? ''));
  const only = [...units][0];
  return units.size === 1 && only ? only : undefined;
}

/** Decades the span covers from its first positive check time to its end (null when t0 < 0 or none). */
export function timeDecades(p: Problem): number | null {
  const first = p.checkTimes.find((t) => t > 0);
  if (p.t0 < 0 || first === undefined || !(p.tEnd > first)) return null;
  return Math.log10(p.tEnd / first);
}

export function problemRecord(p: Problem, stiffness?: ReadonlyMap<string, number | null>): ProblemRecord {
  const ref: ProblemRecord['reference'] = { kind: p.reference.kind };
  if (p.reference.digits !== undefined) ref.digits = p.reference.digits;
  if (p.reference.source !== undefined) ref.source = p.reference.source;
  if (p.reference.certifiedBy) {
    const c = p.reference.certifiedBy;
    ref.certifiedBy = { methods: [...c.methods], ...(c.rtol === undefined ? {} : { rtol: c.rtol }), ...(c.runs ? { runs: c.runs.map((r) => ({ ...r })) } : {}) };
  }
  const none = p.reference.untrusted ?? p.reference.unavailable;
  if (none !== undefined) ref.none = none;
  return {
    id: p.id,
    title: p.title,
    sha256: sha256(p.definition),
    stiff: p.stiff,
    reference: ref,
    source: p.source,
    dimension: p.dimension,
    stiffnessRatio: stiffness?.has(p.id) ? stiffness.get(p.id)! : problemStiffnessRatio(p),
    ...(p.dispersion ? { dispersion: p.dispersion } : {}),
    definition: p.definition,
    ...(p.units ? { units: p.units } : {}),
    ...(timeDecades(p) !== null ? { timeDecades: timeDecades(p) } : {}),
    ...(errorUnit(p) ? { errorUnit: errorUnit(p) } : {}),
  };
}

export function methodRecord(m: Method): Record<string, unknown> {
  const rec: Record<string, unknown> = { id: m.id, name: m.name, family: m.family, order: m.order, source: m.source, adaptive: m.adaptive, stiff: m.stiff };
  if (m.embeddedOrder !== undefined) rec.embeddedOrder = m.embeddedOrder;
  if (m.program) rec.program = m.program;
  // A fingerprint of what the method is and does: its record and its solve function's text
  // (so a baseline can tell that a method's code changed between two sweeps).
  rec.sha256 = sha256(`${JSON.stringify(rec)}\n${m.solve.toString()}`);
  return rec;
}

export async function executePlan(
  runs: readonly PlannedRun[],
  problems: ProblemLookup,
  methods: ReadonlyMap<string, Method>,
  options: SweepOptions,
): Promise<RunResult[]> {
  const out: RunResult[] = [];
  let failed = 0;
  let done = 0;
  for (const planned of runs) {
    // Yield to the event loop between runs so signals (Ctrl-C) and progress output get through.
    await new Promise<void>((resolve) => setImmediate(resolve));
    if (options.shouldStop?.()) break;
    const problem = problems.get(planned.problem)!;
    let run: RunResult;
    try {
      run = await executeRun(problem, methods.get(planned.method)!, planned, options);
    } catch (e) {
      // As on a worker (runBatch): what a run throws past its solve (a user's exact solution,
      // a module calling process.exit under the guard) fails that run, not the sweep.
      run = { ...failedRun(problem, { id: planned.method }, planned.setting, messageOf(e)), planIndex: planned.planIndex };
    }
    if (run.status !== 'ok') failed++;
    if (options.keepRuns !== false) out.push(run);
    options.onRun?.({ done: ++done, total: runs.length, failed, last: run });
  }
  return out;
}

/** Problems by id; dispersion samples are built when asked for (see problemSources). */
export type ProblemLookup = Pick<ReadonlyMap<string, Problem>, 'get'>;

export interface AssembleInput {
  plan: SweepPlan;
  problems: readonly Problem[];
  /**
   * The problems' records in list order, given instead of building them from `problems` (a sweep
   * over dispersion samples builds each sample's record as it plans, not holding the samples).
   */
  records?: readonly ProblemRecord[];
  methods: readonly Method[];
  runs: RunResult[];
  timed: boolean;
  interrupted?: boolean;
  /** Stiffness ratios computed elsewhere (under a time limit), by problem id. */
  stiffness?: ReadonlyMap<string, number | null>;
  /** The fingerprint, if it was started earlier (see measure/environment.ts); else taken now. */
  environment?: Promise<Environment>;
}

export async function assembleResults(input: AssembleInput): Promise<ResultsFile> {
  const environment = await (input.environment ?? environmentFingerprint());
  if (input.timed) environment.calibrationSeconds = await calibrationSeconds();
  const usedProblems = new Set(input.plan.runs.map((r) => r.problem));
  const results: ResultsFile = {
    format: RESULTS_FORMAT,
    version: RESULTS_VERSION,
    createdAt: new Date().toISOString(),
    environment,
    runs: markUnchangedSettings([...input.runs].sort((a, b) => (a.planIndex ?? 0) - (b.planIndex ?? 0))),
    problems: (input.records ?? input.problems.map((p) => problemRecord(p, input.stiffness))).filter((p) => usedProblems.has(p.id) || input.plan.runs.length === 0),
    methods: input.methods.map(methodRecord),
    plan: { sha256: input.plan.sha256, runs: input.plan.runs.length },
    skipped: input.plan.skipped,
  };
  if (input.interrupted) results.interrupted = true;
  if (input.records ? input.records.some((r) => r.dispersion) : input.problems.some((p) => p.dispersion)) {
    results.omitted = { traces: 'runs of dispersion samples carry no drift trace (drift maxima are kept); rerun a sample alone to see its trace' };
  }
  return results;
}

export interface SweepRequest {
  /** The version and file hashes the sweep started from, recorded for `run --resume` (sweep/inputs.ts). */
  inputs?: SweepInputs;
  /** Comma list of problem ids or files (undefined: the catalogue). */
  problem?: string;
  /** Comma list of method ids or module files (undefined: all that apply). */
  method?: string;
  tolerances?: readonly number[];
  /** --atol: one value, or one per state, used with every rtol instead of the problem's own. */
  atol?: number | readonly number[];
  steps?: readonly number[];
  maxSteps?: number;
  /** null or undefined: no timing. */
  timing?: TimingOptions | null;
  controller?: ControllerKind;
  /** Parallel workers; 1 runs in this process (unless a run timeout needs workers). */
  jobs?: number;
  runTimeoutSeconds?: number;
  shard?: { index: number; count: number };
  onPlan?: (plan: SweepPlan, selected: readonly PlannedRun[], methods: readonly Method[]) => void;
  onRun?: (p: SweepProgress) => void;
  shouldStop?: () => boolean;
  /** Said before the sweep starts, e.g. a reference that could not be certified. */
  onWarning?: (message: string) => void;
  /** Said before the sweep starts: what is being done and how long it took (certification). */
  onNote?: (message: string) => void;
  /** Runs already finished (resume): matched by plan index and not run again. */
  finished?: readonly RunResult[];
  /**
   * True: runs are not kept; each goes to onRun only (the CLI journals it and writes the files from
   * the journal), so the sweep's memory does not grow with its runs. The answer's `runs` is empty.
   */
  streamRuns?: boolean;
  /**
   * Workers started ahead of the sweep (prestartLanes). A parallel sweep takes up to `jobs` of
   * them and ends them; the caller releases the rest, e.g. all of them after bad input.
   */
  lanes?: PrestartedLanes;
}

/** Plans, executes and assembles one sweep; the library form of `stepgauge run`. */
export async function runSweep(req: SweepRequest): Promise<ResultsFile> {
  // A parallel sweep's workers start now, unless the caller started them earlier (the CLI does),
  // so they load their modules while this process resolves and plans; those not taken (bad input,
  // nothing to run) are ended here.
  const laneCount = workerLaneCount(req);
  const own = !req.lanes && laneCount > 0 ? prestartLanes(laneCount) : undefined;
  try {
    return await sweepOn(own ? { ...req, lanes: own } : req, laneCount);
  } finally {
    await own?.release();
  }
}

async function sweepOn(req: SweepRequest, lanes: number): Promise<ResultsFile> {
  // With a run timeout, user models are not trusted to return: their references are certified on
  // a worker under a limit first, so a model that never returns cannot hang the sweep here.
  const files = fileEntries(req.problem);
  let uncertified: Map<string, string> | undefined;
  if (req.runTimeoutSeconds && files.length > 0) {
    const started = performance.now();
    req.onNote?.(`certifying the references of problem files that give none, on a worker (each within ${CERTIFY_TIMEOUT_RUNS} x --run-timeout)`);
    uncertified = await certifyOnPool(files.map((e) => resolvePath(e)), req.runTimeoutSeconds);
    req.onNote?.(`references of problem files ready in ${((performance.now() - started) / 1000).toFixed(1)} s`);
  }
  const problems = await problemSources(req.problem, req.onWarning, uncertified, req.onNote);
  // Samples are planned from stand-ins and their records built as they are, the stiffness ratio
  // left for later (it takes far longer than the rest): one build each here, none kept.
  const sampleRecords = new Map<string, ProblemRecord>();
  const planned = planningView(problems, (p) => sampleRecords.set(p.id, problemRecord(p, new Map([[p.id, null]]))));
  const methods = await resolveMethods(req.method);
  const plan = planSweep({
    problems: planned,
    methods: methods.items,
    tolerances: req.tolerances,
    steps: req.steps,
    methodsNamed: methods.named,
    ...(req.atol !== undefined ? { atol: req.atol } : {}),
  });
  let selected: readonly PlannedRun[] = req.shard ? selectShard(plan.runs, req.shard.index, req.shard.count) : plan.runs;
  req.onPlan?.(plan, selected, methods.items);
  const done = new Map((req.finished ?? []).map((r) => [r.planIndex, r]));
  const todo = selected.filter((r) => !done.has(r.planIndex));
  const runOptions = {
    maxSteps: req.maxSteps ?? DEFAULT_MAX_STEPS,
    ...(req.controller ? { controller: req.controller } : {}),
    ...(req.runTimeoutSeconds ? { runTimeoutSeconds: req.runTimeoutSeconds } : {}),
  };
  // Runs are reported (progress, journal) once complete: a timed run after its timing phase.
  const timing = req.timing ?? null;
  const report = progressCounter(todo.length, req.onRun, Boolean(timing));
  const measured: { run: RunResult; planned: PlannedRun }[] = [];
  const byIndex = timing ? new Map(todo.map((r) => [r.planIndex, r])) : undefined;
  const options: SweepOptions = {
    ...runOptions,
    // The measuring phase never times: the clocks do (clocks.ts).
    timing: null,
    onRun: (p) => {
      if (timing && p.last.status === 'ok') measured.push({ run: p.last, planned: byIndex!.get(p.last.planIndex!)! });
      else report(p.last);
    },
    ...(req.shouldStop ? { shouldStop: req.shouldStop } : {}),
    ...(req.streamRuns ? { keepRuns: false } : {}),
  };
  const environment = environmentFingerprint();
  const problemMap: ProblemLookup = { get: (id) => problems.get(id) };
  const entries = problemEntries(problems);
  const problemEntriesAbs = absoluteEntries(entries);
  const methodEntries = absoluteEntries(methods.entries);
  const measuring =
    lanes > 0
      ? executeOnPool({
          runs: todo,
          jobs: lanes,
          problems: problemMap,
          problemEntries: problemEntriesAbs,
          methodEntries,
          options,
          ...(uncertified ? { uncertified } : {}),
          ...(req.lanes ? { lanes: req.lanes } : {}),
        })
      : executePlan(executionOrder(todo), problemMap, new Map(methods.items.map((m) => [m.id, m])), options);
  const execution = measuring.then(async (runs) => {
    if (!timing) return runs;
    await timeOnClocks({
      runs: measured.sort((a, b) => a.planned.planIndex - b.planned.planIndex),
      jobs: Math.max(1, req.jobs ?? 1),
      problems: problemMap,
      problemEntries: problemEntriesAbs,
      methodEntries,
      options: runOptions,
      timing,
      ...(uncertified ? { uncertified } : {}),
      onTimed: report,
      ...(req.shouldStop ? { shouldStop: req.shouldStop } : {}),
    });
    // A run measured but not timed before a stop is left out, so a resumed sweep runs it again.
    const timed = new Set(report.reported());
    return runs.filter((r) => timed.has(r));
  });
  // The problems' stiffness ratios are computed while the runs go: on a parallel sweep this
  // process is idle then, and after the last run it would hold the sweep's end for tens of
  // milliseconds. User models under a run timeout get theirs on a worker, after the runs.
  const ready = problems.sources.filter((x): x is Problem => !isSampleSource(x));
  const early = req.runTimeoutSeconds ? undefined : stiffnessRatios(ready, plan.runs);
  const samplesEarly = req.runTimeoutSeconds ? undefined : sampleStiffnessRatios(problems, plan.runs, early!);
  const fresh = await execution;
  const wanted = new Set(selected.map((s) => s.planIndex));
  const runs = req.streamRuns ? [] : [...done.values(), ...fresh].filter((r) => wanted.has(r.planIndex ?? -1));
  const finishedCount = req.streamRuns ? [...done.keys()].filter((i) => wanted.has(i ?? -1)).length + report.count() : runs.length;
  // User models are code: with a run timeout, their stiffness ratio is computed under it too.
  await samplesEarly;
  const stiffness = req.runTimeoutSeconds ? await stiffnessOnPool(absoluteEntries(entries), req.runTimeoutSeconds, uncertified) : early;
  const results = await assembleResults({
    plan,
    problems: [],
    records: recordsInOrder(problems, sampleRecords, stiffness),
    methods: methods.items,
    runs,
    timed: Boolean(req.timing),
    interrupted: finishedCount < selected.length,
    environment,
    ...(stiffness ? { stiffness } : {}),
  });
  if (req.shard) results.shard = { index: req.shard.index, count: req.shard.count, planSha256: plan.sha256 };
  results.request = sweepRequestRecord(req);
  return results;
}

/** Numbers each completed run for the caller's progress callback, and remembers which were reported (when `remember`). */
function progressCounter(total: number, onRun: SweepRequest['onRun'], remember: boolean): ((run: RunResult) => void) & { reported(): RunResult[]; count(): number } {
  const seen: RunResult[] = [];
  let failed = 0;
  let count = 0;
  const report = (run: RunResult): void => {
    if (run.status !== 'ok') failed++;
    if (remember) seen.push(run);
    onRun?.({ done: ++count, total, failed, last: run });
  };
  return Object.assign(report, { reported: () => seen, count: () => count });
}

/**
 * Stiffness ratios of the problems the planned runs use. One that throws (a user model's exact
 * solution, say) is left out, so assembling the results computes it again and reports the error.
 */
function stiffnessRatios(problems: readonly Problem[], runs: readonly PlannedRun[]): Map<string, number | null> {
  const used = new Set(runs.map((r) => r.problem));
  const out = new Map<string, number | null>();
  for (const p of problems) {
    if (!used.has(p.id)) continue;
    try {
      out.set(p.id, problemStiffnessRatio(p));
    } catch {
      // left to assembleResults (see above)
    }
  }
  return out;
}

/**
 * What planning sees: ready problems as they are, each dispersion sample as a stand-in (planStandIn),
 * built one at a time and handed to `each` (which builds its record) before it is let go.
 */
function planningView(sources: ProblemSources, each?: (p: Problem) => void): PlanProblem[] {
  const out: PlanProblem[] = [];
  const ids = new Set<string>();
  for (const x of sources.sources) {
    if (!isSampleSource(x)) {
      ids.add(x.id);
      out.push(x);
      continue;
    }
    for (let k = 1; k <= x.set.count; k++) {
      const p = x.sample(k);
      if (ids.has(p.id)) throw new InputError(`'${p.id}' is listed twice`, '--problem');
      ids.add(p.id);
      out.push(planStandIn(p));
      try {
        each?.(p);
      } catch {
        // left to assembling the results, which builds the sample again and reports the error
      }
    }
  }
  return out;
}

/**
 * Every problem's record in list order; a sample's from `built` with its stiffness ratio put in
 * (computed now, from the sample built again, when `stiffness` lacks it: that reports an error).
 */
function recordsInOrder(sources: ProblemSources, built: ReadonlyMap<string, ProblemRecord>, stiffness: ReadonlyMap<string, number | null> | undefined): ProblemRecord[] {
  const out: ProblemRecord[] = [];
  for (const x of sources.sources) {
    if (!isSampleSource(x)) {
      out.push(problemRecord(x, stiffness));
      continue;
    }
    for (let k = 1; k <= x.set.count; k++) {
      const id = sampleId(x.set.of, k);
      const record = built.get(id);
      if (!record) out.push(problemRecord(x.sample(k), stiffness));
      else {
        record.stiffnessRatio = stiffness?.has(id) ? stiffness.get(id)! : problemStiffnessRatio(x.sample(k));
        out.push(record);
      }
    }
  }
  return out;
}

/**
 * The stiffness ratios of the samples the runs use, into `out`, a sample built again at a time:
 * about a millisecond each, so the work yields to the event loop often, letting the workers'
 * answers through while it goes. One that throws is left out (see stiffnessRatios).
 */
async function sampleStiffnessRatios(sources: ProblemSources, runs: readonly PlannedRun[], out: Map<string, number | null>): Promise<void> {
  const used = new Set(runs.map((r) => r.problem));
  let slice = performance.now();
  for (const x of sources.sources) {
    if (!isSampleSource(x)) continue;
    for (let k = 1; k <= x.set.count; k++) {
      const id = sampleId(x.set.of, k);
      if (!used.has(id)) continue;
      try {
        out.set(id, problemStiffnessRatio(x.sample(k)));
      } catch {
        // left to assembling the results (see above)
      }
      // Each sample built here is garbage at once; see core/collect-garbage.ts.
      if (k % COLLECT_EVERY_SAMPLES === 0) collectGarbage();
      if (performance.now() - slice > STIFFNESS_SLICE_MS) {
        await new Promise<void>((resolve) => setImmediate(resolve));
        slice = performance.now();
      }
    }
  }
}

/** Samples between the full collections asked for while their stiffness ratios are computed. */
const COLLECT_EVERY_SAMPLES = 2000;

/** Longest stretch the samples' stiffness ratios hold the event loop in a parallel sweep. */
const STIFFNESS_SLICE_MS = 10;

function absoluteEntries(entries: ReadonlyMap<string, string>): Map<string, string> {
  return new Map([...entries].map(([id, e]) => [id, resolvePath(e)]));
}

/** The serialisable part of a request, stored so an interrupted sweep can be resumed as asked. */
export function sweepRequestRecord(req: SweepRequest): Record<string, unknown> {
  const rec: Record<string, unknown> = {};
  for (const k of ['problem', 'method', 'tolerances', 'atol', 'steps', 'maxSteps', 'timing', 'controller', 'runTimeoutSeconds', 'shard', 'inputs'] as const) {
    if (req[k] !== undefined) rec[k] = req[k];
  }
  return rec;
}
