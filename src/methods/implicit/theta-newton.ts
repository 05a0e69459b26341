// Newton solve of the one-stage implicit equation z = base + c h f(tz, z), shared by backward
// Euler (c = 1) and the implicit midpoint rule (c = 1/2). The Jacobian is evaluated once per step
// at the step's start; iterating to a tight tolerance keeps the Newton error far below the
// truncation error, which is what an order check needs.
import { luFactor, luSolve } from '../../core/lu.js';
import type { JacobianSource } from '../../core/jacobian.js';
import type { Counts, Rhs } from '../../core/types.js';
import type { WorkLease } from '../work-lease.js';

const MAX_ITER = 25;
const REL_TOL = 1e-14;

export interface NewtonBuffers {
  readonly z: Float64Array;
  readonly fz: Float64Array;
  readonly delta: Float64Array;
  readonly m: Float64Array;
  readonly piv: Int32Array;
}

export function newtonBuffers(n: number, lease: WorkLease): NewtonBuffers {
  return {
    z: lease.float64(n),
    fz: lease.float64(n),
    delta: lease.float64(n),
    m: lease.float64(n * n),
    piv: lease.int32(n),
  };
}

/**
 * On entry z holds the start value and f(t, y) is in fy (for a finite-difference Jacobian at
 * (t, y)); on success z holds the solution. Returns an error message or undefined.
 */
export function solveStage(
  f: Rhs,
  jac: JacobianSource,
  t: number,
  y: Float64Array,
  fy: Float64Array,
  tz: number,
  ch: number,
  base: Float64Array,
  buf: NewtonBuffers,
  n: number,
  counts: Counts,
): string | undefined {
  const { z, fz, delta, m, piv } = buf;
  jac.evaluate(t, y, fy);
  const J = jac.jac;
  for (let q = 0; q < n * n; q++) m[q] = -ch * J[q]!;
  for (let i = 0; i < n; i++) m[i * n + i] = m[i * n + i]! + 1;
  counts.nlu++;
  if (!luFactor(m, n, piv)) return 'singular iteration matrix';
  for (let it = 0; it < MAX_ITER; it++) {
    f(tz, z, fz);
    counts.nfev++;
    for (let i = 0; i < n; i++) delta[i] = base[i]! + ch * fz[i]! - z[i]!;
    luSolve(m, n, piv, delta);
    let dmax = 0;
    let zmax = 0;
    for (let i = 0; i < n; i++) {
      z[i] = z[i]! + delta[i]!;
      dmax = Math.max(dmax, Math.abs(delta[i]!));
      zmax = Math.max(zmax, Math.abs(z[i]!));
    }
    if (!Number.isFinite(dmax)) return 'Newton iteration produced a non-finite value';
    if (dmax <= REL_TOL * (1 + zmax)) return undefined;
  }
  return `Newton iteration did not converge in ${MAX_ITER} iterations`;
}
