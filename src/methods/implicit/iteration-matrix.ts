// The iteration matrices of the implicit steppers, d I - s J (real) and (dr + i di) I - s J
// (complex, Radau IIA), formed from a Jacobian source and factored: dense LU (src/core/lu.ts) for
// a dense Jacobian, banded LU (src/core/band-lu.ts) when the source holds a band, sparse LU
// (src/core/sparse-lu.ts) when it holds a pattern. The dense forms are the loops the steppers had
// inline, operation for operation, so dense counts and results are unchanged; small dense systems
// use the same routines written out (lu-small.ts).
import { bandLuFactor, bandLuSolve, bandWidth, complexBandLuFactor, complexBandLuSolve } from '../../core/band-lu.js';
import type { JacobianSource } from '../../core/jacobian.js';
import { complexLuFactor, complexLuSolve, luFactor, luSolve } from '../../core/lu.js';
import { SMALL_LU_MAX_N, smallLu, type SmallLu } from '../../core/lu-small.js';
import { ComplexSparseLu, SparseLu } from '../../core/sparse-lu.js';
import type { WorkLease } from '../work-lease.js';

/**
 * Storage of one matrix for a source: its length, where the diagonal lies (a stride, or the
 * pattern's list of places when sparse), the band (0, 0 dense).
 */
class Layout {
  readonly length: number;
  readonly diagStart: number;
  readonly diagStride: number;
  readonly diagonal: Int32Array | null;
  readonly ml: number;
  readonly mu: number;
  readonly banded: boolean;
  /** Written-out dense routines for this n, or null (banded, sparse, or n too large). */
  readonly small: SmallLu | null;

  constructor(src: JacobianSource, n: number) {
    this.banded = src.band !== null;
    this.ml = src.band?.lower ?? 0;
    this.mu = src.band?.upper ?? 0;
    this.diagonal = src.sparse ? src.sparse.pattern.diagonal : null;
    const w = this.banded ? bandWidth(this.ml, this.mu) : n;
    this.length = src.sparse ? src.sparse.pattern.nnz : n * w;
    this.diagStart = this.banded ? this.ml : 0;
    this.diagStride = this.banded ? w : n + 1;
    this.small = !this.banded && !src.sparse && n <= SMALL_LU_MAX_N ? smallLu(n) : null;
  }
}

/** The lease's arrays for a sparse LU's work (taken in its fixed order, like every other). */
function leased(lease: WorkLease): { float64(length: number): Float64Array; int32(length: number): Int32Array } {
  return { float64: (length) => lease.float64(length), int32: (length) => lease.int32(length) };
}

export class RealIterationMatrix {
  private readonly l: Layout;
  /** The factors and pivots of the last factor() (read by written-out solves, radau-kernel.ts). */
  readonly m: Float64Array;
  readonly piv: Int32Array;
  private readonly sparse: SparseLu | null;

  constructor(
    private readonly src: JacobianSource,
    private readonly n: number,
    lease: WorkLease,
  ) {
    this.l = new Layout(src, n);
    this.m = lease.float64(this.l.length);
    this.piv = lease.int32(n);
    this.sparse = src.sparse ? new SparseLu(src.sparse.analysis, leased(lease)) : null;
  }

  /** M = d I - s J from the source's current Jacobian, factored; false when singular. */
  factor(d: number, s: number): boolean {
    const m = this.m;
    const jac = this.src.jac;
    const len = m.length;
    for (let q = 0; q < len; q++) m[q] = -s * jac[q]!;
    const n = this.n;
    const l = this.l;
    if (this.sparse) {
      const diagonal = l.diagonal!;
      for (let i = 0; i < n; i++) m[diagonal[i]!] = m[diagonal[i]!]! + d;
      return this.sparse.factor(m);
    }
    for (let i = 0, q = l.diagStart; i < n; i++, q += l.diagStride) m[q] = m[q]! + d;
    if (l.small !== null) return l.small.factor(m, this.piv);
    return l.banded ? bandLuFactor(m, n, l.ml, l.mu, this.piv) : luFactor(m, n, this.piv);
  }

  /** True when the factors are dense, row-major n x n, from the written-out LU (lu-small.ts). */
  get smallDense(): boolean {
    return this.l.small !== null;
  }

  /** b := M^{-1} b with the last factors. */
  solve(b: Float64Array): void {
    if (this.sparse) this.sparse.solve(b);
    else if (this.l.small !== null) this.l.small.solve(this.m, this.piv, b);
    else if (this.l.banded) bandLuSolve(this.m, this.n, this.l.ml, this.l.mu, this.piv, b);
    else luSolve(this.m, this.n, this.piv, b);
  }
}

export class ComplexIterationMatrix {
  private readonly l: Layout;
  /** The factors and pivots of the last factor() (read by written-out solves, radau-kernel.ts). */
  readonly mr: Float64Array;
  readonly mi: Float64Array;
  readonly piv: Int32Array;
  private readonly sparse: ComplexSparseLu | null;

  constructor(
    private readonly src: JacobianSource,
    private readonly n: number,
    lease: WorkLease,
  ) {
    this.l = new Layout(src, n);
    this.mr = lease.float64(this.l.length);
    this.mi = lease.float64(this.l.length);
    this.piv = lease.int32(n);
    this.sparse = src.sparse ? new ComplexSparseLu(src.sparse.analysis, leased(lease)) : null;
  }

  /** M = (dr + i di) I - J from the source's current Jacobian, factored; false when singular. */
  factor(dr: number, di: number): boolean {
    const mr = this.mr;
    const mi = this.mi;
    const jac = this.src.jac;
    const len = mr.length;
    for (let q = 0; q < len; q++) {
      mr[q] = -jac[q]!;
      mi[q] = 0;
    }
    const n = this.n;
    const l = this.l;
    if (this.sparse) {
      const diagonal = l.diagonal!;
      for (let i = 0; i < n; i++) {
        const q = diagonal[i]!;
        mr[q] = mr[q]! + dr;
        mi[q] = di;
      }
      return this.sparse.factor(mr, mi);
    }
    for (let i = 0, q = l.diagStart; i < n; i++, q += l.diagStride) {
      mr[q] = mr[q]! + dr;
      mi[q] = di;
    }
    if (l.small !== null) return l.small.complexFactor(mr, mi, this.piv);
    return l.banded ? complexBandLuFactor(mr, mi, n, l.ml, l.mu, this.piv) : complexLuFactor(mr, mi, n, this.piv);
  }

  /** True when the factors are dense, row-major n x n, from the written-out LU (lu-small.ts). */
  get smallDense(): boolean {
    return this.l.small !== null;
  }

  /** (br + i bi) := M^{-1} (br + i bi) with the last factors. */
  solve(br: Float64Array, bi: Float64Array): void {
    if (this.sparse) this.sparse.solve(br, bi);
    else if (this.l.small !== null) this.l.small.complexSolve(this.mr, this.mi, this.piv, br, bi);
    else if (this.l.banded) complexBandLuSolve(this.mr, this.mi, this.n, this.l.ml, this.l.mu, this.piv, br, bi);
    else complexLuSolve(this.mr, this.mi, this.n, this.piv, br, bi);
  }
}
