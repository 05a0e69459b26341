// Kepler's equation E - e sin E = M and the planar elliptic two-body state it gives.
// The eccentric Kepler problem's exact solution is evaluated at every check time and by
// observers, so the solver must be cheap and must converge to machine precision for every M.

const TWO_PI = 2 * Math.PI;
/** Newton converges quadratically from Danby's guess; this only guards against a bad input. */
const MAX_NEWTON_ITERATIONS = 50;
/** Danby's starting offset (Danby, Fundamentals of Celestial Mechanics, 2nd ed., sec. 6.6). */
const DANBY_OFFSET = 0.85;

/**
 * Eccentric anomaly E with E - e sin E = M, for 0 <= e < 1 and any real M.
 *
 * M is reduced to [-pi, pi] first (Kepler's equation is 2pi-periodic in the sense
 * E(M + 2pi) = E(M) + 2pi), Newton starts from Danby's guess E0 = M + 0.85 e sign(sin M),
 * which converges for every M and e < 1 (Danby, Fundamentals of Celestial Mechanics, 2nd ed.,
 * sec. 6.6), and iterates until the correction no longer shrinks or is below an ulp.
 */
export function solveKepler(meanAnomaly: number, e: number): number {
  if (!(e >= 0 && e < 1)) throw new RangeError(`eccentricity must be in [0, 1), got ${e}`);
  if (!Number.isFinite(meanAnomaly)) throw new RangeError(`mean anomaly must be finite, got ${meanAnomaly}`);
  const turns = Math.round(meanAnomaly / TWO_PI);
  const m = meanAnomaly - turns * TWO_PI;
  if (e === 0) return meanAnomaly;
  const s = Math.sin(m);
  let E = m + (s > 0 ? DANBY_OFFSET * e : s < 0 ? -DANBY_OFFSET * e : 0);
  let previous = Infinity;
  for (let k = 0; k < MAX_NEWTON_ITERATIONS; k++) {
    const delta = (E - e * Math.sin(E) - m) / (1 - e * Math.cos(E));
    const size = Math.abs(delta);
    // Past this point the correction is rounding noise; taking it could only make E worse.
    if (size >= previous) break;
    E -= delta;
    if (size <= Number.EPSILON * Math.max(1, Math.abs(E))) break;
    previous = size;
  }
  return E + turns * TWO_PI;
}

/**
 * Planar elliptic two-body state (x, y, vx, vy) at time t for an orbit with semi-major axis a,
 * eccentricity e and gravitational parameter mu, periapsis on the +x axis at t = 0 and motion
 * counter-clockwise. Standard formulas in the eccentric anomaly, e.g. Danby, sec. 6.3:
 * x = a (cos E - e), y = a sqrt(1 - e^2) sin E, r = a (1 - e cos E),
 * vx = -sqrt(mu a) sin E / r, vy = sqrt(mu a (1 - e^2)) cos E / r, with M = n t, n = sqrt(mu / a^3).
 */
export function ellipticState(t: number, a: number, e: number, mu: number, out: Float64Array): void {
  const n = Math.sqrt(mu / (a * a * a));
  const E = solveKepler(n * t, e);
  const c = Math.cos(E);
  const s = Math.sin(E);
  const b = Math.sqrt(1 - e * e);
  const r = a * (1 - e * c);
  const va = Math.sqrt(mu * a) / r;
  out[0] = a * (c - e);
  out[1] = a * b * s;
  out[2] = -va * s;
  out[3] = va * b * c;
}

/**
 * The elliptic two-body state at any time from an arbitrary initial state (positions then
 * velocities, d dimensions) at t0, by Lagrange's f and g functions in the difference of eccentric
 * anomaly x = E - E0 (Danby, Fundamentals of Celestial Mechanics, 2nd ed., sec. 6.8):
 *   n dt = x + sigma0/sqrt(a) (1 - cos x) - (1 - r0/a) sin x,   sigma0 = r0.v0 / sqrt(mu),
 *   r = a + (r0 - a) cos x + sigma0 sqrt(a) sin x,
 *   f = 1 - a/r0 (1 - cos x),  g = dt - (x - sin x)/n,
 *   f' = -sqrt(mu a) sin x / (r r0),  g' = 1 - a/r (1 - cos x).
 * No singularity at e = 0. Undefined (returns undefined) for orbits that are not bound.
 */
export function twoBodyFromState(y0: readonly number[], d: number, mu: number, t0: number): ((t: number, out: Float64Array) => void) | undefined {
  let r2 = 0;
  let v2 = 0;
  let rv = 0;
  for (let i = 0; i < d; i++) {
    r2 += y0[i]! * y0[i]!;
    v2 += y0[d + i]! * y0[d + i]!;
    rv += y0[i]! * y0[d + i]!;
  }
  const r0 = Math.sqrt(r2);
  const alpha = 2 / r0 - v2 / mu; // 1/a
  if (!(alpha > 0) || !Number.isFinite(alpha)) return undefined;
  const a = 1 / alpha;
  const n = Math.sqrt(mu * alpha * alpha * alpha);
  const sqrtA = Math.sqrt(a);
  const sigma0 = rv / Math.sqrt(mu);
  const c1 = sigma0 / sqrtA; // e sin E0
  const c2 = 1 - r0 / a; // e cos E0
  const pos = Float64Array.from(y0.slice(0, d));
  const vel = Float64Array.from(y0.slice(d, 2 * d));
  return (t, out) => {
    const m = n * (t - t0);
    const turns = Math.round(m / TWO_PI);
    const mr = m - turns * TWO_PI;
    const x = solveDifferenceKepler(mr, c1, c2);
    const s = Math.sin(x);
    const c = Math.cos(x);
    const r = a + (r0 - a) * c + sigma0 * sqrtA * s;
    const f = 1 - (a / r0) * (1 - c);
    // g from the reduced mean anomaly: the whole turns cancel between dt and (x - sin x)/n.
    const g = (mr - (x - s)) / n;
    const fd = (-Math.sqrt(mu * a) * s) / (r * r0);
    const gd = 1 - (a / r) * (1 - c);
    for (let i = 0; i < d; i++) {
      out[i] = f * pos[i]! + g * vel[i]!;
      out[d + i] = fd * pos[i]! + gd * vel[i]!;
    }
  };
}

/**
 * x with x + c1 (1 - cos x) - c2 sin x = m, where c1 = e sin E0, c2 = e cos E0 (e < 1). Since
 * x - m = e (sin(E0 + x) - sin E0), the root lies in [m - 2e, m + 2e]: Newton, kept inside that
 * bracket by bisection (the derivative r/a is at least 1 - e > 0).
 */
function solveDifferenceKepler(m: number, c1: number, c2: number): number {
  const e = Math.hypot(c1, c2);
  let lo = m - 2 * e - 1e-12;
  let hi = m + 2 * e + 1e-12;
  let x = m;
  for (let k = 0; k < 4 * MAX_NEWTON_ITERATIONS; k++) {
    const s = Math.sin(x);
    const c = Math.cos(x);
    const F = x + c1 * (1 - c) - c2 * s - m;
    if (F === 0) return x;
    if (F > 0) hi = x;
    else lo = x;
    let next = x - F / (1 + c1 * s - c2 * c);
    if (!(next > lo && next < hi)) next = 0.5 * (lo + hi);
    if (Math.abs(next - x) <= Number.EPSILON * Math.max(1, Math.abs(x))) return next;
    x = next;
  }
  return x;
}

/** twoBodyFromState as a reference for a dispersed initial state, with its source. */
export function twoBodyReference(y0: readonly number[], d: number, mu: number, t0: number): { exact: (t: number, out: Float64Array) => void; source: string } | undefined {
  const exact = twoBodyFromState(y0, d, mu, t0);
  return exact && { exact, source: "two-body motion from the sample's own initial state, Lagrange's f and g in the eccentric anomaly (Danby, Fundamentals of Celestial Mechanics, 2nd ed., sec. 6.8)" };
}
