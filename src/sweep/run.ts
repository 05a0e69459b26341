// Running a planned sweep in this process and assembling the results file.
import type { Method, Problem } from '../core/types.js';
import type { ProblemRecord, ResultsFile, RunResult } from '../core/results.js';
import { RESULTS_FORMAT, RESULTS_VERSION } from '../core/results.js';
import { sha256 } from '../core/hash.js';
import { environmentFingerprint } from '../measure/environment.js';
import { calibrationSeconds } from '../measure/timing.js';
import { executeRun, type ExecuteOptions } from './execute.js';
import type { PlannedRun, SweepPlan } from './plan.js';

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
}

export function problemRecord(p: Problem): ProblemRecord {
  const ref: ProblemRecord['reference'] = { kind: p.reference.kind };
  if (p.reference.digits !== undefined) ref.digits = p.reference.digits;
  if (p.reference.source !== undefined) ref.source = p.reference.source;
  return { id: p.id, title: p.title, sha256: sha256(p.definition), stiff: p.stiff, reference: ref, source: p.source, dimension: p.dimension };
}

export function methodRecord(m: Method): Record<string, unknown> {
  const rec: Record<string, unknown> = { id: m.id, name: m.name, family: m.family, order: m.order, source: m.source, adaptive: m.adaptive, stiff: m.stiff };
  if (m.embeddedOrder !== undefined) rec.embeddedOrder = m.embeddedOrder;
  return rec;
}

export async function executePlan(
  runs: readonly PlannedRun[],
  problems: ReadonlyMap<string, Problem>,
  methods: ReadonlyMap<string, Method>,
  options: SweepOptions,
): Promise<RunResult[]> {
  const out: RunResult[] = [];
  let failed = 0;
  for (const planned of runs) {
    if (options.shouldStop?.()) break;
    const run = await executeRun(problems.get(planned.problem)!, methods.get(planned.method)!, planned, options);
    if (run.status !== 'ok') failed++;
    out.push(run);
    options.onRun?.({ done: out.length, total: runs.length, failed, last: run });
  }
  return out;
}

export interface AssembleInput {
  plan: SweepPlan;
  problems: readonly Problem[];
  methods: readonly Method[];
  runs: RunResult[];
  timed: boolean;
  interrupted?: boolean;
}

export async function assembleResults(input: AssembleInput): Promise<ResultsFile> {
  const environment = environmentFingerprint();
  if (input.timed) environment.calibrationSeconds = await calibrationSeconds();
  const usedProblems = new Set(input.plan.runs.map((r) => r.problem));
  const results: ResultsFile = {
    format: RESULTS_FORMAT,
    version: RESULTS_VERSION,
    createdAt: new Date().toISOString(),
    environment,
    runs: [...input.runs].sort((a, b) => (a.planIndex ?? 0) - (b.planIndex ?? 0)),
    problems: input.problems.filter((p) => usedProblems.has(p.id) || input.plan.runs.length === 0).map(problemRecord),
    methods: input.methods.map(methodRecord),
    plan: { sha256: input.plan.sha256, runs: input.plan.runs.length },
    skipped: input.plan.skipped,
  };
  if (input.interrupted) results.interrupted = true;
  return results;
}
