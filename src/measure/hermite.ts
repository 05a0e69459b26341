// Interpolating a run between two of its accepted steps, for locating events: two-point Hermite
// interpolation from the states and their first and second time derivatives at both ends
// (degree 5 on every component), and, for a problem that names an orbit's position and velocity,
// degree 7 on the position (position, velocity, acceleration and its rate at both ends) with the
// velocity its derivative. Basis of the two-point Hermite interpolant with derivatives 0..m at
// each end, on s in [0, 1] (e.g. Davis, Interpolation and Approximation, 1963, sec. 2.7; common
// textbook form):
//   left:  H_k(s) = s^k/k! (1 - s)^(m+1) sum_{j=0}^{m-k} C(m+j, j) s^j
//   right: G_k(s) = (s - 1)^k/k! s^(m+1) sum_{j=0}^{m-k} C(m+j, j) (1 - s)^j
// The second derivative y'' = d f(t, y(t))/dt comes from a centred difference of f along the
// run's own direction, (f(t + d, y + d f) - f(t - d, y - d f)) / 2d, so neither a Jacobian nor
// the time dependence of f is needed (relative error about eps^(2/3), 1e-10).
import type { OrbitStates } from '../core/types.js';

type Poly = number[];

function mul(a: Poly, b: Poly): Poly {
  const out = new Array<number>(a.length + b.length - 1).fill(0);
  a.forEach((x, i) => b.forEach((y, j) => (out[i + j]! += x * y)));
  return out;
}

function pow(a: Poly, k: number): Poly {
  let out: Poly = [1];
  for (let i = 0; i < k; i++) out = mul(out, a);
  return out;
}

function add(a: Poly, b: Poly): Poly {
  const out = new Array<number>(Math.max(a.length, b.length)).fill(0);
  a.forEach((x, i) => (out[i]! += x));
  b.forEach((x, i) => (out[i]! += x));
  return out;
}

function binomial(n: number, k: number): number {
  let r = 1;
  for (let i = 1; i <= k; i++) r = (r * (n - k + i)) / i;
  return r;
}

function factorial(k: number): number {
  return k <= 1 ? 1 : k * factorial(k - 1);
}

/** Coefficients (ascending powers of s) of the left and right basis polynomials for derivatives 0..m. */
function basis(m: number): { left: Poly[]; right: Poly[] } {
  const S: Poly = [0, 1];
  const oneMinusS: Poly = [1, -1];
  const sMinusOne: Poly = [-1, 1];
  const left: Poly[] = [];
  const right: Poly[] = [];
  for (let k = 0; k <= m; k++) {
    let sumL: Poly = [0];
    let sumR: Poly = [0];
    for (let j = 0; j <= m - k; j++) {
      sumL = add(sumL, pow(S, j).map((c) => c * binomial(m + j, j)));
      sumR = add(sumR, pow(oneMinusS, j).map((c) => c * binomial(m + j, j)));
    }
    const f = 1 / factorial(k);
    left.push(mul(mul(pow(S, k), pow(oneMinusS, m + 1)), sumL).map((c) => c * f));
    right.push(mul(mul(pow(sMinusOne, k), pow(S, m + 1)), sumR).map((c) => c * f));
  }
  return { left, right };
}

function derivative(p: Poly): Poly {
  return p.slice(1).map((c, i) => c * (i + 1));
}

const QUINTIC = basis(2);
const SEPTIC = basis(3);
const SEPTIC_D = { left: SEPTIC.left.map(derivative), right: SEPTIC.right.map(derivative) };

function horner(p: Poly, s: number): number {
  let v = 0;
  for (let i = p.length - 1; i >= 0; i--) v = v * s + p[i]!;
  return v;
}

/** The two ends of a step: states, first and second time derivatives. */
export interface StepEnds {
  tA: number;
  tB: number;
  yA: Float64Array;
  yB: Float64Array;
  fA: Float64Array;
  fB: Float64Array;
  /** y'' at each end. */
  gA: Float64Array;
  gB: Float64Array;
}

/** Working buffers for secondDerivative (length n each). */
export interface SecondDerivativeWork {
  y: Float64Array;
  fp: Float64Array;
  fm: Float64Array;
}

/** Cube root of the unit round-off: the centred difference's step, relative. */
const DIFF_REL = 6e-6;

/** y'' = d f(t, y(t))/dt at (t, y) with f = f(t, y) given, into out; returns the evaluations of rhs made (2, or 0 where f = 0). */
export function secondDerivative(
  rhs: (t: number, y: Float64Array, dy: Float64Array) => void,
  t: number,
  y: Float64Array,
  f: Float64Array,
  out: Float64Array,
  work: SecondDerivativeWork,
): number {
  const n = y.length;
  let ySize = 0;
  let fSize = 0;
  for (let i = 0; i < n; i++) {
    ySize = Math.max(ySize, Math.abs(y[i]!));
    fSize = Math.max(fSize, Math.abs(f[i]!));
  }
  if (fSize === 0) {
    out.fill(0);
    return 0;
  }
  // d moves the state by about DIFF_REL of its size (or of the time, when that is larger).
  const d = DIFF_REL * Math.max(ySize > 0 ? ySize / fSize : 1, Math.abs(t) > 0 ? Math.abs(t) * 1e-3 : 0);
  for (let i = 0; i < n; i++) work.y[i] = y[i]! + d * f[i]!;
  rhs(t + d, work.y, work.fp);
  for (let i = 0; i < n; i++) work.y[i] = y[i]! - d * f[i]!;
  rhs(t - d, work.y, work.fm);
  for (let i = 0; i < n; i++) out[i] = (work.fp[i]! - work.fm[i]!) / (2 * d);
  return 2;
}

/** The interpolated state at t in [tA, tB], written into out. */
export function hermiteAt(ends: StepEnds, t: number, out: Float64Array, orbit: OrbitStates | undefined): void {
  const { tA, tB, yA, yB, fA, fB, gA, gB } = ends;
  const h = tB - tA;
  const s = (t - tA) / h;
  const L = QUINTIC.left;
  const R = QUINTIC.right;
  const l0 = horner(L[0]!, s), l1 = horner(L[1]!, s) * h, l2 = horner(L[2]!, s) * h * h;
  const r0 = horner(R[0]!, s), r1 = horner(R[1]!, s) * h, r2 = horner(R[2]!, s) * h * h;
  const n = out.length;
  for (let i = 0; i < n; i++) out[i] = l0 * yA[i]! + l1 * fA[i]! + l2 * gA[i]! + r0 * yB[i]! + r1 * fB[i]! + r2 * gB[i]!;
  if (!orbit) return;
  const h2 = h * h;
  const h3 = h2 * h;
  const SL = SEPTIC.left;
  const SR = SEPTIC.right;
  const DL = SEPTIC_D.left;
  const DR = SEPTIC_D.right;
  const w = [horner(SL[0]!, s), horner(SL[1]!, s) * h, horner(SL[2]!, s) * h2, horner(SL[3]!, s) * h3];
  const x = [horner(SR[0]!, s), horner(SR[1]!, s) * h, horner(SR[2]!, s) * h2, horner(SR[3]!, s) * h3];
  const dw = [horner(DL[0]!, s) / h, horner(DL[1]!, s), horner(DL[2]!, s) * h, horner(DL[3]!, s) * h2];
  const dx = [horner(DR[0]!, s) / h, horner(DR[1]!, s), horner(DR[2]!, s) * h, horner(DR[3]!, s) * h2];
  for (let k = 0; k < 3; k++) {
    const p = orbit.position[k]!;
    const v = orbit.velocity[k]!;
    // Position, velocity (f[p]), acceleration (f[v]) and its rate (y''[v]) at each end.
    const a0 = yA[p]!, a1 = fA[p]!, a2 = fA[v]!, a3 = gA[v]!;
    const b0 = yB[p]!, b1 = fB[p]!, b2 = fB[v]!, b3 = gB[v]!;
    out[p] = w[0]! * a0 + w[1]! * a1 + w[2]! * a2 + w[3]! * a3 + x[0]! * b0 + x[1]! * b1 + x[2]! * b2 + x[3]! * b3;
    out[v] = dw[0]! * a0 + dw[1]! * a1 + dw[2]! * a2 + dw[3]! * a3 + dx[0]! * b0 + dx[1]! * b1 + dx[2]! * b2 + dx[3]! * b3;
  }
}
