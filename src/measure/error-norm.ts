// Global error of a state against the reference, in the problem's own error scale
// (the design's `error.final` / `error.max` definition: max over components of |y_i - ref_i| / scale_i).
import type { ErrorScale } from '../core/types.js';

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
    if (!(e <= worst)) worst = e; // NaN propagates as the worst value
  }
  return worst;
}
