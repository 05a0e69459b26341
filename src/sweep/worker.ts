// Worker side of a parallel sweep (a tinypool child process): resolves the problem and method by
// the same entries the user gave (built-in ids or file paths), caches them for the worker's life,
// executes runs (several to a message when they are short, see executeOnPool).
import type { Method, Problem } from '../core/types.js';
import type { RunResult } from '../results/contract.js';
import { messageOf } from '../core/errors.js';
import { executeRun, type ExecuteOptions } from './execute.js';
import { failedRun } from '../measure/run-one.js';
import type { PlannedRun } from './plan.js';
import { everyProblem, isSampleSource, problemSources, resolveMethods, type ProblemSources } from './resolve.js';
import { problemStiffnessRatio } from '../measure/problem-stiffness.js';
import { timeRun, type TimingOptions, type TimingResult } from '../measure/timing.js';
import type { RunOptions } from '../measure/run-one.js';
import type { Setting } from '../core/types.js';
import type { PingTask } from './lanes.js';

export interface WorkerTask {
  planned: PlannedRun;
  /** The --problem entry (id or path) that yields this run's problem. */
  problemEntry: string;
  methodEntry: string;
  options: ExecuteOptions;
  /** Set when the problem's reference could not be certified in time: why (see resolveProblems). */
  uncertified?: string;
}

// As a child process: Ctrl-C reaches the whole process group, but stopping is the parent's call
// (it lets runs in flight finish and writes what is done); and a worker whose parent has gone
// has nobody to answer, so it leaves.
if (typeof process.send === 'function') {
  // What a user module prints goes to standard error, so `run --json` output stays JSON (tinypool
  // pipes a worker's standard output into the parent's).
  process.stdout.write = process.stderr.write.bind(process.stderr) as typeof process.stdout.write;
  process.on('SIGINT', () => {});
  process.on('disconnect', () => process.exit(0));
}

const problems = new Map<string, ProblemSources>();

/**
 * The problem `id` of an entry (an entry may yield several: the samples of a dispersion, of which
 * only the ones asked for are built, the last few kept; see problemSources).
 */
async function problemFor(entry: string, id: string | undefined, uncertified?: string): Promise<Problem> {
  let sources = problems.get(entry);
  if (!sources) {
    sources = await problemSources(entry, undefined, uncertified !== undefined ? new Map([[entry, uncertified]]) : undefined);
    problems.set(entry, sources);
  }
  if (id !== undefined) return sources.get(id);
  const first = sources.sources[0]!;
  return isSampleSource(first) ? first.sample(1) : first;
}

/**
 * Loads an entry and certifies its references here, every sample of a dispersion one after another
 * (each certificate lands in the cache; no sample is kept). Answers the first reason one is unavailable.
 */
async function certifyEntry(entry: string): Promise<string | null> {
  await problemFor(entry, undefined);
  for (const p of everyProblem(problems.get(entry)!)) if (p.reference.unavailable) return p.reference.unavailable;
  return null;
}

const methods = new Map<string, Method>();

async function methodFor(entry: string): Promise<Method> {
  let m = methods.get(entry);
  if (!m) {
    m = (await resolveMethods(entry)).items[0]!;
    methods.set(entry, m);
  }
  return m;
}

/** A problem's stiffness ratio, computed here so a model that hangs cannot hang the sweep. */
export interface StiffnessTask {
  kind: 'stiffness';
  problemEntry: string;
  /** Which of the entry's problems (a dispersion yields several). */
  problemId?: string;
  uncertified?: string;
}

/**
 * Load a problem file and certify its reference here (the certificate lands in the shared
 * cache, where the main process then finds it), so a model that never returns cannot hang the
 * sweep before it starts. Answers the reason a certificate is unavailable, or null.
 */
export interface CertifyTask {
  kind: 'certify';
  problemEntry: string;
}

/**
 * Several runs in one message, run in order until `budgetMs` has passed (at least one run):
 * each message costs both processes CPU time, and short runs are many (see executeOnPool).
 */
export interface BatchTask {
  kind: 'batch';
  runs: WorkerTask[];
  /** No further run starts once this many milliseconds have passed since the first started. */
  budgetMs: number;
}

/** The first results.length runs of the batch, each its result or the message of what it threw; the rest were not started. */
export interface BatchAnswer {
  results: (RunResult | { thrown: string })[];
}

async function runBatch(task: BatchTask): Promise<BatchAnswer> {
  const answer: BatchAnswer = { results: [] };
  const started = performance.now();
  for (const run of task.runs) {
    if (answer.results.length > 0 && performance.now() - started >= task.budgetMs) break;
    try {
      answer.results.push(await runOne(run));
    } catch (e) {
      answer.results.push({ thrown: messageOf(e) });
    }
  }
  return answer;
}

async function runOne(task: WorkerTask): Promise<RunResult> {
  const problem = await problemFor(task.problemEntry, task.planned.problem, task.uncertified);
  let method: Method;
  try {
    method = await methodFor(task.methodEntry);
  } catch (e) {
    return { ...failedRun(problem, { id: task.planned.method }, task.planned.setting, messageOf(e)), planIndex: task.planned.planIndex };
  }
  return executeRun(problem, method, task.planned, task.options);
}

/**
 * Timed repeats of one (problem, method) pair's measured runs, on a clock process that runs
 * nothing else (see clocks.ts). Answers each setting's timing, null when none came out.
 */
export interface TimeTask {
  kind: 'time';
  problemEntry: string;
  /** Which of the entry's problems (a dispersion yields several). */
  problemId: string;
  methodEntry: string;
  uncertified?: string;
  settings: Setting[];
  options: RunOptions;
  timing: TimingOptions;
}

async function timeGroup(task: TimeTask): Promise<(TimingResult | null)[]> {
  const problem = await problemFor(task.problemEntry, task.problemId, task.uncertified);
  const method = await methodFor(task.methodEntry);
  const out: (TimingResult | null)[] = [];
  for (const setting of task.settings) out.push(await timeRun(problem, method, setting, task.options, task.timing));
  return out;
}

export default async function runTask(
  task: BatchTask | StiffnessTask | CertifyTask | PingTask | TimeTask,
): Promise<BatchAnswer | number | string | null | (TimingResult | null)[]> {
  if (task.kind === 'ping') return null;
  if (task.kind === 'time') return timeGroup(task);
  if (task.kind === 'batch') return runBatch(task);
  if (task.kind === 'certify') return certifyEntry(task.problemEntry);
  return problemStiffnessRatio(await problemFor(task.problemEntry, task.problemId, task.uncertified));
}
