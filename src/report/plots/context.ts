// What every plot builder needs from the results file, computed once per report.
import type { ResultsFile, RunResult } from '../../results/contract.js';
import { methodInfo, type MethodInfo } from '../methods.js';
import { assignStyles, methodOrder, type MethodStyle } from './palette.js';

export interface PlotContext {
  results: ResultsFile;
  methods: Map<string, MethodInfo>;
  styles: Map<string, MethodStyle>;
  /** Method ids in style order; series are always emitted in this order. */
  methodIds: string[];
  /** Problem id -> file-name stem, unique within the report. */
  slugs: Map<string, string>;
  problemIds: string[];
}

/** Problems in results order, then any that only appear in runs. */
export function problemOrder(results: ResultsFile): string[] {
  const ids: string[] = [];
  const seen = new Set<string>();
  for (const id of [...results.problems.map((p) => p.id), ...results.runs.map((r) => r.problem)]) {
    if (!seen.has(id)) {
      seen.add(id);
      ids.push(id);
    }
  }
  return ids;
}

/** Ids come from user files, so file names keep only [a-z0-9_-] and get a counter on collisions. */
export function slugify(ids: readonly string[]): Map<string, string> {
  const out = new Map<string, string>();
  const used = new Set<string>();
  for (const id of ids) {
    const base = id.toLowerCase().replace(/[^a-z0-9_-]+/g, '-').replace(/^-+|-+$/g, '').slice(0, 60) || 'problem';
    let slug = base;
    for (let i = 2; used.has(slug); i++) slug = `${base}-${i}`;
    used.add(slug);
    out.set(id, slug);
  }
  return out;
}

export function plotContext(results: ResultsFile): PlotContext {
  const problemIds = problemOrder(results);
  return {
    results,
    methods: methodInfo(results),
    styles: assignStyles(results),
    methodIds: methodOrder(results),
    slugs: slugify(problemIds),
    problemIds,
  };
}

export function runsOf(ctx: PlotContext, problem: string): RunResult[] {
  return ctx.results.runs.filter((r) => r.problem === problem);
}

export function problemTitle(ctx: PlotContext, problem: string): string {
  const p = ctx.results.problems.find((q) => q.id === problem);
  return p && p.title ? `${p.title} (${problem})` : problem;
}

export function methodName(ctx: PlotContext, id: string): string {
  return ctx.methods.get(id)?.name ?? id;
}
