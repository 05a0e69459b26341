// Summary figures computed from the runs: counts, failures by status, and the cheapest method
// per problem that reached each of a few error levels. The levels come from the errors each
// problem's runs actually reached (or from the user), so a model measured in metres or in
// micro-units gets a table as a unit-free catalogue problem does.
import { resolvedError, type ResultsFile, type RunResult } from '../results/contract.js';
import type { Status } from '../core/types.js';
import { problemOrder } from './plots/context.js';
import { methodOrder } from './plots/palette.js';

/**
 * Error levels for one problem from the final errors its ok runs reached: the decade of the
 * smallest error (rounded up, so some run reaches it), the decade at or below the largest, and
 * the decade halfway between; fewer when the errors span fewer decades.
 */
export function derivedLevels(errors: readonly number[]): number[] {
  const e = errors.filter((x) => Number.isFinite(x) && x > 0);
  if (e.length === 0) return [];
  const tight = Math.ceil(Math.log10(Math.min(...e)));
  const loose = Math.max(tight, Math.floor(Math.log10(Math.max(...e))));
  const picks = loose === tight ? [tight] : [loose, Math.round((loose + tight) / 2), tight];
  return [...new Set(picks)].map((k) => Number(`1e${k}`));
}

const FAILURE_ORDER: readonly Status[] = ['diverged', 'step-underflow', 'step-limit', 'timeout', 'error'];

export interface BestAtLevel {
  level: number;
  /** Fewest right-hand-side evaluations among ok runs with a confirmed error.final <= level. */
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
  /** Every level used for some problem, loosest first. */
  levels: number[];
  /** Per problem, its own levels (derived from its errors, or the user's). */
  best: { problem: string; levels: BestAtLevel[] }[];
  /** True when the levels are the user's, not derived. */
  userLevels: boolean;
  /** Plain findings the reader must not miss (a program whose setting changes nothing). */
  findings: string[];
}

function settingWord(r: RunResult): string {
  return 'rtol' in r.setting ? `rtol ${r.setting.rtol}` : `${r.setting.steps} steps`;
}

/** Problems measured against a self-reference: said at the top, with what it cannot show. */
function selfReferenceFindings(results: ResultsFile): string[] {
  return results.problems
    .filter((p) => p.reference.kind === 'self')
    .map((p) => `${p.id} is measured against a self-reference (each program at a much tighter setting, trust from its two tightest settings): the errors show how each program's answer moves with its setting, but cannot reveal a model error or a bias shared by every setting.`);
}

/** One finding per (problem, method) whose program reported the same trajectory at several settings. */
function unchangedSettingFindings(results: ResultsFile): string[] {
  const out: string[] = [];
  const groups = new Map<string, RunResult[]>();
  for (const r of results.runs) {
    if (!r.settingIgnored) continue;
    const key = `${r.method} on ${r.problem}`;
    groups.set(key, [...(groups.get(key) ?? []), r]);
  }
  for (const [key, runs] of groups) {
    out.push(`${key}: the program reported exactly the same trajectory at ${runs.map(settingWord).join(', ')}; changing its setting changed nothing, so these runs measure one solve, not a sweep.`);
  }
  return out;
}

/** Only an error the reference confirms reaches a level. */
function reaches(r: RunResult, level: number): boolean {
  const e = resolvedError(r, 'final');
  return typeof e === 'number' && Number.isFinite(e) && e >= 0 && e <= level;
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

/** `levels`: the user's error levels (e.g. a target); without them each problem's are derived. */
export function summarize(results: ResultsFile, levels?: readonly number[]): Summary {
  const methods = methodOrder(results);
  const rank = new Map(methods.map((m, i) => [m, i]));
  const failures = FAILURE_ORDER.map((s) => [s, results.runs.filter((r) => r.status === s).length] as [Status, number]).filter(
    ([, n]) => n > 0,
  );
  const best = problemOrder(results).map((problem) => {
    const runs = results.runs.filter((r) => r.problem === problem);
    const own = levels ? [...levels].sort((a, b) => b - a) : derivedLevels(runs.filter((r) => r.status === 'ok').map((r) => r.error.final ?? NaN));
    return {
      problem,
      levels: own.map((level) => {
        const hit = runs.filter((r) => reaches(r, level));
        const byNfev = argmin(hit, (r) => (r.countsReported === false ? null : r.counts.nfev), rank);
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
    levels: [...new Set(best.flatMap((b) => b.levels.map((l) => l.level)))].sort((a, b) => b - a),
    best,
    userLevels: levels !== undefined,
    findings: [...selfReferenceFindings(results), ...unchangedSettingFindings(results)],
  };
}

/** Where the summary's levels come from, in one sentence. */
export function levelsNote(s: Pick<Summary, 'userLevels'>): string {
  return s.userLevels
    ? 'Error levels as given (--summary-levels).'
    : "Error levels per problem from the errors its runs reached: the decade of the smallest, the decade of the largest and one between, in the problem's own error scale.";
}
