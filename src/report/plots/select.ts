// Which runs become points, and an honest count of the rest: failed runs (by status) and ok runs
// whose value cannot sit on a log axis (missing, zero, negative, NaN or infinite).
import type { ErrorFigure, RunResult } from '../../results/contract.js';
import { isUnresolved } from '../../results/contract.js';
import type { Status } from '../../core/types.js';
import type { Point } from './spec.js';

export interface Measure {
  /** How the measure is named in notes, e.g. "error.final". */
  label: string;
  get: (run: RunResult) => number | null | undefined;
  /** The error figure this measure reads, so runs at the reference's resolution are told apart. */
  figure?: ErrorFigure;
}

/** Reason given for runs whose error is within reach of the reference's resolution. */
export const AT_RESOLUTION = "at the reference's resolution (drawn as grey crosses, not fitted)";

export interface Selection {
  kept: { run: RunResult; point: Point }[];
  /** Runs whose error figure the reference cannot confirm: drawn apart, never fitted or joined. */
  atResolution: { run: RunResult; point: Point }[];
  /** Reason -> number of runs left out for it. */
  leftOut: Map<string, number>;
  total: number;
}

const STATUS_ORDER: readonly Status[] = ['diverged', 'step-underflow', 'step-limit', 'timeout', 'error'];

export function isPlottable(v: number | null | undefined): v is number {
  return typeof v === 'number' && Number.isFinite(v) && v > 0;
}

function bump(m: Map<string, number>, key: string, by = 1): void {
  m.set(key, (m.get(key) ?? 0) + by);
}

function unresolved(run: RunResult, m: Measure): boolean {
  if (!m.figure) return false;
  return isUnresolved(run, m.figure);
}

export function selectPoints(runs: readonly RunResult[], x: Measure, y: Measure): Selection {
  const kept: Selection['kept'] = [];
  const atResolution: Selection['atResolution'] = [];
  const leftOut = new Map<string, number>();
  for (const run of runs) {
    if (run.status !== 'ok') {
      bump(leftOut, run.status);
      continue;
    }
    const xv = x.get(run);
    const yv = y.get(run);
    if (!isPlottable(xv)) {
      bump(leftOut, `${x.label} missing or not > 0`);
      continue;
    }
    if (!isPlottable(yv)) {
      bump(leftOut, `${y.label} missing or not > 0`);
      continue;
    }
    if (unresolved(run, x) || unresolved(run, y)) {
      bump(leftOut, AT_RESOLUTION);
      atResolution.push({ run, point: { x: xv, y: yv } });
      continue;
    }
    kept.push({ run, point: { x: xv, y: yv } });
  }
  return { kept, atResolution, leftOut, total: runs.length };
}

/** Reasons in a fixed order (statuses first, then value reasons alphabetically) for stable text. */
export function orderedReasons(leftOut: ReadonlyMap<string, number>): [string, number][] {
  const statuses = STATUS_ORDER.filter((s) => leftOut.has(s)).map((s) => [s, leftOut.get(s)!] as [string, number]);
  const others = [...leftOut.entries()]
    .filter(([k]) => !(STATUS_ORDER as readonly string[]).includes(k))
    .sort(([a], [b]) => (a < b ? -1 : a > b ? 1 : 0));
  return [...statuses, ...others];
}

export function leftOutCount(leftOut: ReadonlyMap<string, number>): number {
  let n = 0;
  for (const v of leftOut.values()) n += v;
  return n;
}

/** "Left out 3 of 20 runs: diverged 2, error.final missing or not > 0 1", or a line saying none were. */
export function leftOutNote(sel: Pick<Selection, 'leftOut' | 'total'>, unit = 'runs'): string {
  const n = leftOutCount(sel.leftOut);
  if (n === 0) return `All ${sel.total} ${unit} plotted.`;
  const parts = orderedReasons(sel.leftOut).map(([k, v]) => `${k}: ${v}`);
  return `Left out ${n} of ${sel.total} ${unit} (${parts.join('; ')}).`;
}
