// The iteration matrices of the implicit steppers, d I - s J (real) and (dr + i di) I - s J
// (complex, Radau IIA), formed from a Jacobian source and factored: dense LU (src/core/lu.ts) for
// a dense Jacobian, banded LU (src/core/band-lu.ts) when the source holds a band. The dense
// forms are the loops the steppers had inline, operation for operation, so dense counts and
// results are unchanged.
import { bandLuFactor, bandLuSolve, bandWidth, complexBandLuFactor, complexBandLuSolve } from '../../core/band-lu.js';
import type { JacobianSource } from '../../core/jacobian.js';
import { complexLuFactor, complexLuSolve, luFactor, luSolve } from '../../core/lu.js';
import type { WorkLease } from '../work-lease.js';

/** Storage length and diagonal positions of one matrix for a source. */
function layout(src: JacobianSource, n: number): { length: number; diagStart: number; diagStride: number; ml: number; mu: number } {
  if (!src.band) return { length: n * n, diagStart: 0, diagStride: n + 1, ml: 0, mu: 0 };
  const { lower: ml, upper: mu } = src.band;
  const w = bandWidth(ml, mu);
  return { length: n * w, diagStart: ml, diagStride: w, ml, mu };
}

export class RealIterationMatrix {
  private readonly m: Float64Array;
  private readonly piv: Int32Array;
  private readonly banded: boolean;
  private readonly ml: number;
  private readonly mu: number;
  private readonly diagStart: number;
  private readonly diagStride: number;

  constructor(
    private readonly src: JacobianSource,
    private readonly n: number,
    lease: WorkLease,
  ) {
    const l = layout(src, n);
    this.m = lease.float64(l.length);
    this.piv = lease.int32(n);
    this.banded = src.band !== null;
    this.ml = l.ml;
    this.mu = l.mu;
    this.diagStart = l.diagStart;
    this.diagStride = l.diagStride;
  }

  /** M = d I - s J from the source's current Jacobian, factored; false when singular. */
  factor(d: number, s: number): boolean {
    const m = this.m;
    const jac = this.src.jac;
    const len = m.length;
    for (let q = 0; q < len; q++) m[q] = -s * jac[q]!;
    const n = this.n;
    for (let i = 0, q = this.diagStart; i < n; i++, q += this.diagStride) m[q] = m[q]! + d;
    return this.banded ? bandLuFactor(m, n, this.ml, this.mu, this.piv) : luFactor(m, n, this.piv);
  }

  /** b := M^{-1} b with the last factors. */
  solve(b: Float64Array): void {
    if (this.banded) bandLuSolve(this.m, this.n, this.ml, this.mu, this.piv, b);
    else luSolve(this.m, this.n, this.piv, b);
  }
}

export class ComplexIterationMatrix {
  private readonly mr: Float64Array;
  private readonly mi: Float64Array;
  private readonly piv: Int32Array;
  private readonly banded: boolean;
  private readonly ml: number;
  private readonly mu: number;
  private readonly diagStart: number;
  private readonly diagStride: number;

  constructor(
    private readonly src: JacobianSource,
    private readonly n: number,
    lease: WorkLease,
  ) {
    const l = layout(src, n);
    this.mr = lease.float64(l.length);
    this.mi = lease.float64(l.length);
    this.piv = lease.int32(n);
    this.banded = src.band !== null;
    this.ml = l.ml;
    this.mu = l.mu;
    this.diagStart = l.diagStart;
    this.diagStride = l.diagStride;
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
    for (let i = 0, q = this.diagStart; i < n; i++, q += this.diagStride) {
      mr[q] = mr[q]! + dr;
      mi[q] = di;
    }
    return this.banded ? complexBandLuFactor(mr, mi, n, this.ml, this.mu, this.piv) : complexLuFactor(mr, mi, n, this.piv);
  }

  /** (br + i bi) := M^{-1} (br + i bi) with the last factors. */
  solve(br: Float64Array, bi: Float64Array): void {
    if (this.banded) complexBandLuSolve(this.mr, this.mi, this.n, this.ml, this.mu, this.piv, br, bi);
    else complexLuSolve(this.mr, this.mi, this.n, this.piv, br, bi);
  }
}
