// Error distributions over the samples of a dispersion: per nominal problem, method and setting,
// the median, a chosen quantile and the worst sample (named, so it can be rerun alone). A run that
// did not finish ok counts as an infinite error: a setting that fails on a sample fails there.
import type { ProblemRecord, ResultsFile, RunResult } from '../results/contract.js';
import { resolvedError, runKey } from '../results/contract.js';
import { quantileOf } from '../core/quantile.js';

export interface SampleError {
  sample: number;
  problem: string;
  error: number;
  status: RunResult['status'];
}

export interface DispersionRow {
  /** The nominal problem's id. */
  of: string;
  method: string;
  setting: RunResult['setting'];
  samples: number;
  failed: number;
  median: number;
  /** Error at the requested quantile (nearest rank, see quantileOf). */
  quantile: number;
  /**
   * The same quantile over the errors the samples' references confirm (an unresolved error counts
   * as infinite, as in choose): what a target is judged by.
   */
  confirmedQuantile: number;
  worst: SampleError;
  /** Mean function evaluations per sample. */
  meanNfev: number;
}

export interface DispersionSummary {
  /** The quantile reported in every row, e.g. 0.95. */
  q: number;
  measure: 'final' | 'max';
  rows: DispersionRow[];
}

/** Problem id -> its dispersion tag, for the problems of a results file that are samples. */
export function samplesOf(results: Pick<ResultsFile, 'problems'>): Map<string, { of: string; sample: number }> {
  const out = new Map<string, { of: string; sample: number }>();
  for (const p of results.problems) {
    const tag = (p as ProblemRecord & { dispersion?: { of?: unknown; sample?: unknown } }).dispersion;
    if (tag && typeof tag.of === 'string' && typeof tag.sample === 'number') out.set(p.id, { of: tag.of, sample: tag.sample });
  }
  return out;
}

export function dispersionSummary(results: Pick<ResultsFile, 'problems' | 'runs'>, q = 0.95, measure: 'final' | 'max' = 'final'): DispersionSummary {
  const tags = samplesOf(results);
  const groups = new Map<string, { of: string; method: string; setting: RunResult['setting']; errors: SampleError[]; confirmed: number[]; nfev: number }>();
  for (const r of results.runs) {
    const tag = tags.get(r.problem);
    if (!tag) continue;
    const key = runKey({ problem: tag.of, method: r.method, setting: r.setting });
    let g = groups.get(key);
    if (!g) groups.set(key, (g = { of: tag.of, method: r.method, setting: r.setting, errors: [], confirmed: [], nfev: 0 }));
    const e = measure === 'final' ? r.error.final : r.error.max;
    g.errors.push({ sample: tag.sample, problem: r.problem, status: r.status, error: r.status === 'ok' && e !== null && Number.isFinite(e) ? e : Infinity });
    g.confirmed.push(resolvedError(r, measure) ?? Infinity);
    g.nfev += r.counts.nfev;
  }
  const rows: DispersionRow[] = [];
  for (const g of groups.values()) {
    const sorted = g.errors.map((e) => e.error).sort((a, b) => a - b);
    // Worst: the largest error; among equals (failures), the lowest sample number, so it is stable.
    const worst = g.errors.reduce((w, e) => (e.error > w.error || (e.error === w.error && e.sample < w.sample) ? e : w));
    rows.push({
      of: g.of,
      method: g.method,
      setting: g.setting,
      samples: g.errors.length,
      failed: g.errors.filter((e) => e.status !== 'ok').length,
      median: quantileOf(sorted, 0.5),
      quantile: quantileOf(sorted, q),
      confirmedQuantile: quantileOf(g.confirmed.sort((a, b) => a - b), q),
      worst,
      meanNfev: g.nfev / g.errors.length,
    });
  }
  return { q, measure, rows };
}
