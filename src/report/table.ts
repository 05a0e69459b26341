// The per-problem results table as data: one row per run, each cell with its display text (3
// significant digits, exact counts) and a sort key carrying the full value.
import type { ErrorFigure, RunResult } from '../results/contract.js';
import { isUnresolved } from '../results/contract.js';
import { integer, settingLabel, sig3, tightness } from './format.js';
import type { MethodInfo } from './methods.js';

export interface Cell {
  text: string;
  /** Numbers sort numerically; null (no value) sorts last in either direction. */
  sort: number | string | null;
}

export interface Column {
  key: string;
  header: string;
  numeric: boolean;
  cell: (run: RunResult, methods: Map<string, MethodInfo>) => Cell;
  /** Shown only in sections where some run has a value (figures most problems or methods lack). */
  optional?: boolean;
}

function num(v: number | null | undefined, show: (v: number | null | undefined) => string = sig3): Cell {
  return { text: show(v), sort: typeof v === 'number' && !Number.isNaN(v) ? v : null };
}

/** An error figure, marked when the reference cannot confirm it (within reach of its resolution). */
function errorCell(r: RunResult, figure: ErrorFigure): Cell {
  const c = num(r.error[figure]);
  return isUnresolved(r, figure) && c.sort !== null ? { text: `${c.text} (at ref.)`, sort: c.sort } : c;
}

/** Largest drift over the invariants; NaN when any is not finite (a broken run). */
export function maxDrift(run: RunResult): number | null {
  const values = Object.values(run.drift ?? {});
  if (values.length === 0) return null;
  if (values.some((v) => !Number.isFinite(v))) return Number.NaN;
  return Math.max(...values);
}

/**
 * The run's event timing: the worst |time error| over its events' matched crossings, and how many
 * crossings it missed or added; missed or extra sort last, like the event-time measure.
 */
function eventCell(r: RunResult): Cell {
  const records = Object.values(r.events ?? {}).filter((e) => e.reference !== null);
  if (records.length === 0) return { text: '—', sort: null };
  const matched = records.map((e) => e.maxTimeError).filter((v): v is number => v !== null);
  const worst = matched.length > 0 ? Math.max(...matched) : null;
  const missed = records.reduce((a, e) => a + (e.missed ?? 0), 0);
  const extra = records.reduce((a, e) => a + (e.extra ?? 0), 0);
  const notes = [missed > 0 ? `${missed} missed` : '', extra > 0 ? `${extra} extra` : ''].filter(Boolean);
  const text = `${sig3(worst)}${notes.length > 0 ? ` (${notes.join(', ')})` : ''}`;
  return { text, sort: missed + extra > 0 ? Infinity : worst };
}

/** A count, or "not reported" for a program that reports no work. */
function countCell(r: RunResult, v: number): Cell {
  return r.countsReported === false ? { text: 'not reported', sort: null } : num(v, integer);
}

export const COLUMNS: readonly Column[] = [
  { key: 'method', header: 'method', numeric: false, cell: (r, m) => ({ text: m.get(r.method)?.name ?? r.method, sort: m.get(r.method)?.name ?? r.method }) },
  { key: 'setting', header: 'setting', numeric: true, cell: (r) => ({ text: settingLabel(r.setting) + (r.effectiveTolerance ? ` (controls to rtol ${sig3(r.effectiveTolerance.rtol)})` : ''), sort: tightness(r.setting) }) },
  { key: 'status', header: 'status', numeric: false, cell: (r) => ({ text: r.status, sort: r.status }) },
  { key: 'errorFinal', header: 'error.final', numeric: true, cell: (r) => errorCell(r, 'final') },
  { key: 'errorMax', header: 'error.max', numeric: true, cell: (r) => errorCell(r, 'max') },
  { key: 'errorOutputs', header: 'error.outputs', numeric: true, cell: (r) => errorCell(r, 'outputs') },
  { key: 'errorDense', header: 'error.dense', numeric: true, cell: (r) => errorCell(r, 'dense'), optional: true },
  { key: 'eventTime', header: 'event time error', numeric: true, cell: eventCell, optional: true },
  { key: 'drift', header: 'max drift', numeric: true, cell: (r) => num(maxDrift(r)) },
  { key: 'nfev', header: 'nfev', numeric: true, cell: (r) => countCell(r, r.counts.nfev) },
  { key: 'njev', header: 'njev', numeric: true, cell: (r) => countCell(r, r.counts.njev) },
  { key: 'nlu', header: 'nlu', numeric: true, cell: (r) => countCell(r, r.counts.nlu) },
  { key: 'accepted', header: 'accepted', numeric: true, cell: (r) => countCell(r, r.counts.accepted) },
  { key: 'rejected', header: 'rejected', numeric: true, cell: (r) => countCell(r, r.counts.rejected) },
  { key: 'time', header: 'median time [s]', numeric: true, cell: (r) => num(r.time.medianSeconds) },
  { key: 'message', header: 'message', numeric: false, cell: (r) => ({ text: r.message ?? '', sort: r.message ?? null }) },
];

/** The columns of one section's table: every column but the optional ones no run fills. */
export function sectionColumns(runs: readonly RunResult[], methods: Map<string, MethodInfo>): readonly Column[] {
  return COLUMNS.filter((c) => !c.optional || runs.some((r) => c.cell(r, methods).sort !== null));
}

export function tableRows(runs: readonly RunResult[], methods: Map<string, MethodInfo>, columns: readonly Column[] = COLUMNS): Cell[][] {
  return runs.map((r) => columns.map((c) => c.cell(r, methods)));
}
