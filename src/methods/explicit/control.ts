// Step-size control for the embedded pairs: the constants and the two controllers. Every constant
// lives here, once; the starting step, shared with the implicit engines, is methods/starting-step.ts.

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
/**
 * Deadband controller: an accepted step whose err is at least this keeps its size (the standard
 * factor there is only 0.9..1.03). The band 0.5 <= err <= 1 is the one Boost.Odeint's default
 * step adjuster holds (controlled_runge_kutta.hpp, Boost 1.74 as Debian libboost-dev installs it;
 * K. Ahnert, M. Mulansky, AIP Conf. Proc. 1389 (2011) 1586-1589), so the pairs can be timed
 * under the same rule as that peer; it skips the power on most steps.
 */
export const DEADBAND_LOW = 0.5;
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

/** Deadband controller: the standard factor, except 1 while DEADBAND_LOW <= err (err <= 1 on accepts). */
export function deadbandFactor(err: number, k: number, facMax: number): number {
  return err >= DEADBAND_LOW ? 1 : standardFactor(err, k, facMax);
}
