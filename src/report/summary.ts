// Summary figures computed from the runs: counts, failures by status, and the cheapest method
// per problem that reached each of a few error levels.
import type { ResultsFile, RunResult } from '../results/contract.js';
import type { Status } from '../core/types.js';
import { problemOrder } from './plots/context.js';
import { methodOrder } from './plots/palette.js';

/** Error levels the summary asks about, every 3 decades; only levels some run reached are shown. */
export const ERROR_LEVELS: readonly number[] = [1e-3, 1e-6, 1e-9, 1e-12];

const FAILURE_ORDER: readonly Status[] = ['diverged', 'step-underflow', 'step-limit', 'timeout', 'error'];

export interface BestAtLevel {
  level: number;
  /** Fewest right-hand-side evaluations among ok runs with error.final <= level. */
  byNfev: { run: RunResult } | null;
  /** Smallest median time among the same runs; null when no such run was timed. */
  byTime: { run: RunResult } | null;
}

export interface Summary {
  problems: number;
  methods: number;
  runs: number;
  ok: number;
  failures: [Status, number][];
  levels: number[];
  best: { problem: string; levels: BestAtLevel[] }[];
}

function reaches(r: RunResult, level: number): boolean {
  const e = r.error.final;
  return r.status === 'ok' && typeof e === 'number' && Number.isFinite(e) && e >= 0 && e <= level;
}

/** Ties go to the earlier method in the results file, then the earlier run, so the answer is stable. */
function argmin(runs: readonly RunResult[], key: (r: RunResult) => number | null, rank: Map<string, number>): RunResult | null {
  let best: RunResult | null = null;
  let bestKey = Infinity;
  for (const r of runs) {
    const k = key(r);
    if (k === null || !Number.isFinite(k)) continue;
    if (k < bestKey || (k === bestKey && best && rank.get(r.method)! < rank.get(best.method)!)) {
      best = r;
      bestKey = k;
    }
  }
  return best;
}

export function summarize(results: ResultsFile): Summary {
  const methods = methodOrder(results);
  const rank = new Map(methods.map((m, i) => [m, i]));
  const failures = FAILURE_ORDER.map((s) => [s, results.runs.filter((r) => r.status === s).length] as [Status, number]).filter(
    ([, n]) => n > 0,
  );
  const levels = ERROR_LEVELS.filter((l) => results.runs.some((r) => reaches(r, l)));
  const best = problemOrder(results).map((problem) => {
    const runs = results.runs.filter((r) => r.problem === problem);
    return {
      problem,
      levels: levels.map((level) => {
        const hit = runs.filter((r) => reaches(r, level));
        const byNfev = argmin(hit, (r) => r.counts.nfev, rank);
        const byTime = argmin(hit, (r) => r.time.medianSeconds, rank);
        return { level, byNfev: byNfev && { run: byNfev }, byTime: byTime && { run: byTime } };
      }),
    };
  });
  return {
    problems: problemOrder(results).length,
    methods: new Set(results.runs.map((r) => r.method)).size,
    runs: results.runs.length,
    ok: results.runs.filter((r) => r.status === 'ok').length,
    failures,
    levels,
    best,
  };
}
