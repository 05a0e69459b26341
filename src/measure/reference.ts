// Looking up the reference state at a time: analytic anywhere, tabulated only at its own times.
import type { Problem, ReferencePoint } from '../core/types.js';

/** Relative tolerance for matching a landing time to a tabulated reference time. */
const TIME_MATCH = 1e-12;

export interface ReferenceLookup {
  /** Writes the reference at t into out and returns true, or returns false when none exists at t. */
  at(t: number, out: Float64Array): boolean;
  /** Times at which a tabulated reference exists (empty for analytic references). */
  readonly tabulatedTimes: readonly number[];
}

export function referenceLookup(problem: Problem): ReferenceLookup {
  const ref = problem.reference;
  const exact = ref.exact;
  if (exact) {
    return { at: (t, out) => (exact(t, out), true), tabulatedTimes: [] };
  }
  const points: readonly ReferencePoint[] = ref.points ?? [];
  // Relative to the time itself, not the span: on Robertson's [0, 1e11] a span-relative match
  // would take a step ending at 39.95 for the reference at 40.
  const matches = (a: number, b: number) => a === b || Math.abs(a - b) <= TIME_MATCH * Math.max(Math.abs(a), Math.abs(b));
  let cursor = 0;
  // Both kinds of lookup list their fields in the same order: one object layout for the observer.
  return {
    at(t, out) {
      // Observers ask in increasing time, so a moving cursor makes the search O(1) amortised.
      if (cursor >= points.length || (points[cursor]!.t > t && !matches(points[cursor]!.t, t))) cursor = 0;
      while (cursor < points.length && points[cursor]!.t < t && !matches(points[cursor]!.t, t)) cursor++;
      const p = points[cursor];
      if (!p || !matches(p.t, t)) return false;
      for (let i = 0; i < p.y.length; i++) out[i] = p.y[i]!;
      return true;
    },
    tabulatedTimes: points.map((p) => p.t),
  };
}
