// Newton solve of the one-stage implicit equation z = base + c h f(tz, z), shared by backward
// Euler (c = 1) and the implicit midpoint rule (c = 1/2). The Jacobian is evaluated once per step
// at the step's start; iterating to a tight tolerance keeps the Newton error far below the
// truncation error, which is what an order check needs. When that simplified iteration fails
// (a stiff start, where the explicit start value and the start's Jacobian are far off), the step
// is retried from the step's start value with the Jacobian refreshed at every iterate (full
// Newton) before a failure is declared: the failure must be the method's, not the iteration's.
import type { JacobianSource } from '../../core/jacobian.js';
import { RealIterationMatrix } from './iteration-matrix.js';
import type { Counts, Rhs } from '../../core/types.js';
import type { WorkLease } from '../work-lease.js';

const MAX_ITER = 25;
/**
 * Iterations of the full-Newton retry. From the step's start a stiff step converges slowly at
 * first (the iterate halves its distance while far off, then converges quadratically): backward
 * Euler's first Robertson step of 1e6 takes 28 (measured).
 */
const FULL_MAX_ITER = 100;
const REL_TOL = 1e-14;

/** The Newton solver of one stage, with its buffers, for one solve. */
export interface StageNewton {
  /** The stage: its start value before `solve`, the solution after a success. */
  readonly z: Float64Array;
  /**
   * Solves z = base + ch f(tz, z) from the start value in z; f(t, y) is in fy (for a
   * finite-difference Jacobian at (t, y)). Returns an error message or undefined.
   */
  solve(t: number, y: Float64Array, fy: Float64Array, tz: number, ch: number, base: Float64Array): string | undefined;
}

/** `jac` is the source the stage's Jacobian comes from (dense or banded); evaluations go to `counts`. */
export function stageNewton(f: Rhs, jac: JacobianSource, n: number, counts: Counts, lease: WorkLease): StageNewton {
  const z = lease.float64(n);
  const fz = lease.float64(n);
  const delta = lease.float64(n);
  const m = new RealIterationMatrix(jac, n, lease);

  /** Iteration matrix I - ch J from the Jacobian just evaluated, factored; false when singular. */
  const factorIteration = (ch: number): boolean => {
    counts.nlu++;
    return m.factor(1, ch);
  };

  /** One Newton correction of z with f(tz, z) in fz: 'done', 'going' or a failure message. */
  const correct = (ch: number, base: Float64Array): 'done' | 'going' | string => {
    for (let i = 0; i < n; i++) delta[i] = base[i]! + ch * fz[i]! - z[i]!;
    m.solve(delta);
    let dmax = 0;
    let zmax = 0;
    for (let i = 0; i < n; i++) {
      z[i] = z[i]! + delta[i]!;
      dmax = Math.max(dmax, Math.abs(delta[i]!));
      zmax = Math.max(zmax, Math.abs(z[i]!));
    }
    if (!Number.isFinite(dmax)) return 'Newton iteration produced a non-finite value';
    return dmax <= REL_TOL * (1 + zmax) ? 'done' : 'going';
  };

  /** Newton with the Jacobian at (t, y) kept for every iteration. */
  const simplifiedNewton = (t: number, y: Float64Array, fy: Float64Array, tz: number, ch: number, base: Float64Array): string | undefined => {
    jac.evaluate(t, y, fy);
    if (!factorIteration(ch)) return 'singular iteration matrix';
    for (let it = 0; it < MAX_ITER; it++) {
      f(tz, z, fz);
      counts.nfev++;
      const r = correct(ch, base);
      if (r === 'done') return undefined;
      if (r !== 'going') return r;
    }
    return `Newton iteration did not converge in ${MAX_ITER} iterations`;
  };

  /** Newton with the Jacobian evaluated afresh at every iterate (z on entry: the start value). */
  const fullNewton = (tz: number, ch: number, base: Float64Array): string | undefined => {
    for (let it = 0; it < FULL_MAX_ITER; it++) {
      f(tz, z, fz);
      counts.nfev++;
      jac.evaluate(tz, z, fz);
      if (!factorIteration(ch)) return 'singular iteration matrix';
      const r = correct(ch, base);
      if (r === 'done') return undefined;
      if (r !== 'going') return r;
    }
    return `Newton iteration did not converge in ${FULL_MAX_ITER} iterations`;
  };

  return {
    z,
    solve(t, y, fy, tz, ch, base) {
      const simplified = simplifiedNewton(t, y, fy, tz, ch, base);
      if (simplified === undefined) return undefined;
      z.set(y);
      const full = fullNewton(tz, ch, base);
      return full === undefined ? undefined : `${simplified}; retried with the Jacobian refreshed at every iterate: ${full}`;
    },
  };
}
