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
