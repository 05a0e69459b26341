// What a Rosenbrock method is as data (the engine in rosenbrock.ts steps it), and the two
// readings of its error weights that the engine and its generated stage code share.

/** A Rosenbrock method in the transformed form above: s stages, a_ij and c_ij below the diagonal. */
export interface RosenbrockData {
  readonly gamma: number;
  /** alpha_i, the stage times as fractions of h. */
  readonly alpha: readonly number[];
  /** gamma_i = sum_j gamma_ij, the weight of h df/dt in stage i. */
  readonly gammaSum: readonly number[];
  /** a_ij, j < i, row by row. */
  readonly a: readonly (readonly number[])[];
  /** c_ij, j < i, row by row. */
  readonly c: readonly (readonly number[])[];
  /** Solution weights m_i. */
  readonly m: readonly number[];
  /** Error-estimate weights e_i (the estimate is sum e_i u_i). */
  readonly e: readonly number[];
  /**
   * Stages whose f argument equals the previous stage's (same alpha, same a row with a zero last
   * entry), so the previous evaluation is reused; from the method's own definition.
   */
  readonly reuse: readonly boolean[];
  /** Exponent of the step-size controller, 1 / (embedded order + 1). */
  readonly errorExponent: number;
}

/** The stage index whose u the estimate is, when e is a unit vector; else -1. */
export function unitEstimateStage(e: readonly number[]): number {
  const nonzero = errorTerms(e);
  return nonzero.length === 1 && e[nonzero[0]!] === 1 ? nonzero[0]! : -1;
}

/** Indices of the nonzero error weights, in order. */
export function errorTerms(e: readonly number[]): number[] {
  return e.flatMap((v, i) => (v === 0 ? [] : [i]));
}

