// Exact solution of x' = A x + B u(t) when every input has a generator: z = (x, w) obeys
// z' = M z with M = [[A, B H], [0, G]], so z(t) = expm(M (t - t0)) z(t0), no integration
// (evaluated through ../expm-trajectory.ts: exact states on a grid, a short Taylor series between).
import { expmTrajectory } from '../expm-trajectory.js';
import type { Generator } from './signals.js';

/**
 * Resolution of these computed exact states, relative to the state's largest component: errors of
 * the exponential grow with the norm of M t, measured up to about 4e-13 on linear models (issue 24);
 * a figure within reach of it is not a confirmed error.
 */
export const EXPM_FLOOR = 4e-13;

export interface Augmented {
  readonly size: number;
  readonly M: Float64Array;
  readonly z0: readonly number[];
}

/** A: n x n, B: n x m (row-major), one generator per input channel. */
export function augmentedSystem(A: Float64Array, B: Float64Array, n: number, generators: readonly Generator[], x0: readonly number[]): Augmented {
  const m = generators.length;
  const nw = generators.reduce((s, g) => s + g.size, 0);
  const size = n + nw;
  const M = new Float64Array(size * size);
  for (let i = 0; i < n; i++) for (let j = 0; j < n; j++) M[i * size + j] = A[i * n + j]!;
  let at = n;
  const z0 = [...x0];
  for (let c = 0; c < m; c++) {
    const g = generators[c]!;
    // B H: column c of B times the channel's read-out h.
    for (let i = 0; i < n; i++) {
      const b = B[i * m + c]!;
      if (b === 0) continue;
      for (let k = 0; k < g.size; k++) M[i * size + at + k]! += b * g.h[k]!;
    }
    for (let i = 0; i < g.size; i++) for (let j = 0; j < g.size; j++) M[(at + i) * size + at + j] = g.G[i * g.size + j]!;
    z0.push(...g.w0);
    at += g.size;
  }
  return { size, M, z0 };
}

export function exactSolution(aug: Augmented, n: number, t0: number, tEnd: number): (t: number, out: Float64Array) => void {
  const scratch = new Float64Array(aug.size);
  const at = expmTrajectory(aug.M, aug.size, t0, tEnd, aug.z0);
  return (t, out) => {
    at(t, scratch);
    for (let i = 0; i < n; i++) out[i] = scratch[i]!;
  };
}
