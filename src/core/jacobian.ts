// Jacobian df/dy: the problem's analytic one when it has it, else forward differences.
// Increment for column j: delta_j = sqrt(eps * max(1e-5, |y_j|)), the choice of Hairer & Wanner,
// Solving ODEs II, sec. IV.8 (implementation of Radau5); forward differences as in Dennis &
// Schnabel, Numerical Methods for Unconstrained Optimization, sec. 5.4.
import type { Counts, JacobianBand, JacobianFn, Rhs } from './types.js';
import { bandWidth } from './band-lu.js';
import type { ColumnGroups } from './column-groups.js';
import type { SparseJacobian } from './jacobian-structure.js';
import type { SparsePattern } from './sparse-pattern.js';

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
 * Forward-difference Jacobian of f with a sparse pattern, values in the pattern's row order
 * (src/core/sparse-pattern.ts), the columns perturbed group by group (src/core/column-groups.ts,
 * Curtis, Powell and Reid): no row sees two perturbed columns of a group, so each entry is the
 * column-by-column quotient. Same increments as finiteDifferenceJacobian. Costs one evaluation
 * per group, the returned count.
 */
export function sparseFiniteDifferenceJacobian(
  f: Rhs,
  t: number,
  y: Float64Array,
  fy: Float64Array,
  jac: Float64Array,
  pattern: SparsePattern,
  groups: ColumnGroups,
  work: DifferenceWork & { readonly dWork: Float64Array },
): number {
  const n = pattern.n;
  const { yWork, fWork, dWork } = work;
  const { colStart, row, rowOrderOf } = pattern;
  for (let i = 0; i < n; i++) yWork[i] = y[i]!;
  for (let g = 0; g < groups.count; g++) {
    const g0 = groups.start[g]!;
    const g1 = groups.start[g + 1]!;
    for (let c = g0; c < g1; c++) {
      const j = groups.columns[c]!;
      const yj = y[j]!;
      yWork[j] = yj + increment(yj);
      dWork[j] = yWork[j]! - yj;
    }
    f(t, yWork, fWork);
    for (let c = g0; c < g1; c++) {
      const j = groups.columns[c]!;
      const inv = 1 / dWork[j]!;
      for (let q = colStart[j]!; q < colStart[j + 1]!; q++) {
        const i = row[q]!;
        jac[rowOrderOf[q]!] = (fWork[i]! - fy[i]!) * inv;
      }
      yWork[j] = y[j]!;
    }
  }
  return groups.count;
}

/**
 * A Jacobian source bound to one solve: `evaluate` fills `jac` at (t, y) with the analytic
 * Jacobian when present, else by forward differences, and updates njev and nfev in counts.
 */
export interface JacobianSource {
  /**
   * Row-major n x n, band rows (src/core/band-lu.ts) when `band` is set, or the values of the
   * pattern's entries in its row order when `sparse` is set.
   */
  readonly jac: Float64Array;
  readonly analytic: boolean;
  readonly band: JacobianBand | null;
  readonly sparse: SparseJacobian | null;
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
  structure: JacobianBand | SparseJacobian | null = null,
): JacobianSource {
  if (structure && 'pattern' in structure) return sparseSource(f, jacobian, n, counts, buffer, structure);
  if (structure) return bandedSource(f, jacobian, n, counts, buffer, structure);
  const jac = buffer(n * n);
  if (jacobian) {
    return {
      jac,
      analytic: true,
      band: null,
      sparse: null,
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
    sparse: null,
    evaluate(t, y, fy) {
      counts.nfev += finiteDifferenceJacobian(f, t, y, fy, jac, n, work);
      counts.njev++;
    },
  };
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
      sparse: null,
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
    sparse: null,
    evaluate(t, y, fy) {
      counts.nfev += bandedFiniteDifferenceJacobian(f, t, y, fy, jac, n, band, work);
      counts.njev++;
    },
  };
}

function sparseSource(
  f: Rhs,
  jacobian: JacobianFn | undefined,
  n: number,
  counts: Counts,
  buffer: (length: number) => Float64Array,
  sparse: SparseJacobian,
): JacobianSource {
  const { pattern, groups } = sparse;
  const jac = buffer(pattern.nnz);
  if (jacobian) {
    // The analytic Jacobian's contract is the dense row-major matrix; the pattern's entries are copied out.
    const dense = buffer(n * n);
    const { rowStart, column } = pattern;
    return {
      jac,
      analytic: true,
      band: null,
      sparse,
      evaluate(t, y) {
        jacobian(t, y, dense);
        for (let i = 0; i < n; i++) {
          for (let q = rowStart[i]!; q < rowStart[i + 1]!; q++) jac[q] = dense[i * n + column[q]!]!;
        }
        counts.njev++;
      },
    };
  }
  const work = { yWork: buffer(n), fWork: buffer(n), dWork: buffer(n) };
  return {
    jac,
    analytic: false,
    band: null,
    sparse,
    evaluate(t, y, fy) {
      counts.nfev += sparseFiniteDifferenceJacobian(f, t, y, fy, jac, pattern, groups, work);
      counts.njev++;
    },
  };
}
