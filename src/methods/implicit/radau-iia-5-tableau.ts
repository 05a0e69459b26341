// Radau IIA of order 5 (3 stages) as data, and the quantities its implementation derives from it.
// Butcher tableau: Hairer & Wanner, Solving ODEs II, sec. IV.5, Table 5.6 (s = 3).
// The transformation T that block-diagonalizes A^{-1} into one real eigenvalue gamma and one
// complex pair alpha +- i beta (sec. IV.8, eq. (8.14)), and the embedded order-3 formula with
// b0 = 1/gamma (sec. IV.8, eq. (8.19)) are computed here from the tableau, not typed in, so they
// follow from the published coefficients alone.
import { luFactor, luSolve } from '../../core/lu.js';

const S6 = Math.sqrt(6);

/** Nodes c_i. */
export const RADAU5_C: readonly number[] = [(4 - S6) / 10, (4 + S6) / 10, 1];

/** Coefficient matrix a_ij, row-major. */
export const RADAU5_A: readonly number[] = [
  (88 - 7 * S6) / 360, (296 - 169 * S6) / 1800, (-2 + 3 * S6) / 225,
  (296 + 169 * S6) / 1800, (88 + 7 * S6) / 360, (-2 - 3 * S6) / 225,
  (16 - S6) / 36, (16 + S6) / 36, 1 / 9,
];

export interface RadauTransform {
  /** A^{-1}, row-major 3x3. */
  readonly ainv: readonly number[];
  /** Real eigenvalue of A^{-1}. */
  readonly gamma: number;
  /** Complex pair alpha +- i beta of A^{-1}. */
  readonly alpha: number;
  readonly beta: number;
  /** T (columns: real eigenvector, Re and -Im of the complex one) with T^{-1} A^{-1} T block diagonal. */
  readonly t: readonly number[];
  readonly tinv: readonly number[];
  /** Embedded weights b^_1..3 (with b^_0 = 1/gamma) of order 3. */
  readonly bhat: readonly number[];
  /** d_j of the estimate err = (gamma/h I - J)^{-1} (f0 + sum_j d_j z_j / h). */
  readonly d: readonly number[];
}

function inverse3(m: readonly number[]): number[] {
  const a = Float64Array.from(m);
  const piv = new Int32Array(3);
  if (!luFactor(a, 3, piv)) throw new Error('singular 3x3 matrix');
  const out = new Array<number>(9);
  const col = new Float64Array(3);
  for (let j = 0; j < 3; j++) {
    col.fill(0);
    col[j] = 1;
    luSolve(a, 3, piv, col);
    for (let i = 0; i < 3; i++) out[i * 3 + j] = col[i]!;
  }
  return out;
}

/** Roots of lambda^3 + p2 lambda^2 + p1 lambda + p0 with one real root and a complex pair. */
function cubicRealAndPair(p2: number, p1: number, p0: number): { real: number; re: number; im: number } {
  const p = (x: number) => ((x + p2) * x + p1) * x + p0;
  // Bracket the real root by growing an interval; the cubic is monic so p(-inf) < 0 < p(inf).
  let lo = -1;
  let hi = 1;
  while (p(lo) > 0) lo *= 2;
  while (p(hi) < 0) hi *= 2;
  for (let k = 0; k < 200; k++) {
    const mid = 0.5 * (lo + hi);
    if (p(mid) < 0) lo = mid;
    else hi = mid;
  }
  let r = 0.5 * (lo + hi);
  for (let k = 0; k < 3; k++) r -= p(r) / ((3 * r + 2 * p2) * r + p1);
  // Deflate: lambda^2 + q1 lambda + q0.
  const q1 = p2 + r;
  const q0 = p1 + r * q1;
  const disc = q0 - (q1 * q1) / 4;
  if (!(disc > 0)) throw new Error('expected a complex pair');
  return { real: r, re: -q1 / 2, im: Math.sqrt(disc) };
}

function computeTransform(): RadauTransform {
  const A = RADAU5_A;
  const ainv = inverse3(A);
  const m = ainv;
  const tr = m[0]! + m[4]! + m[8]!;
  const minors = m[0]! * m[4]! - m[1]! * m[3]! + m[0]! * m[8]! - m[2]! * m[6]! + m[4]! * m[8]! - m[5]! * m[7]!;
  const det =
    m[0]! * (m[4]! * m[8]! - m[5]! * m[7]!) - m[1]! * (m[3]! * m[8]! - m[5]! * m[6]!) + m[2]! * (m[3]! * m[7]! - m[4]! * m[6]!);
  const { real: gamma, re: alpha, im: beta } = cubicRealAndPair(-tr, minors, -det);
  // Null vectors as cross products of two rows of (A^{-1} - lambda I); complex arithmetic for the pair.
  const r0 = [m[0]! - gamma, m[1]!, m[2]!];
  const r1 = [m[3]!, m[4]! - gamma, m[5]!];
  const vr = [r0[1]! * r1[2]! - r0[2]! * r1[1]!, r0[2]! * r1[0]! - r0[0]! * r1[2]!, r0[0]! * r1[1]! - r0[1]! * r1[0]!];
  // rows with complex diagonal entries (m_ii - alpha) - i beta
  const ar0 = [m[0]! - alpha, m[1]!, m[2]!];
  const ai0 = [-beta, 0, 0];
  const ar1 = [m[3]!, m[4]! - alpha, m[5]!];
  const ai1 = [0, -beta, 0];
  const cmulR = (xr: number, xi: number, yr: number, yi: number) => xr * yr - xi * yi;
  const cmulI = (xr: number, xi: number, yr: number, yi: number) => xr * yi + xi * yr;
  const cross = (i: number, j: number) => ({
    re: cmulR(ar0[i]!, ai0[i]!, ar1[j]!, ai1[j]!) - cmulR(ar0[j]!, ai0[j]!, ar1[i]!, ai1[i]!),
    im: cmulI(ar0[i]!, ai0[i]!, ar1[j]!, ai1[j]!) - cmulI(ar0[j]!, ai0[j]!, ar1[i]!, ai1[i]!),
  });
  const v0 = cross(1, 2);
  const v1 = cross(2, 0);
  const v2 = cross(0, 1);
  const vcRe = [v0.re, v1.re, v2.re];
  const vcIm = [v0.im, v1.im, v2.im];
  // Columns: v_real, Re(v_c), -Im(v_c): then A^{-1} t2 = alpha t2 + beta t3, A^{-1} t3 = -beta t2 + alpha t3.
  const t: number[] = [];
  for (let i = 0; i < 3; i++) t.push(vr[i]!, vcRe[i]!, -vcIm[i]!);
  const tinv = inverse3(t);
  // Embedded weights: b0 + sum b^_i = 1, sum b^_i c_i = 1/2, sum b^_i c_i^2 = 1/3 with b0 = 1/gamma.
  const c = RADAU5_C;
  const V = [1, 1, 1, c[0]!, c[1]!, c[2]!, c[0]! ** 2, c[1]! ** 2, c[2]! ** 2];
  const Vf = Float64Array.from(V);
  const piv = new Int32Array(3);
  luFactor(Vf, 3, piv);
  const rhs = Float64Array.from([1 - 1 / gamma, 1 / 2, 1 / 3]);
  luSolve(Vf, 3, piv, rhs);
  const bhat = Array.from(rhs);
  // b is the last row of A (stiffly accurate); e = (b^ - b) A^{-1}, d = gamma * e.
  const d: number[] = [];
  for (let j = 0; j < 3; j++) {
    let e = 0;
    for (let i = 0; i < 3; i++) e += (bhat[i]! - A[6 + i]!) * ainv[i * 3 + j]!;
    d.push(gamma * e);
  }
  return { ainv, gamma, alpha, beta, t, tinv, bhat, d };
}

export const RADAU5_TRANSFORM: RadauTransform = computeTransform();
