// results.csv: one row per run. The first columns are the contract's and keep their meaning;
// later columns are extras.
//
// The text follows RFC 4180 (a field holding a comma, a double quote or a line break is quoted,
// its quotes doubled; rows end in a line feed), written here rather than by csv-stringify: that
// library took 17-42 ms for the catalogue sweep's 864 rows, after the last run, where this takes
// about one. test/csv.test.ts checks the text against csv-stringify and reads it back with
// csv-parse.
import type { ResultsFile, RunResult } from './contract.js';

export const CSV_COLUMNS = [
  'problem', 'method', 'rtol', 'atol', 'steps', 'h', 'status',
  'error_final', 'error_max', 'drift_max', 'nfev', 'njev', 'nlu', 'accepted', 'rejected', 'time_median_s',
  'time_samples', 'error_below_reference', 'round_trip', 'message',
  'orbit_position_final', 'orbit_radial_final', 'orbit_in_track_final', 'orbit_cross_track_final', 'orbit_position_max', 'orbit_in_track_max',
  'event_time_error_max', 'events_missed', 'events_extra', 'effective_rtol',
  'error_outputs', 'unresolved', 'landing',
] as const;

function cell(v: number | null | undefined): string {
  return v === null || v === undefined || Number.isNaN(v) ? '' : String(v);
}

function driftMax(run: RunResult): number | null {
  const values = Object.values(run.drift);
  return values.length === 0 ? null : Math.max(...values);
}

/** Sum of a count over the run's events (empty when none was compared). */
function eventCount(run: RunResult, key: 'missed' | 'extra'): number | null {
  const counted = Object.values(run.events ?? {}).filter((e) => e[key] !== null);
  return counted.length === 0 ? null : counted.reduce((a, e) => a + e[key]!, 0);
}

function eventTimeMax(run: RunResult): number | null {
  const values = Object.values(run.events ?? {}).map((e) => e.maxTimeError).filter((v): v is number => v !== null);
  return values.length === 0 ? null : Math.max(...values);
}

function row(run: RunResult): string[] {
  const o = run.orbitError;
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
    cell(o?.final?.position),
    cell(o?.final?.radial),
    cell(o?.final?.inTrack),
    cell(o?.final?.crossTrack),
    cell(o?.max?.position),
    cell(o?.max?.inTrack),
    cell(eventTimeMax(run)),
    cell(eventCount(run, 'missed')),
    cell(eventCount(run, 'extra')),
    cell(run.effectiveTolerance?.rtol),
    cell(run.error.outputs),
    (run.unresolved ?? []).join(' '),
    run.landing ?? '',
  ];
}

const NEEDS_QUOTES = /[",\r\n]/;

function field(text: string): string {
  return NEEDS_QUOTES.test(text) ? `"${text.replaceAll('"', '""')}"` : text;
}

/** Rows as RFC 4180 text, each ending in a line feed. */
export function csvText(rows: readonly (readonly string[])[]): string {
  let out = '';
  for (const r of rows) out += `${r.map(field).join(',')}\n`;
  return out;
}

export function resultsCsv(results: ResultsFile): string {
  return csvText([[...CSV_COLUMNS], ...results.runs.map(row)]);
}
