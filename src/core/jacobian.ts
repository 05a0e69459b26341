// Jacobian df/dy: the problem's analytic one when it has it, else forward differences.
// Increment for column j: delta_j = sqrt(eps * max(1e-5, |y_j|)), the choice of Hairer & Wanner,
// Solving ODEs II, sec. IV.8 (implementation of Radau5); forward differences as in Dennis &
// Schnabel, Numerical Methods for Unconstrained Optimization, sec. 5.4.
import type { Counts, JacobianBand, JacobianFn, Rhs } from './types.js';
import { bandWidth } from './band-lu.js';

const EPS = 2.220446049250313e-16;

/** The difference increment for a state of value yj (the header's rule). */
function increment(yj: number): number {
  const a = Math.abs(yj);
  return Math.sqrt(EPS * (a > 1e-5 ? a : 1e-5));
}

/** Scratch buffers of length n for a difference Jacobian, made once per solve. */
export interface DifferenceWork {
  /** y with the perturbed components. */
  readonly yWork: Float64Array;
  /** f at the perturbed y. */
  readonly fWork: Float64Array;
}

/**
 * Forward-difference Jacobian written row-major into jac (jac[i*n + j] = dfi/dyj). fy must hold
 * f(t, y); `work` holds the caller's buffers of length n. y is left unchanged. Costs n
 * evaluations of f, which is the returned count.
 */
export function finiteDifferenceJacobian(f: Rhs, t: number, y: Float64Array, fy: Float64Array, jac: Float64Array, n: number, work: DifferenceWork): number {
  const { yWork, fWork } = work;
  for (let i = 0; i < n; i++) yWork[i] = y[i]!;
  for (let j = 0; j < n; j++) {
    const yj = y[j]!;
    yWork[j] = yj + increment(yj);
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
 * Forward-difference Jacobian of a banded f (ml diagonals below, mu above) into band-row storage
 * (src/core/band-lu.ts), with the columns grouped as Curtis, Powell and Reid proposed ("On the
 * estimation of sparse Jacobian matrices", J. Inst. Math. Appl. 13 (1974) 117-119): columns j
 * and j + ml + mu + 1 touch no common row, so every (ml + mu + 1)-th column is perturbed at once
 * and one evaluation yields all of them. Same increments as finiteDifferenceJacobian. Costs
 * min(n, ml + mu + 1) evaluations, the returned count. Entries outside the band are not written.
 */
export function bandedFiniteDifferenceJacobian(
  f: Rhs,
  t: number,
  y: Float64Array,
  fy: Float64Array,
  jac: Float64Array,
  n: number,
  band: JacobianBand,
  work: DifferenceWork & { readonly dWork: Float64Array },
): number {
  const ml = band.lower;
  const mu = band.upper;
  const { yWork, fWork, dWork } = work;
  const w = bandWidth(ml, mu);
  const groups = Math.min(n, ml + mu + 1);
  for (let i = 0; i < n; i++) yWork[i] = y[i]!;
  for (let g = 0; g < groups; g++) {
    for (let j = g; j < n; j += groups) {
      const yj = y[j]!;
      yWork[j] = yj + increment(yj);
      dWork[j] = yWork[j]! - yj;
    }
    f(t, yWork, fWork);
    for (let j = g; j < n; j += groups) {
      const inv = 1 / dWork[j]!;
      const i0 = j - mu > 0 ? j - mu : 0;
      const i1 = j + ml < n - 1 ? j + ml : n - 1;
      for (let i = i0; i <= i1; i++) jac[i * w + (j - i + ml)] = (fWork[i]! - fy[i]!) * inv;
      yWork[j] = y[j]!;
    }
  }
  return groups;
}

/**
 * A Jacobian source bound to one solve: `evaluate` fills `jac` at (t, y) with the analytic
 * Jacobian when present, else by forward differences, and updates njev and nfev in counts.
 */
export interface JacobianSource {
  /** Row-major n x n, or band rows (src/core/band-lu.ts) when `band` is set. */
  readonly jac: Float64Array;
  readonly analytic: boolean;
  readonly band: JacobianBand | null;
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
  band: JacobianBand | null = null,
): JacobianSource {
  if (band) return bandedSource(f, jacobian, n, counts, buffer, band);
  const jac = buffer(n * n);
  if (jacobian) {
    return {
      jac,
      analytic: true,
      band: null,
      evaluate(t, y) {
        jacobian(t, y, jac);
        counts.njev++;
      },
    };
  }
  const work: DifferenceWork = { yWork: buffer(n), fWork: buffer(n) };
  return {
    jac,
    analytic: false,
    band: null,
    evaluate(t, y, fy) {
      counts.nfev += finiteDifferenceJacobian(f, t, y, fy, jac, n, work);
      counts.njev++;
    },
  };
}

/**
 * The band a solve should use for a problem that declares one: only when it is narrower than
 * the matrix (a band as wide as n stores more than the dense matrix and saves nothing).
 */
export function usefulBand(band: JacobianBand | undefined, n: number): JacobianBand | null {
  if (!band) return null;
  return bandWidth(band.lower, band.upper) < n ? band : null;
}

function bandedSource(
  f: Rhs,
  jacobian: JacobianFn | undefined,
  n: number,
  counts: Counts,
  buffer: (length: number) => Float64Array,
  band: JacobianBand,
): JacobianSource {
  const ml = band.lower;
  const mu = band.upper;
  const w = bandWidth(ml, mu);
  const jac = buffer(n * w);
  if (jacobian) {
    // The analytic Jacobian's contract is the dense row-major matrix; its band is copied out.
    const dense = buffer(n * n);
    return {
      jac,
      analytic: true,
      band,
      evaluate(t, y) {
        jacobian(t, y, dense);
        for (let i = 0; i < n; i++) {
          const j0 = i - ml > 0 ? i - ml : 0;
          const j1 = i + mu < n - 1 ? i + mu : n - 1;
          for (let j = j0; j <= j1; j++) jac[i * w + (j - i + ml)] = dense[i * n + j]!;
        }
        counts.njev++;
      },
    };
  }
  const work = { yWork: buffer(n), fWork: buffer(n), dWork: buffer(n) };
  return {
    jac,
    analytic: false,
    band,
    evaluate(t, y, fy) {
      counts.nfev += bandedFiniteDifferenceJacobian(f, t, y, fy, jac, n, band, work);
      counts.njev++;
    },
  };
}
