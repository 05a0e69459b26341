// The report's view of a dispersion: its samples collapsed into one problem whose runs are the
// error quantiles per method and setting, so the report draws error quantiles against work (and
// lists them) instead of a section and a set of plots per sample. results.json is untouched.
import type { ProblemRecord, ResultsFile, RunResult } from '../results/contract.js';
import { dispersionSummary, samplesOf } from './dispersion-summary.js';
import { runKey } from '../results/contract.js';
import { sig3 } from './format.js';

/** The share of samples the collapsed runs show (their error is the error at this quantile). */
export const REPORT_QUANTILE = 0.95;

export function withDispersionsCollapsed(results: ResultsFile, q = REPORT_QUANTILE): ResultsFile {
  const tags = samplesOf(results);
  if (tags.size === 0) return results;
  const finals = dispersionSummary(results, q, 'final');
  const maxima = new Map(dispersionSummary(results, q, 'max').rows.map((r) => [runKey({ problem: r.of, method: r.method, setting: r.setting }), r]));
  const pct = `${(q * 100).toPrecision(3).replace(/\.?0+$/, '')}th percentile`;
  const collapsed: RunResult[] = finals.rows.map((row) => {
    const key = runKey({ problem: row.of, method: row.method, setting: row.setting });
    const first = results.runs.find((r) => tags.get(r.problem)?.of === row.of && runKey({ problem: row.of, method: r.method, setting: r.setting }) === key)!;
    const max = maxima.get(key);
    const finite = (v: number | undefined) => (v !== undefined && Number.isFinite(v) ? v : null);
    return {
      ...first,
      problem: envelopeId(row.of),
      status: row.failed === row.samples ? first.status : 'ok',
      message: `${pct} over ${row.samples} samples; median ${sig3(row.median)}, worst ${sig3(row.worst.error)} (${row.worst.problem})${row.failed ? `; ${row.failed} sample(s) failed` : ''}`,
      error: { final: finite(row.quantile), max: finite(max?.quantile) },
      counts: { ...first.counts, nfev: Math.round(row.meanNfev) },
      time: { medianSeconds: null, samples: 0 },
      drift: {},
      trace: undefined,
    } as RunResult;
  });
  const problems: ProblemRecord[] = [];
  const seen = new Set<string>();
  for (const p of results.problems) {
    const tag = tags.get(p.id);
    if (!tag) {
      problems.push(p);
      continue;
    }
    if (seen.has(tag.of)) continue;
    seen.add(tag.of);
    const count = [...tags.values()].filter((t) => t.of === tag.of).length;
    problems.push({
      ...p,
      id: envelopeId(tag.of),
      title: `${tag.of}: dispersion of ${count} samples, ${pct} of the error (nfev: mean per sample)`,
      dispersion: undefined,
    });
  }
  return { ...results, runs: [...results.runs.filter((r) => !tags.has(r.problem)), ...collapsed], problems };
}

/** Id of a dispersion's collapsed view in reports. */
export function envelopeId(of: string): string {
  return `${of}-dispersion`;
}
