// Explicit Runge-Kutta tableaux as data: authored as plain nested arrays beside their paper,
// compiled once into Float64Array form (with the zero couplings skipped) for the engines.
import { InputError } from '../../core/errors.js';
import type { Rhs } from '../../core/types.js';

/** Slots of the scalar buffer a stage kernel reads its step from and writes its error to. */
export const IO_T = 0;
export const IO_T_NEW = 1;
export const IO_H = 2;
export const IO_RTOL = 3;
export const IO_ERR = 4;
/** 0 when y_new and (for FSAL pairs) the last stage are all finite, NaN otherwise. */
export const IO_NONFINITE = 5;
export const IO_SIZE = 6;

/**
 * Optional straight-line step for one pair: stages 2..s (the FSAL stage included, evaluated at
 * tNew), y_new, the scaled error norm the generic sweep would compute (single or combined
 * estimate) in IO_ERR, and in IO_NONFINITE the sum of v - v over y_new and the FSAL stage (0 when
 * all are finite). Costs s - 1 evaluations. The scalars travel in `io` (slots IO_*), not as arguments:
 * a kernel is too large for V8 to inline into the engine, and a double passed to or returned
 * from a call that is not inlined is boxed on the heap, several allocations per step otherwise.
 */
export type StageKernel = (
  f: Rhs,
  io: Float64Array,
  y: Float64Array,
  yNew: Float64Array,
  yStage: Float64Array,
  K: Float64Array,
  kRow: readonly Float64Array[],
  atol: Float64Array,
  n: number,
) => void;

/** The kernel to step a system of n states with. */
export type KernelFactory = (n: number) => StageKernel;

/** A tableau as written in its paper: strictly lower triangular A, weights b, nodes c. */
export interface TableauData {
  /** Rows of A; row i holds a_i1 .. a_i,i-1 (row 0 is empty). */
  readonly a: readonly (readonly number[])[];
  /** Weights of the propagated solution. */
  readonly b: readonly number[];
  readonly c: readonly number[];
  /** Published order of the propagated solution. */
  readonly order: number;
  /**
   * Weights of the embedded solution (pairs only). The error estimate is h * sum (b_i - bHat_i) k_i.
   */
  readonly bHat?: readonly number[];
  readonly embeddedOrder?: number;
  /**
   * Second embedded solution for combined estimates (DOP853: the 3rd-order weights), with its order.
   */
  readonly bHat2?: readonly number[];
  readonly embeddedOrder2?: number;
  /**
   * err ~ h^(controlOrder + 1); defaults to min(order, embeddedOrder). Combined estimates that
   * behave like a higher power of h set it explicitly.
   */
  readonly controlOrder?: number;
  /**
   * Step with the stages as increments over the first: after f fills stage i (i >= 1) it holds
   * k_i - k_1, and the sums use c_i for k_1 (sum_j a_ij = c_i, sum b = 1, sum (b - bHat) = 0 in
   * exact arithmetic), so the doubles' rounding of large cancelling coefficients multiplies
   * O(h) differences instead of O(1) derivatives. Verner's 8(7) pair loses its 1e-10 floor on
   * kepler-eccentric this way (bench/README). Not with FSAL pairs (their last stage is reused).
   */
  readonly increments?: boolean;
}

/** The coefficients the engines multiply with: as published, or in increment form. */
export function workingWeights(d: TableauData): {
  a: readonly (readonly number[])[];
  b: readonly number[];
  bHat?: readonly number[];
  bHat2?: readonly number[];
} {
  if (!d.increments) return d;
  if (isFsal(d)) throw new InputError('the increment form is not defined for FSAL pairs');
  const first = (w: readonly number[] | undefined, sum: number) => (w ? w.map((v, i) => (i === 0 ? sum : v)) : undefined);
  const out: { a: number[][]; b: number[]; bHat?: number[]; bHat2?: number[] } = {
    a: d.a.map((row, i) => row.map((v, j) => (j === 0 ? d.c[i]! : v))),
    b: first(d.b, 1)!,
  };
  // With b_1 -> 1 and bHat_1 -> 1 the error weights b - bHat get a 0 for k_1, as they should.
  const bHat = first(d.bHat, 1);
  const bHat2 = first(d.bHat2, 1);
  if (bHat) out.bHat = bHat;
  if (bHat2) out.bHat2 = bHat2;
  return out;
}

/**
 * What a tableau file exports: the method's identity beside its coefficients. The registry
 * (tableaus/index.ts) lists these; the engine, its kernels and the tests take everything from here.
 */
export interface TableauMethod {
  /** kebab-case, after the published method. */
  readonly id: string;
  readonly name: string;
  /** The paper the coefficients come from. */
  readonly source: string;
  readonly notes?: string;
  readonly tableau: TableauData;
  /**
   * A continuous extension, when the method has one: `form` names the interpolation formula the
   * coefficients `d` plug into ('dopri5': HNW I sec. II.6, see dense-dp54.ts), or 'fsal-hermite':
   * the cubic Hermite of the step's end values and slopes, free with a first-same-as-last pair
   * (dense-hermite.ts), or 'extra-stages': a published interpolant that needs stages of its own
   * beyond the step's, evaluated only when a value between steps is asked for (dense-extra-stages.ts).
   */
  readonly denseOutput?: { readonly form: 'dopri5'; readonly d: readonly number[] } | { readonly form: 'fsal-hermite' } | ExtraStageInterpolant;
}

/**
 * A continuous extension with extra stages (J. H. Verner's interpolants, Numer. Algorithms 53
 * (2010) 383-396; DOP853's, HNW I sec. II.6, expanded into this form): stages s+1 .. s+m at
 * nodes c, with rows a over all earlier stages (the step's s and the extra ones before it), and
 * y(t + theta h) = y + h sum_i b_i(theta) k_i over all s+m stages, where
 * b_i(theta) = sum_k weights[i][k-1] theta^k ([] for a stage that does not enter).
 */
export interface ExtraStageInterpolant {
  readonly form: 'extra-stages';
  /** Published order of the interpolant. */
  readonly order: number;
  readonly c: readonly number[];
  readonly a: readonly (readonly number[])[];
  readonly weights: readonly (readonly number[])[];
}

/** The compiled form the engines step with. */
export interface Tableau {
  readonly stages: number;
  readonly order: number;
  readonly embeddedOrder: number;
  readonly controlOrder: number;
  readonly c: Float64Array;
  /** Compressed rows of A: nonzero a_ij of row i are aVal[aStart[i] .. aStart[i+1]), columns aCol. */
  readonly aStart: Int32Array;
  readonly aCol: Int32Array;
  readonly aVal: Float64Array;
  /** Nonzero propagated weights. */
  readonly bCol: Int32Array;
  readonly bVal: Float64Array;
  /** Nonzero error weights b - bHat (empty for fixed-step tableaux). */
  readonly eCol: Int32Array;
  readonly eVal: Float64Array;
  /** Nonzero second error weights b - bHat2 (empty unless a combined estimate is used). */
  readonly e2Col: Int32Array;
  readonly e2Val: Float64Array;
  /**
   * First same as last: the last stage is evaluated at (t + h, y_new), so it is the next step's
   * first stage and costs nothing extra there.
   */
  readonly fsal: boolean;
  /** Stages 2..s hold k_i - k_1 after evaluation (TableauData.increments). */
  readonly increments: boolean;
  /** Unrolled step, when one is attached (embedded pairs only). */
  readonly kernel: KernelFactory | null;
  readonly data: TableauData;
}

/** Relative tolerance for "this coefficient equals that one" when detecting FSAL structure. */
const SAME = 1e-15;

function sparse(w: readonly number[]): { col: Int32Array; val: Float64Array } {
  const cols: number[] = [];
  const vals: number[] = [];
  w.forEach((v, i) => {
    if (v !== 0) {
      cols.push(i);
      vals.push(v);
    }
  });
  return { col: Int32Array.from(cols), val: Float64Array.from(vals) };
}

/** Error coefficients b - bHat of an embedded pair (the compiled tableau and the generated kernels use them). */
export function errorCoefficients(b: readonly number[], bHat: readonly number[]): number[] {
  return b.map((v, i) => v - (bHat[i] ?? 0));
}

/** The last stage is f(t + h, y_new): its row of A is b, its node 1, its own weight 0. */
export function isFsal(d: TableauData): boolean {
  const s = d.c.length;
  const last = d.a[s - 1];
  return (
    s > 1 &&
    last !== undefined &&
    d.c[s - 1] === 1 &&
    d.b[s - 1] === 0 &&
    d.b.every((bi, j) => j === s - 1 || Math.abs((last[j] ?? 0) - bi) <= SAME * Math.max(1, Math.abs(bi)))
  );
}

export function compileTableau(d: TableauData, kernel?: KernelFactory): Tableau {
  const s = d.c.length;
  if (d.a.length !== s || d.b.length !== s) {
    throw new InputError(`tableau has ${s} nodes but ${d.a.length} rows of A and ${d.b.length} weights`);
  }
  const w = workingWeights(d);
  const starts: number[] = [0];
  const cols: number[] = [];
  const vals: number[] = [];
  for (let i = 0; i < s; i++) {
    const row = w.a[i]!;
    if (row.length > i) throw new InputError(`tableau row ${i} of A must have at most ${i} entries (explicit)`);
    for (let j = 0; j < row.length; j++) {
      const v = row[j]!;
      if (v !== 0) {
        cols.push(j);
        vals.push(v);
      }
    }
    starts.push(cols.length);
  }
  const fsal = isFsal(d);
  const bs = sparse(w.b);
  const es = sparse(w.bHat ? errorCoefficients(w.b, w.bHat) : []);
  const e2s = sparse(w.bHat2 ? errorCoefficients(w.b, w.bHat2) : []);
  const embeddedOrder = d.embeddedOrder ?? 0;
  if (kernel && !d.bHat) throw new InputError('a stage kernel needs an embedded pair (bHat)');
  return {
    stages: s,
    order: d.order,
    embeddedOrder,
    controlOrder: d.controlOrder ?? Math.min(d.order, embeddedOrder || d.order),
    c: Float64Array.from(d.c),
    aStart: Int32Array.from(starts),
    aCol: Int32Array.from(cols),
    aVal: Float64Array.from(vals),
    bCol: bs.col,
    bVal: bs.val,
    eCol: es.col,
    eVal: es.val,
    e2Col: e2s.col,
    e2Val: e2s.val,
    fsal,
    increments: d.increments === true,
    kernel: kernel ?? null,
    data: d,
  };
}
