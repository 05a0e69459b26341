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
  const span = Math.abs(problem.tEnd - problem.t0);
  const tol = TIME_MATCH * Math.max(span, Math.abs(problem.tEnd), 1e-300);
  let cursor = 0;
  return {
    tabulatedTimes: points.map((p) => p.t),
    at(t, out) {
      // Observers ask in increasing time, so a moving cursor makes the search O(1) amortised.
      if (cursor >= points.length || points[cursor]!.t > t + tol) cursor = 0;
      while (cursor < points.length && points[cursor]!.t < t - tol) cursor++;
      const p = points[cursor];
      if (!p || Math.abs(p.t - t) > tol) return false;
      for (let i = 0; i < p.y.length; i++) out[i] = p.y[i]!;
      return true;
    },
  };
}
