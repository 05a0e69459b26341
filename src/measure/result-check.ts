// Checks what a method's solve returned before it becomes a run record. Built-in methods always
// pass; a method module may return anything, and a record the results reader would refuse
// (unknown status, negative or fractional counts) or one that calls a NaN state `ok` must never
// be written. Problems become the run's status and message; the sweep goes on.
import { STATUSES, type Counts, type SolveResult } from '../core/types.js';

const COUNT_KEYS = ['nfev', 'njev', 'nlu', 'accepted', 'rejected'] as const;

/** A module's value in a message: short, one line, never more than a few dozen characters. */
export function shortValue(value: unknown): string {
  let text: string;
  try {
    text = typeof value === 'string' ? JSON.stringify(value) : typeof value === 'bigint' ? `${value}n` : String(JSON.stringify(value) ?? String(value));
  } catch {
    text = Object.prototype.toString.call(value);
  }
  text = text.replace(/[\r\n\t]+/g, ' ');
  return text.length > 40 ? `${text.slice(0, 37)}...` : text;
}

/**
 * Why a solve result cannot be recorded at all (then the run is an `error` with this message),
 * or undefined when its shape is sound. `n` is the problem's dimension.
 */
export function unsoundSolveResult(result: unknown, n: number): string | undefined {
  if (result === null || typeof result !== 'object') return `a ${result === null ? 'null' : typeof result} instead of a solve result`;
  const r = result as Partial<Record<keyof SolveResult, unknown>>;
  if (!STATUSES.includes(r.status as SolveResult['status'])) return `status ${shortValue(r.status)}, which is not one of ${STATUSES.join(', ')}`;
  if (r.message !== undefined && typeof r.message !== 'string') return `a message that is not text (${shortValue(r.message)})`;
  const counts = r.counts as Partial<Record<keyof Counts, unknown>> | null | undefined;
  if (counts === null || typeof counts !== 'object') return `counts ${shortValue(counts)} instead of { nfev, njev, nlu, accepted, rejected }`;
  const wrong = COUNT_KEYS.filter((k) => !(typeof counts[k] === 'number' && Number.isSafeInteger(counts[k]) && (counts[k] as number) >= 0));
  if (wrong.length > 0) return `impossible counts (${wrong.map((k) => `${k} ${shortValue(counts[k])}`).join(', ')}); every count is a whole number, 0 or more`;
  const y = r.yFinal;
  if (!(y instanceof Float64Array || Array.isArray(y)) || y.length !== n) return `a final state that is not ${n} numbers (${shortValue(y)})`;
  for (let k = 0; k < y.length; k++) if (typeof y[k] !== 'number') return `a final state whose entry [${k}] is not a number (${shortValue(y[k])})`;
  if (typeof r.tFinal !== 'number' || !Number.isFinite(r.tFinal)) return `a final time that is not a finite number (${shortValue(r.tFinal)})`;
  if (r.h !== undefined && !(typeof r.h === 'number' && Number.isFinite(r.h) && r.h > 0)) return `a step size that is not a positive number (${shortValue(r.h)})`;
  return undefined;
}

/** First component of y that is not a finite number, as "y[k] = value", or undefined. */
export function nonFiniteComponent(y: ArrayLike<unknown>): string | undefined {
  for (let k = 0; k < y.length; k++) {
    const v = y[k];
    if (typeof v !== 'number' || !Number.isFinite(v)) return `[${k}] = ${typeof v === 'number' ? String(v) : shortValue(v)}`;
  }
  return undefined;
}
