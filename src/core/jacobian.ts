// Jacobian df/dy: the problem's analytic one when it has it, else forward differences.
// Increment for column j: delta_j = sqrt(eps * max(1e-5, |y_j|)), the choice of Hairer & Wanner,
// Solving ODEs II, sec. IV.8 (implementation of Radau5); forward differences as in Dennis &
// Schnabel, Numerical Methods for Unconstrained Optimization, sec. 5.4.
import type { Counts, JacobianFn, Rhs } from './types.js';

const EPS = 2.220446049250313e-16;

/**
 * Forward-difference Jacobian written row-major into jac (jac[i*n + j] = dfi/dyj). fy must hold
 * f(t, y); yWork and fWork are caller buffers of length n. y is left unchanged. Costs n
 * evaluations of f, which is the returned count.
 */
export function finiteDifferenceJacobian(
  f: Rhs,
  t: number,
  y: Float64Array,
  fy: Float64Array,
  jac: Float64Array,
  n: number,
  yWork: Float64Array,
  fWork: Float64Array,
): number {
  for (let i = 0; i < n; i++) yWork[i] = y[i]!;
  for (let j = 0; j < n; j++) {
    const yj = y[j]!;
    const a = Math.abs(yj);
    const delta = Math.sqrt(EPS * (a > 1e-5 ? a : 1e-5));
    yWork[j] = yj + delta;
    // The increment actually represented in floating point, so the quotient is consistent.
    const d = yWork[j]! - yj;
    f(t, yWork, fWork);
    const inv = 1 / d;
    for (let i = 0; i < n; i++) jac[i * n + j] = (fWork[i]! - fy[i]!) * inv;
    yWork[j] = yj;
  }
  return n;
}

/**
 * A Jacobian source bound to one solve: `evaluate` fills `jac` at (t, y) with the analytic
 * Jacobian when present, else by forward differences, and updates njev and nfev in counts.
 */
export interface JacobianSource {
  readonly jac: Float64Array;
  readonly analytic: boolean;
  /** fy must hold f(t, y) (used only by the finite-difference path). */
  evaluate(t: number, y: Float64Array, fy: Float64Array): void;
}

/** `buffer` supplies the zeroed work arrays (a stepper passes its kept ones; by default, fresh). */
export function makeJacobianSource(
  f: Rhs,
  jacobian: JacobianFn | undefined,
  n: number,
  counts: Counts,
  buffer: (length: number) => Float64Array = (length) => new Float64Array(length),
): JacobianSource {
  const jac = buffer(n * n);
  if (jacobian) {
    return {
      jac,
      analytic: true,
      evaluate(t, y) {
        jacobian(t, y, jac);
        counts.njev++;
      },
    };
  }
  const yWork = buffer(n);
  const fWork = buffer(n);
  return {
    jac,
    analytic: false,
    evaluate(t, y, fy) {
      counts.nfev += finiteDifferenceJacobian(f, t, y, fy, jac, n, yWork, fWork);
      counts.njev++;
    },
  };
}
