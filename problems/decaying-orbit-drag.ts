// A low orbit decaying under atmospheric drag through a tabulated exponential atmosphere, metres
// and seconds:  r'' = -GM r/|r|^3 - (1/2) rho(|r| - R_E) B |v| v,
// B = Cd A / m the ballistic factor, the atmosphere at rest in the inertial frame (its rotation is
// left out on purpose, to keep the model one table and one force). rho is the table of
// problems/physics/exponential-atmosphere.ts (Vallado, 4th ed., table 8-4) interpolated
// log-linearly (src/problems/tables/interpolant.ts), so the force has a kink in its slope at
// every tabulated altitude the orbit crosses (here 200 km). The Jacobian is exact for the
// interpolant: d(drag)/dr = -(1/2) B |v| v rho'(h) r^T/|r|, d(drag)/dv = -(1/2) rho B (|v| I + v v^T/|v|).
// Scenario of our own: B = 2.2 * 1 m^2 / 100 kg, circular at R_E + 210 km, inclined 51.6 degrees;
// six hours (the orbit sinks about 7 km; the semi-major axis falls at rho B sqrt(GM a), e.g.
// Vallado ch. 9, chapter from memory).
// Reference: certified by stepgauge. Error: absolute (m, m/s), with the radial / in-track /
// cross-track split. No invariant: drag takes energy out.
import type { Problem } from '../src/core/types.js';
import { makeTable } from '../src/problems/tables/interpolant.js';
import { EARTH_GM, EARTH_RADIUS, inclinedPlane } from './physics/earth.js';
import { ATMOSPHERE_ALTITUDE_KM, ATMOSPHERE_DENSITY } from './physics/exponential-atmosphere.js';
import { catalogueProblem } from './from-source.js';

const B = (2.2 * 1) / 100;
const R0 = EARTH_RADIUS + 210e3;
const SPAN = 6 * 3600;
const atmosphere = makeTable(ATMOSPHERE_ALTITUDE_KM.map((h) => h * 1000), ATMOSPHERE_DENSITY, 'log-linear');
const { e1: E1, e2: E2 } = inclinedPlane((51.6 * Math.PI) / 180);
const V0 = Math.sqrt(EARTH_GM / R0);
const Y0 = [...E1.map((c) => R0 * c), ...E2.map((c) => V0 * c)];

export const decayingOrbitDrag: Problem = catalogueProblem(import.meta.url, {
  id: 'decaying-orbit-drag',
  title: 'Low orbit decaying under drag through a tabulated exponential atmosphere, six hours',
  source: 'Two-body gravity and quadratic drag with the exponential atmosphere of Vallado, Fundamentals of Astrodynamics and Applications, 4th ed., table 8-4, interpolated log-linearly; WGS 84 constants; reference certified by stepgauge',
  dimension: 6,
  stateNames: ['x', 'y', 'z', 'vx', 'vy', 'vz'],
  t0: 0,
  tEnd: SPAN,
  y0: Y0,
  f(_t, y, dy) {
    const x = y[0]!, yy = y[1]!, z = y[2]!;
    const vx = y[3]!, vy = y[4]!, vz = y[5]!;
    const r2 = x * x + yy * yy + z * z;
    const r = Math.sqrt(r2);
    const g = -EARTH_GM / (r2 * r);
    const v = Math.sqrt(vx * vx + vy * vy + vz * vz);
    const k = -0.5 * atmosphere.value(r - EARTH_RADIUS) * B * v;
    dy[0] = vx;
    dy[1] = vy;
    dy[2] = vz;
    dy[3] = g * x + k * vx;
    dy[4] = g * yy + k * vy;
    dy[5] = g * z + k * vz;
  },
  jacobian(_t, y, jac) {
    jac.fill(0);
    const r2 = y[0]! * y[0]! + y[1]! * y[1]! + y[2]! * y[2]!;
    const r = Math.sqrt(r2);
    const r3 = 1 / (r2 * r);
    const r5 = r3 / r2;
    const v = Math.hypot(y[3]!, y[4]!, y[5]!);
    const h = r - EARTH_RADIUS;
    const rho = atmosphere.value(h);
    const drho = atmosphere.slope(h);
    for (let i = 0; i < 3; i++) {
      jac[i * 6 + 3 + i] = 1;
      const vi = y[3 + i]!;
      for (let j = 0; j < 3; j++) {
        const grav = -EARTH_GM * ((i === j ? r3 : 0) - 3 * y[i]! * y[j]! * r5);
        jac[(3 + i) * 6 + j] = grav - 0.5 * B * v * vi * drho * (y[j]! / r);
        jac[(3 + i) * 6 + 3 + j] = -0.5 * rho * B * ((i === j ? v : 0) + (vi * y[3 + j]!) / v);
      }
    }
  },
  stiff: false,
  invariants: [],
  errorScale: { kind: 'absolute' },
  reference: { kind: 'certified', points: [] },
  checkTimes: [3600, 7200, 10800, 14400, 18000],
  // 180 steps (2 min) doubling to 23040 (under a second): rk4 from kilometres off to its asymptotic range.
  defaultSteps: [180, 360, 720, 1440, 2880, 5760, 11520, 23040],
  separableReason: 'drag depends on the velocity',
  orbit: { position: [0, 1, 2], velocity: [3, 4, 5], unit: 'm' },
});
