// Dense-output accuracy (issue 28, item 5): the error of a method's own interpolant between its
// accepted steps, as a figure of its own. It is sampled at the midpoint of every accepted step
// (theta = 1/2, where an interpolant that matches both ends is typically least constrained), from
// the interpolant the method hands to the step hook, and compared with the reference wherever the
// reference can be evaluated there (an exact formula or a dense reference; a tabulated reference
// has no value between its times, and the figure is then absent). It evaluates only the
// interpolant and the reference, never the right-hand side, so the steps and counts are the
// method's own.
import type { Problem } from '../core/types.js';
import type { ErrorMeter } from './error-norm.js';
import type { ReferenceLookup } from './reference.js';
import type { StepInterpolant } from './output-times.js';

/** The fraction of each accepted step at which the interpolant is compared with the reference. */
export const DENSE_SAMPLE_FRACTION = 0.5;

export interface DenseAccuracyWatch {
  step(tOld: number, tNew: number, evaluate: StepInterpolant): void;
}

/** Feeds every midpoint's (error, resolution) pair to add; null when the reference has no value between steps. */
export function watchDenseAccuracy(
  problem: Problem,
  lookup: ReferenceLookup,
  meter: ErrorMeter,
  add: (error: number, resolution: number) => void,
): DenseAccuracyWatch | null {
  if (!lookup.anywhere) return null;
  const n = problem.dimension;
  const value = new Float64Array(n);
  const ref = new Float64Array(n);
  const res = new Float64Array(n);
  const referenceAt = lookup.at;
  return {
    step(tOld, tNew, evaluate) {
      if (!(tNew > tOld)) return;
      const t = tOld + DENSE_SAMPLE_FRACTION * (tNew - tOld);
      if (!referenceAt(t, ref, res)) return;
      evaluate(t, value);
      add(meter.error(t, value, ref, res), meter.resolution);
    },
  };
}
