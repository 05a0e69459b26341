// What every plot builder needs from the results file, computed once per report.
import type { ResultsFile, RunResult } from '../../results/contract.js';
import { methodInfo, type MethodInfo } from '../methods.js';
import { methodOrder, styleAt, type MethodStyle } from './palette.js';

/** Method families in the order their panels and colours follow. */
export const FAMILY_ORDER = ['fixed-step', 'embedded-explicit', 'symplectic', 'implicit', 'extrapolation', 'external'];

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

/**
 * One colour and marker per method for the whole report, assigned in family order (the order of
 * the panels, groups.ts), so the at most eight methods of any panel, or of a plot with eight or
 * fewer, all get different colours.
 */
function familyStyles(results: ResultsFile): Map<string, MethodStyle> {
  const info = methodInfo(results);
  const ids = methodOrder(results);
  const family = (id: string) => FAMILY_ORDER.indexOf(info.get(id)?.family ?? '') + 1 || FAMILY_ORDER.length + 1;
  const ordered = ids.map((id, i) => ({ id, i })).sort((a, b) => family(a.id) - family(b.id) || a.i - b.i);
  return new Map(ordered.map(({ id }, k) => [id, styleAt(k)]));
}

export function plotContext(results: ResultsFile): PlotContext {
  const problemIds = problemOrder(results);
  return {
    results,
    methods: methodInfo(results),
    styles: familyStyles(results),
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

/** Longest display name a legend shows; longer names give way to the (shorter) method id. */
const LEGEND_NAME_MAX = 32;

export function methodName(ctx: PlotContext, id: string): string {
  const name = ctx.methods.get(id)?.name ?? id;
  return name.length <= LEGEND_NAME_MAX ? name : id;
}

/** The unit of a problem's error.final, when its record declares one ("relative" for relative scales). */
export function errorUnitOf(ctx: PlotContext, problem: string): string | undefined {
  const u = ctx.results.problems.find((p) => p.id === problem)?.errorUnit;
  return typeof u === 'string' ? u : undefined;
}

/** The time unit a problem declares, if any. */
export function timeUnitOf(ctx: PlotContext, problem: string): string | undefined {
  const u = (ctx.results.problems.find((p) => p.id === problem)?.units as { time?: unknown } | undefined)?.time;
  return typeof u === 'string' ? u : undefined;
}
