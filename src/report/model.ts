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

export function buildModel(ctx: PlotContext, plots: ProblemPlots[], title: string): ReportModel {
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
    results: ctx.results,
    methods: ctx.methods,
    summary: summarize(ctx.results),
    environment: environmentRows(ctx.results),
    sections,
  };
}
