// Global error of a state against the reference, in the problem's own error scale
// (the design's `error.final` / `error.max` definition: max over components of |y_i - ref_i| / scale_i).
import type { ErrorScale, Problem } from '../core/types.js';

/** Per-component floors for relative scales, expanded once per run. */
export function scaleFloors(scale: ErrorScale, n: number): Float64Array | null {
  if (scale.kind === 'absolute') return null;
  const floors = new Float64Array(n);
  if (typeof scale.floor === 'number') floors.fill(scale.floor);
  else for (let i = 0; i < n; i++) floors[i] = scale.floor[i] ?? 0;
  return floors;
}

/** max_i |y_i - ref_i| / s_i with s_i = 1 (absolute) or max(|ref_i|, floor_i) (relative). */
export function scaledMaxError(y: ArrayLike<number>, ref: ArrayLike<number>, floors: Float64Array | null, n: number): number {
  let worst = 0;
  for (let i = 0; i < n; i++) {
    const diff = Math.abs(y[i]! - ref[i]!);
    let e = diff;
    if (floors) {
      const r = Math.abs(ref[i]!);
      const s = r > floors[i]! ? r : floors[i]!;
      e = s > 0 ? diff / s : diff;
    }
    if (e !== e) return NaN; // a non-finite state has no meaningful error
    if (e > worst) worst = e;
  }
  return worst;
}

/**
 * The problem's error measure as one function of (t, state, reference state): on the states, or
 * on the outputs computed from both when the problem measures error on its outputs.
 */
export function errorMeter(problem: Problem): (t: number, y: Float64Array, ref: Float64Array) => number {
  const outputs = problem.errorOn === 'outputs' ? problem.outputs : undefined;
  if (!outputs) {
    const floors = scaleFloors(problem.errorScale, problem.dimension);
    const n = problem.dimension;
    return (_t, y, ref) => scaledMaxError(y, ref, floors, n);
  }
  const m = outputs.names.length;
  const floors = scaleFloors(problem.errorScale, m);
  const gy = new Float64Array(m);
  const gr = new Float64Array(m);
  return (t, y, ref) => {
    outputs.fn(t, y, gy);
    outputs.fn(t, ref, gr);
    return scaledMaxError(gy, gr, floors, m);
  };
}
