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
 * Like scaledMaxError, and the resolution res_i / s_i of the component where the error is largest
 * (the figure's own point and units), written to out[0].
 */
export function scaledMaxErrorResolved(
  y: ArrayLike<number>,
  ref: ArrayLike<number>,
  res: ArrayLike<number>,
  floors: Float64Array | null,
  n: number,
  out: Float64Array,
): number {
  let worst = 0;
  let worstRes = res[0]! / (floors ? Math.max(Math.abs(ref[0]!), floors[0]!) || 1 : 1);
  for (let i = 0; i < n; i++) {
    const diff = Math.abs(y[i]! - ref[i]!);
    let s = 1;
    if (floors) {
      const r = Math.abs(ref[i]!);
      s = r > floors[i]! ? r : floors[i]!;
      if (!(s > 0)) s = 1;
    }
    const e = diff / s;
    if (e !== e) {
      out[0] = NaN;
      return NaN;
    }
    if (e > worst || i === 0) {
      worst = e;
      worstRes = res[i]! / s;
    }
  }
  out[0] = worstRes;
  return worst;
}

/**
 * The problem's error measure, on the states or on the outputs computed from both. With a
 * reference resolution (per state component), `resolution` afterwards holds the resolution of
 * the figure in its own units: on outputs, each state's resolution carried through the output
 * map and added up (|g_i(ref + r_j e_j) - g_i(ref)| summed over j), so the verdict does not
 * depend on the units states and outputs are written in.
 */
export interface ErrorMeter {
  error(t: number, y: Float64Array, ref: Float64Array, res?: Float64Array): number;
  readonly resolution: number;
}

export function errorMeter(problem: Problem): ErrorMeter {
  const outputs = problem.errorOn === 'outputs' ? problem.outputs : undefined;
  const n = problem.dimension;
  const slot = new Float64Array(1);
  if (!outputs) {
    const floors = scaleFloors(problem.errorScale, n);
    return {
      error: (_t, y, ref, res) => (res ? scaledMaxErrorResolved(y, ref, res, floors, n, slot) : scaledMaxError(y, ref, floors, n)),
      get resolution() {
        return slot[0]!;
      },
    };
  }
  const m = outputs.names.length;
  const floors = scaleFloors(problem.errorScale, m);
  const gy = new Float64Array(m);
  const gr = new Float64Array(m);
  const gp = new Float64Array(m);
  const shifted = new Float64Array(n);
  const outRes = new Float64Array(m);
  return {
    error(t, y, ref, res) {
      outputs.fn(t, y, gy);
      outputs.fn(t, ref, gr);
      if (!res) return scaledMaxError(gy, gr, floors, m);
      outRes.fill(0);
      shifted.set(ref);
      for (let j = 0; j < n; j++) {
        if (res[j] === 0) continue;
        shifted[j] = ref[j]! + res[j]!;
        outputs.fn(t, shifted, gp);
        for (let i = 0; i < m; i++) outRes[i]! += Math.abs(gp[i]! - gr[i]!);
        shifted[j] = ref[j]!;
      }
      return scaledMaxErrorResolved(gy, gr, outRes, floors, m, slot);
    },
    get resolution() {
      return slot[0]!;
    },
  };
}
