// results.csv: one row per run. The first columns are the contract's and keep their meaning;
// later columns are extras.
import { stringify } from 'csv-stringify/sync';
import type { ResultsFile, RunResult } from '../core/results.js';

export const CSV_COLUMNS = [
  'problem', 'method', 'rtol', 'atol', 'steps', 'h', 'status',
  'error_final', 'error_max', 'drift_max', 'nfev', 'njev', 'nlu', 'accepted', 'rejected', 'time_median_s',
  'time_samples', 'error_below_reference', 'round_trip', 'message',
] as const;

function cell(v: number | null | undefined): string {
  return v === null || v === undefined || Number.isNaN(v) ? '' : String(v);
}

function driftMax(run: RunResult): number | null {
  const values = Object.values(run.drift);
  return values.length === 0 ? null : Math.max(...values);
}

function row(run: RunResult): string[] {
  const s = run.setting;
  const adaptive = 'rtol' in s;
  return [
    run.problem,
    run.method,
    adaptive ? cell(s.rtol) : '',
    adaptive ? (typeof s.atol === 'number' ? cell(s.atol) : s.atol.join(' ')) : '',
    adaptive ? '' : cell(s.steps),
    adaptive ? '' : cell(s.h),
    run.status,
    cell(run.error.final),
    cell(run.error.max),
    cell(driftMax(run)),
    cell(run.counts.nfev),
    cell(run.counts.njev),
    cell(run.counts.nlu),
    cell(run.counts.accepted),
    cell(run.counts.rejected),
    cell(run.time.medianSeconds),
    cell(run.time.samples),
    run.errorBelowReference ? 'true' : '',
    cell(run.roundTrip),
    run.message ?? '',
  ];
}

export function resultsCsv(results: ResultsFile): string {
  return stringify([[...CSV_COLUMNS], ...results.runs.map(row)]);
}
