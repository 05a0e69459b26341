// Step-size control for the embedded pairs: the constants, the two controllers and the automatic
// initial step. Every constant lives here, once.
import { scaledRmsNorm } from '../../core/vector.js';
import type { Rhs } from '../../core/types.js';

/** Safety factor on the predicted optimal step (HNW I, sec. II.4, eq. (4.13)). */
export const SAFETY = 0.9;
/** Smallest and largest step change per step (the DOPRI5 defaults of HNW I, sec. II.4). */
export const FAC_MIN = 0.2;
export const FAC_MAX = 10;
/** Step shrink after a non-finite stage or error (no error estimate to scale by). */
export const NONFINITE_SHRINK = 0.25;
/** A step below this multiple of eps * |t| cannot move t: step underflow. */
export const UNDERFLOW_ULPS = 16;
/**
 * Land on a stop when it is within this factor of the proposed step, so no sliver step
 * (which could trip the underflow guard) is left behind.
 */
export const LANDING_STRETCH = 1 + 1e-6;
/**
 * PI controller h_new = h * safety * err^(-alpha) * errPrev^beta with alpha = 0.7/k, beta = 0.4/k
 * (k = q + 1), i.e. integral gain 0.3/k and proportional gain 0.4/k: K. Gustafsson, "Control
 * theoretic techniques for stepsize selection in explicit Runge-Kutta methods", ACM Trans. Math.
 * Softw. 17 (1991) 533-554; the same form in HNW II, sec. IV.2. Values quoted from memory.
 */
export const PI_ALPHA = 0.7;
export const PI_BETA = 0.4;
/** Floor on the previous error in the PI formula, so a tiny error cannot blow the step up. */
export const PI_ERR_FLOOR = 1e-4;
/**
 * Weight of the 3rd-order estimate when two estimates are combined (DOP853):
 * err = err5^2 / sqrt(err5^2 + 0.01 err3^2), HNW I, sec. II.10.
 */
export const COMBINED_ERR3_WEIGHT = 0.01;

// Powers are taken as exp(log(x) * e): Math.pow with a fractional exponent costs about twice as
// much in V8, and the controller runs once per step.

/** Standard controller: h_new / h = min(facmax, max(facmin, safety * err^(-1/k))). */
export function standardFactor(err: number, k: number, facMax: number): number {
  if (!(err > 0)) return facMax;
  const fac = SAFETY * Math.exp(Math.log(err) * (-1 / k));
  return fac > facMax ? facMax : fac < FAC_MIN ? FAC_MIN : fac;
}

/** Gustafsson's PI controller: safety * err^(-alpha) * errPrev^beta, clamped like the standard. */
export function piFactor(err: number, errPrev: number, k: number, facMax: number): number {
  if (!(err > 0)) return facMax;
  const fac = SAFETY * Math.exp((Math.log(errPrev) * PI_BETA - Math.log(err) * PI_ALPHA) / k);
  return fac > facMax ? facMax : fac < FAC_MIN ? FAC_MIN : fac;
}

/**
 * Initial step of Hairer, Norsett and Wanner, Solving ODEs I, sec. II.4 ("Starting step size"):
 * one extra f evaluation at t0 + h0 (the caller counts it). f0 = f(t0, y0) is given; `order` is
 * the order of the method (p in the book). y1 and f1 are scratch buffers of length n.
 */
export function initialStep(
  f: Rhs,
  t0: number,
  y0: Float64Array,
  f0: Float64Array,
  order: number,
  rtol: number,
  atol: Float64Array,
  span: number,
  y1: Float64Array,
  f1: Float64Array,
  n: number,
): number {
  const d0 = scaledRmsNorm(y0, y0, y0, rtol, atol, n);
  const d1 = scaledRmsNorm(f0, y0, y0, rtol, atol, n);
  let h0 = d0 < 1e-5 || d1 < 1e-5 ? 1e-6 : 0.01 * (d0 / d1);
  if (h0 > span) h0 = span;
  for (let i = 0; i < n; i++) y1[i] = y0[i]! + h0 * f0[i]!;
  f(t0 + h0, y1, f1);
  for (let i = 0; i < n; i++) f1[i] = (f1[i]! - f0[i]!) / h0;
  const d2 = scaledRmsNorm(f1, y0, y0, rtol, atol, n);
  const m = d1 > d2 ? d1 : d2;
  const h1 = m <= 1e-15 ? Math.max(1e-6, h0 * 1e-3) : Math.pow(0.01 / m, 1 / (order + 1));
  let h = Math.min(100 * h0, h1);
  if (!(h > 0) || !Number.isFinite(h)) h = h0;
  return h > span ? span : h;
}
