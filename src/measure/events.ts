// Events: the reference crossing times of a problem's event functions, and a run's crossings
// compared with them (time error per occurrence, missed and extra). A run's crossings are found by
// src/measure/event-watch.ts (the method's own interpolant where it has one, else stepgauge's
// Hermite), or reported by an external program.
// Reference crossings: given by the problem (analytic), located on an exact reference, or else
// located on a tight solve of the problem (dormand-prince-853 at rtol 1e-13, steps bounded to a
// hundredth of the span; not for stiff problems).
import type { Problem } from '../core/types.js';
import type { EventRecord } from '../results/contract.js';
import { illinoisRoot } from '../core/root.js';
import { findMethod } from '../methods/registry.js';
import { absoluteTolerance } from '../core/tolerance.js';
import { crosses, ROOT_REL_TOL, watchEvents } from './event-watch.js';

/** Intervals of the scan for sign changes of g along an exact reference. */
const EXACT_SCAN_INTERVALS = 20000;
/**
 * Without an exact reference, crossings are located on a tight solve: the method certificates
 * use first, at the certificates' tolerance, with its steps bounded to a hundredth of the span
 * so that no short event is stepped over unseen.
 */
const TIGHT_METHOD = 'dormand-prince-853';
const TIGHT_RTOL = 1e-13;
const TIGHT_MAX_STEPS = 5_000_000;
const TIGHT_STEP_FRACTION = 0.01;

const exactCache = new WeakMap<object, Record<string, number[]> | null>();

/** Reference crossing times by event name: the problem's own, or located on its exact reference; null when neither. */
export function referenceEventTimes(problem: Problem): Record<string, number[]> | null {
  const events = problem.events ?? [];
  if (events.length === 0) return null;
  const given = problem.reference.eventTimes;
  if (given) return Object.fromEntries(events.map((ev) => [ev.name, [...(given[ev.name] ?? [])]]));
  const exact = problem.reference.exact;
  if (!exact) return tightEventTimes(problem);
  const key = exact as object;
  if (exactCache.has(key)) return exactCache.get(key)!;
  const y = new Float64Array(problem.dimension);
  const g = (k: number, t: number) => (exact(t, y), events[k]!.fn(t, y));
  const out: Record<string, number[]> = Object.fromEntries(events.map((ev) => [ev.name, [] as number[]]));
  const span = problem.tEnd - problem.t0;
  const prev = events.map((_, k) => g(k, problem.t0));
  for (let i = 1; i <= EXACT_SCAN_INTERVALS; i++) {
    const tb = problem.t0 + (span * i) / EXACT_SCAN_INTERVALS;
    const ta = problem.t0 + (span * (i - 1)) / EXACT_SCAN_INTERVALS;
    events.forEach((ev, k) => {
      const gb = g(k, tb);
      if (crosses(ev.direction, prev[k]!, gb)) {
        out[ev.name]!.push(illinoisRoot((t) => g(k, t), ta, prev[k]!, tb, gb, ROOT_REL_TOL * Math.max(Math.abs(tb), span)));
      }
      prev[k] = gb;
    });
  }
  exactCache.set(key, out);
  return out;
}

const tightCache = new Map<string, Record<string, number[]> | null>();

/** Crossings located on a tight solve of the problem itself (cached by its definition text). */
function tightEventTimes(problem: Problem): Record<string, number[]> | null {
  if (problem.stiff || problem.reference.unavailable) return null;
  const key = problem.definition;
  if (tightCache.has(key)) return tightCache.get(key)!;
  const method = findMethod(TIGHT_METHOD);
  let out: Record<string, number[]> | null = null;
  if (method) {
    const watch = watchEvents(problem)!;
    const span = problem.tEnd - problem.t0;
    const bound: number[] = [];
    for (let k = 1; k < 1 / TIGHT_STEP_FRACTION; k++) bound.push(problem.t0 + span * k * TIGHT_STEP_FRACTION);
    const result = method.solve(
      problem,
      { rtol: TIGHT_RTOL, atol: absoluteTolerance(problem, TIGHT_RTOL) },
      { maxSteps: TIGHT_MAX_STEPS, checkTimes: bound, observer: (t, y) => watch.observe(t, y) },
    );
    if (result.status === 'ok') out = watch.found();
  }
  tightCache.set(key, out);
  return out;
}

/**
 * Pairs each reference crossing with the nearest run crossing closer to it than to any other
 * reference crossing of the same event (half the gap to each neighbour); what is left over is
 * missed (reference) or extra (run).
 */
export function matchCrossings(reference: readonly number[], found: readonly number[], span: number): { timeErrors: (number | null)[]; extra: number } {
  const used = new Set<number>();
  const timeErrors = reference.map((r, k) => {
    const lo = k > 0 ? (reference[k - 1]! + r) / 2 : r - span;
    const hi = k + 1 < reference.length ? (r + reference[k + 1]!) / 2 : r + span;
    let best = -1;
    found.forEach((t, j) => {
      if (used.has(j) || t < lo || t >= hi) return;
      if (best < 0 || Math.abs(t - r) < Math.abs(found[best]! - r)) best = j;
    });
    if (best < 0) return null;
    used.add(best);
    return found[best]! - r;
  });
  return { timeErrors, extra: found.length - used.size };
}

/**
 * The run's event records, compared with the reference crossings where there are some.
 * locatedBy(name): how that event's crossings were found (which interpolant, or the program's report).
 */
export function eventRecords(problem: Problem, found: Record<string, number[]>, locatedBy: (name: string) => string): Record<string, EventRecord> {
  const reference = referenceEventTimes(problem);
  const span = problem.tEnd - problem.t0;
  const out: Record<string, EventRecord> = {};
  for (const ev of problem.events ?? []) {
    const times = found[ev.name] ?? [];
    const ref = reference?.[ev.name] ?? null;
    if (!ref) {
      out[ev.name] = { direction: ev.direction, times, reference: null, timeErrors: null, maxTimeError: null, missed: null, extra: null, locatedBy: locatedBy(ev.name) };
      continue;
    }
    const { timeErrors, extra } = matchCrossings(ref, times, span);
    const matched = timeErrors.filter((e): e is number => e !== null);
    out[ev.name] = {
      direction: ev.direction,
      times,
      reference: [...ref],
      timeErrors,
      maxTimeError: matched.length > 0 ? Math.max(...matched.map(Math.abs)) : null,
      missed: timeErrors.length - matched.length,
      extra,
      locatedBy: locatedBy(ev.name),
    };
  }
  return out;
}

/** Worst event-time error of a run, Infinity when it missed or added a crossing, null with nothing to compare. */
export function worstEventTimeError(events: Record<string, EventRecord> | undefined): number | null {
  if (!events) return null;
  let worst: number | null = null;
  for (const e of Object.values(events)) {
    if (e.reference === null) continue;
    if ((e.missed ?? 0) > 0 || (e.extra ?? 0) > 0) return Infinity;
    if (e.maxTimeError !== null) worst = Math.max(worst ?? 0, e.maxTimeError);
  }
  return worst;
}
