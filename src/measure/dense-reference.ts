// A reference that can be evaluated anywhere in the span from one tight solution's accepted steps:
// at each step the state and its derivative f(t, y), joined by Hermite interpolation through four
// consecutive steps (a degree-7 polynomial matching values and slopes, error O(h^8); Burden and
// Faires, Numerical Analysis, sec. 3.4, divided differences with repeated nodes). Its trust is
// measured by the caller against independent runs at evaluation points between its steps.
import type { Problem } from '../core/types.js';

/** Accepted steps of one solution: times, states and derivatives, row-major (step k at k*n). */
export interface DenseSteps {
  t: number[];
  y: number[];
  f: number[];
}

/** Hermite nodes per interpolation window (values and slopes at each). */
const NODES = 4;

/** Records (t, y, f(t, y)) at every step the observer sees; f is the recorder's, never counted. */
export function stepRecorder(problem: Problem): { observe: (t: number, y: Float64Array) => void; steps: DenseSteps } {
  const n = problem.dimension;
  const fy = new Float64Array(n);
  const steps: DenseSteps = { t: [], y: [], f: [] };
  return {
    steps,
    observe(t, y) {
      if (steps.t.length > 0 && t === steps.t[steps.t.length - 1]) return;
      problem.f(t, y, fy);
      steps.t.push(t);
      for (let i = 0; i < n; i++) {
        steps.y.push(y[i]!);
        steps.f.push(fy[i]!);
      }
    },
  };
}

/** y(t) for any t in [t_0, t_last] of the recorded steps, written into out; never allocates. */
export function denseEvaluator(steps: DenseSteps, n: number): (t: number, out: Float64Array) => void {
  const ts = steps.t;
  const ys = steps.y;
  const fs = steps.f;
  const count = ts.length;
  const m = 2 * Math.min(NODES, count);
  const z = new Float64Array(m);
  const q = new Float64Array(m);
  let cursor = 0;
  return (t, out) => {
    // The interval [ts[k], ts[k+1]] holding t: forward from the last one (callers mostly ask in
    // order), by bisection when t lies behind it.
    if (cursor >= count - 1 || ts[cursor]! > t) {
      let lo = 0;
      let hi = count - 1;
      while (hi - lo > 1) {
        const mid = (lo + hi) >> 1;
        if (ts[mid]! < t) lo = mid;
        else hi = mid;
      }
      cursor = lo;
    }
    while (cursor < count - 2 && ts[cursor + 1]! < t) cursor++;
    const first = Math.max(0, Math.min(cursor - 1, count - m / 2));
    for (let p = 0; p < m / 2; p++) z[2 * p] = z[2 * p + 1] = ts[first + p]!;
    for (let i = 0; i < n; i++) {
      for (let p = 0; p < m / 2; p++) q[2 * p] = q[2 * p + 1] = ys[(first + p) * n + i]!;
      // Divided differences in place, from the top so lower orders are read before overwritten.
      for (let order = 1; order < m; order++) {
        for (let j = m - 1; j >= order; j--) {
          const dz = z[j]! - z[j - order]!;
          q[j] = dz === 0 ? fs[(first + (j >> 1)) * n + i]! : (q[j]! - q[j - 1]!) / dz;
        }
      }
      // Newton form, by Horner.
      let v = q[m - 1]!;
      for (let j = m - 2; j >= 0; j--) v = v * (t - z[j]!) + q[j]!;
      out[i] = v;
    }
  };
}
