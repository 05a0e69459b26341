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
  { key: 'drift', header: 'max drift', numeric: true, cell: (r) => num(maxDrift(r)) },
  { key: 'nfev', header: 'nfev', numeric: true, cell: (r) => countCell(r, r.counts.nfev) },
  { key: 'njev', header: 'njev', numeric: true, cell: (r) => countCell(r, r.counts.njev) },
  { key: 'nlu', header: 'nlu', numeric: true, cell: (r) => countCell(r, r.counts.nlu) },
  { key: 'accepted', header: 'accepted', numeric: true, cell: (r) => countCell(r, r.counts.accepted) },
  { key: 'rejected', header: 'rejected', numeric: true, cell: (r) => countCell(r, r.counts.rejected) },
  { key: 'time', header: 'median time [s]', numeric: true, cell: (r) => num(r.time.medianSeconds) },
  { key: 'message', header: 'message', numeric: false, cell: (r) => ({ text: r.message ?? '', sort: r.message ?? null }) },
];

export function tableRows(runs: readonly RunResult[], methods: Map<string, MethodInfo>): Cell[][] {
  return runs.map((r) => COLUMNS.map((c) => c.cell(r, methods)));
}
