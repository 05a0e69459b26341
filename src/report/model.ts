// Everything the HTML and Markdown renderers show, gathered once so the two say the same thing.
import type { ProblemRecord, ResultsFile, RunResult } from '../results/contract.js';
import { tightness } from './format.js';
import type { MethodInfo } from './methods.js';
import type { PlotContext, ProblemPlots } from './plots/index.js';
import { summarize, type Summary } from './summary.js';

export interface ProblemSection {
  id: string;
  slug: string;
  title: string;
  record: ProblemRecord | null;
  runs: RunResult[];
  plots: ProblemPlots['items'];
}

export interface ReportModel {
  title: string;
  /** The command line that made the results, when recorded. */
  commandLine: string | null;
  /** Every setting of the sweep as asked, label/value pairs. */
  request: [string, string][];
  results: ResultsFile;
  methods: Map<string, MethodInfo>;
  summary: Summary;
  /** Label/value pairs of the environment fingerprint, in a fixed order. */
  environment: [string, string][];
  sections: ProblemSection[];
}

function envText(v: unknown): string {
  if (v === undefined || v === null || v === '') return '(not recorded)';
  return String(v);
}

export function environmentRows(results: ResultsFile): [string, string][] {
  const e = results.environment;
  return [
    ['stepgauge version', envText(e.stepgauge)],
    ['commit', envText(e.commit)],
    ['node', envText(e.node)],
    ['platform', envText(e.platform)],
    ['arch', envText(e.arch)],
    ['cpu', envText(e.cpu)],
    ['cpu count', envText(e.cpuCount)],
    ['calibration workload [s]', envText(e.calibrationSeconds)],
    ['results created', envText(results.createdAt)],
  ];
}

function listText(v: unknown): string {
  const one = (x: unknown) => (typeof x === 'number' && x !== 0 && (Math.abs(x) < 1e-3 || Math.abs(x) >= 1e5) ? x.toExponential() : String(x));
  return Array.isArray(v) ? v.map(one).join(', ') : one(v);
}

/** The request as recorded in results.json (`request`), each setting named, defaults said. */
export function requestRows(results: ResultsFile): [string, string][] {
  const r = (results.request ?? null) as Record<string, unknown> | null;
  if (!r) return [['request', '(not recorded in this results file)']];
  const timing = r.timing as { budgetSeconds?: number; minSamples?: number } | null | undefined;
  const shard = r.shard as { index: number; count: number } | undefined;
  return [
    ['problems', r.problem === undefined ? 'the whole catalogue' : String(r.problem)],
    ['methods', r.method === undefined ? 'all that apply' : String(r.method)],
    ['rtol values (adaptive methods)', r.tolerances === undefined ? 'default' : listText(r.tolerances)],
    ['atol', r.atol === undefined ? 'rtol, scaled where the problem declares atolScale' : listText(r.atol)],
    ['equal-step counts (fixed-step methods)', r.steps === undefined ? "each problem's own doubling ladder, else the default ladder" : listText(r.steps)],
    ['step limit per run', r.maxSteps === undefined ? 'default' : String(r.maxSteps)],
    ['step-size controller (explicit pairs)', r.controller === undefined ? 'standard' : String(r.controller)],
    ['timing', timing ? `median of repeated solves, budget ${timing.budgetSeconds} s per run, at least ${timing.minSamples} samples` : 'off (times recorded as null)'],
    ['run timeout', r.runTimeoutSeconds === undefined ? 'none' : `${r.runTimeoutSeconds} s`],
    ['shard', shard ? `${shard.index} of ${shard.count}` : 'the whole plan'],
  ];
}

/**
 * Where a problem's reference comes from and whether it is independent of the methods measured
 * against it: a certified reference made by methods of this sweep is not independent evidence
 * for those methods.
 */
export function referenceIndependence(record: ProblemRecord | null, methodIds: readonly string[]): string {
  const ref = record?.reference;
  if (!ref) return 'No problem record: the reference is unknown.';
  if (ref.kind === 'exact') return 'An exact solution: independent of every method.';
  if (ref.kind === 'published') return 'Published values: independent of every method run here.';
  const by = ref.certifiedBy?.methods ?? [];
  if (by.length === 0) return 'Certified; the methods that made it are not recorded, so its independence cannot be said.';
  const inSweep = by.filter((m) => methodIds.includes(m));
  return inSweep.length === 0
    ? `Certified by ${by.join(' and ')}, none of which is measured here: independent of every method run.`
    : `Certified by ${by.join(' and ')}: ${inSweep.join(' and ')} ${inSweep.length === 1 ? 'is' : 'are'} measured against a reference ${inSweep.length === 1 ? 'it' : 'they'} helped make, so ${inSweep.length === 1 ? 'its' : 'their'} errors here are not independent evidence; the other methods' are.`;
}

export function buildModel(ctx: PlotContext, plots: ProblemPlots[], title: string, levels?: readonly number[]): ReportModel {
  const rank = new Map(ctx.methodIds.map((m, i) => [m, i]));
  const sections = plots.map(({ problem, items }) => {
    const record = ctx.results.problems.find((p) => p.id === problem) ?? null;
    const runs = ctx.results.runs
      .filter((r) => r.problem === problem)
      .sort((a, b) => rank.get(a.method)! - rank.get(b.method)! || tightness(a.setting) - tightness(b.setting));
    return { id: problem, slug: ctx.slugs.get(problem)!, title: record?.title ?? problem, record, runs, plots: items };
  });
  return {
    title,
    commandLine: typeof ctx.results.command === 'string' ? ctx.results.command : null,
    request: requestRows(ctx.results),
    results: ctx.results,
    methods: ctx.methods,
    summary: summarize(ctx.results, levels),
    environment: environmentRows(ctx.results),
    sections,
  };
}
