// Looking up the reference state at a time, with its resolution: analytic anywhere, tabulated
// only at its own times.
import type { Problem, ReferencePoint } from '../core/types.js';
import { certifiedResolution, exactResolution, tabulatedResolution } from './resolution.js';
import { scaleFloors } from './error-norm.js';

/** Relative tolerance for matching a landing time to a tabulated reference time. */
const TIME_MATCH = 1e-12;

export interface ReferenceLookup {
  /**
   * Writes the reference at t into out (and its per-component resolution into res, when given)
   * and returns true, or returns false when none exists at t.
   */
  at(t: number, out: Float64Array, res?: Float64Array): boolean;
  /** True when the reference can be evaluated at any time in the span. */
  readonly anywhere: boolean;
  /** Times at which a tabulated reference exists (empty for analytic references). */
  readonly tabulatedTimes: readonly number[];
}

export function referenceLookup(problem: Problem): ReferenceLookup {
  const ref = problem.reference;
  const exact = ref.exact;
  const n = problem.dimension;
  if (exact) {
    return {
      at(t, out, res) {
        exact(t, out);
        if (res) exactResolution(ref, out, res, n);
        return true;
      },
      anywhere: true,
      tabulatedTimes: [],
    };
  }
  const dense = ref.dense;
  if (dense) {
    const floors = scaleFloors(problem.errorScale, n);
    const t0 = problem.t0;
    const tEnd = problem.tEnd;
    return {
      at(t, out, res) {
        if (!(t >= t0 && t <= tEnd)) return false;
        dense(t, out);
        if (res) certifiedResolution(ref, floors, out, res, n);
        return true;
      },
      anywhere: true,
      tabulatedTimes: (ref.points ?? []).map((p) => p.t),
    };
  }
  const points: readonly ReferencePoint[] = ref.points ?? [];
  const resolutions = points.map((p) => tabulatedResolution(problem, p.y));
  // Relative to the time itself, not the span: on Robertson's [0, 1e11] a span-relative match
  // would take a step ending at 39.95 for the reference at 40.
  const matches = (a: number, b: number) => a === b || Math.abs(a - b) <= TIME_MATCH * Math.max(Math.abs(a), Math.abs(b));
  let cursor = 0;
  // Both kinds of lookup list their fields in the same order: one object layout for the observer.
  return {
    at(t, out, res) {
      // Observers ask in increasing time, so a moving cursor makes the search O(1) amortised.
      if (cursor >= points.length || (points[cursor]!.t > t && !matches(points[cursor]!.t, t))) cursor = 0;
      while (cursor < points.length && points[cursor]!.t < t && !matches(points[cursor]!.t, t)) cursor++;
      const p = points[cursor];
      if (!p || !matches(p.t, t)) return false;
      for (let i = 0; i < p.y.length; i++) out[i] = p.y[i]!;
      if (res) {
        const r = resolutions[cursor]!;
        for (let i = 0; i < r.length; i++) res[i] = r[i]!;
      }
      return true;
    },
    anywhere: false,
    tabulatedTimes: points.map((p) => p.t),
  };
}
