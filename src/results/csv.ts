// results.csv: one row per run. The first columns are the contract's and keep their meaning;
// later columns are extras.
//
// The text follows RFC 4180 (a field holding a comma, a double quote or a line break is quoted,
// its quotes doubled; rows end in a line feed), written here rather than by csv-stringify, which
// cost tens of milliseconds at the end of every sweep (README, "Stack"). test/csv.test.ts checks
// the text against csv-stringify and reads it back with csv-parse.
import type { ResultsFile, RunResult } from './contract.js';

function cell(v: number | null | undefined): string {
  return v === null || v === undefined || Number.isNaN(v) ? '' : String(v);
}

/**
 * A text cell a spreadsheet would run as a formula (it starts with =, +, -, @, a tab or a carriage
 * return) gets a leading apostrophe, as the OWASP guidance on CSV injection recommends. Only text
 * cells (ids, messages) pass through here; numbers such as -1.5e-3 are written as they are.
 */
export function neutralised(text: string): string {
  return /^[=+\-@\t\r]/.test(text) ? `'${text}` : text;
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

/** A count, or an empty cell when the method did not report its work (an external program). */
const count = (r: RunResult, v: number): string => (r.countsReported === false ? '' : cell(v));

/** One column: its header and how a run fills it. Defined once, so header and rows cannot drift apart. */
type Column = readonly [name: string, value: (run: RunResult) => string];

const adaptive = (run: RunResult) => ('rtol' in run.setting ? run.setting : null);
const fixed = (run: RunResult) => ('steps' in run.setting ? run.setting : null);

const COLUMNS: readonly Column[] = [
  ['problem', (r) => neutralised(r.problem)],
  ['method', (r) => neutralised(r.method)],
  ['rtol', (r) => cell(adaptive(r)?.rtol)],
  ['atol', (r) => { const atol = adaptive(r)?.atol; return typeof atol === 'object' ? atol.join(' ') : cell(atol); }],
  ['steps', (r) => cell(fixed(r)?.steps)],
  ['h', (r) => cell(fixed(r)?.h)],
  ['status', (r) => r.status],
  ['error_final', (r) => cell(r.error.final)],
  ['error_max', (r) => cell(r.error.max)],
  ['drift_max', (r) => cell(driftMax(r))],
  ['nfev', (r) => count(r, r.counts.nfev)],
  ['njev', (r) => count(r, r.counts.njev)],
  ['nlu', (r) => count(r, r.counts.nlu)],
  ['accepted', (r) => count(r, r.counts.accepted)],
  ['rejected', (r) => count(r, r.counts.rejected)],
  ['time_median_s', (r) => cell(r.time.medianSeconds)],
  ['time_samples', (r) => cell(r.time.samples)],
  ['error_below_reference', (r) => (r.errorBelowReference ? 'true' : '')],
  ['round_trip', (r) => cell(r.roundTrip)],
  ['message', (r) => neutralised(r.message ?? '')],
  ['orbit_position_final', (r) => cell(r.orbitError?.final?.position)],
  ['orbit_radial_final', (r) => cell(r.orbitError?.final?.radial)],
  ['orbit_in_track_final', (r) => cell(r.orbitError?.final?.inTrack)],
  ['orbit_cross_track_final', (r) => cell(r.orbitError?.final?.crossTrack)],
  ['orbit_position_max', (r) => cell(r.orbitError?.max?.position)],
  ['orbit_in_track_max', (r) => cell(r.orbitError?.max?.inTrack)],
  ['event_time_error_max', (r) => cell(eventTimeMax(r))],
  ['events_missed', (r) => cell(eventCount(r, 'missed'))],
  ['events_extra', (r) => cell(eventCount(r, 'extra'))],
  ['effective_rtol', (r) => cell(r.effectiveTolerance?.rtol)],
  ['error_outputs', (r) => cell(r.error.outputs)],
  ['unresolved', (r) => (r.unresolved ?? []).join(' ')],
  ['landing', (r) => r.landing ?? ''],
  ['error_dense', (r) => cell(r.error.dense)],
];

/** The header row: the contract's columns first (DESIGN.md), extras after. */
export const CSV_COLUMNS: readonly string[] = COLUMNS.map(([name]) => name);

function row(run: RunResult): string[] {
  return COLUMNS.map(([, value]) => value(run));
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

/** The header line of results.csv, for writing it a run at a time (see csvRunLine). */
export function csvHeaderLine(): string {
  return csvText([CSV_COLUMNS]);
}

/** One run's line of results.csv; the header line and these, in order, are resultsCsv's text. */
export function csvRunLine(run: RunResult): string {
  return csvText([row(run)]);
}
