// Change of step size for backward differences stored at constant spacing.
// L. F. Shampine & M. W. Reichelt, The MATLAB ODE Suite, SIAM J. Sci. Comput. 18 (1997) 1-22,
// sec. 2.2: when h becomes r*h, the differences D_0..D_k of the interpolating polynomial are
// mapped by (R U)^T with R_ij = prod_{m=1..i} (m - 1 - j r) / m and U = R at r = 1.

/** Fill rOut[at ..] ((k+1) x (k+1), row-major) with R(r) for order k. */
export function differenceRescaleMatrix(k: number, r: number, rOut: Float64Array, at = 0): void {
  const m = k + 1;
  for (let j = 0; j < m; j++) rOut[at + j] = 1;
  for (let i = 1; i < m; i++) {
    rOut[at + i * m] = 0;
    for (let j = 1; j < m; j++) rOut[at + i * m + j] = rOut[at + (i - 1) * m + j]! * ((i - 1 - j * r) / i);
  }
}

/**
 * Rescale the differences D[0..k] (rows of length n in d, row-major) in place for the step ratio
 * r. work must hold at least 3 (k+1)^2 + (k+1) n entries; its parts are reached by offset, since
 * a subarray view per call would allocate on every change of step.
 */
export function rescaleDifferences(d: Float64Array, n: number, k: number, r: number, work: Float64Array): void {
  const m = k + 1;
  const R = 0;
  const U = m * m;
  const RU = 2 * m * m;
  const tmp = 3 * m * m;
  differenceRescaleMatrix(k, r, work, R);
  differenceRescaleMatrix(k, 1, work, U);
  for (let i = 0; i < m; i++) {
    for (let j = 0; j < m; j++) {
      let s = 0;
      for (let l = 0; l < m; l++) s += work[R + i * m + l]! * work[U + l * m + j]!;
      work[RU + i * m + j] = s;
    }
  }
  // new D_j = sum_i RU_ij D_i
  for (let j = 0; j < m; j++) {
    for (let c = 0; c < n; c++) {
      let s = 0;
      for (let i = 0; i < m; i++) s += work[RU + i * m + j]! * d[i * n + c]!;
      work[tmp + j * n + c] = s;
    }
  }
  for (let q = 0; q < m * n; q++) d[q] = work[tmp + q]!;
}
