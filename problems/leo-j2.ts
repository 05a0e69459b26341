// A low Earth orbit under Earth's J2 zonal term for one day, in metres and seconds.
//   r'' = -GM r / |r|^3 - grad of the J2 potential term:
//   a_x = -GM x / r^3 (1 + 1.5 J2 (R_E/r)^2 (1 - 5 z^2/r^2)), a_y likewise with y,
//   a_z = -GM z / r^3 (1 + 1.5 J2 (R_E/r)^2 (3 - 5 z^2/r^2))
// (Vallado, Fundamentals of Astrodynamics and Applications, 4th ed., ch. 8, the J2 acceleration;
// chapter from memory). Potential energy per unit mass
//   V = -GM/r + GM J2 R_E^2 / (2 r^3) (3 z^2/r^2 - 1),
// so energy |v|^2/2 + V is conserved, and V is symmetric about the z axis, so the polar angular
// momentum h_z = x vy - y vx is conserved too.
// Scenario of our own: a = R_E + 500 km, e = 0.001, i = 51.6 deg, right ascension of the node 30 deg,
// argument of perigee 45 deg, true anomaly 0; span one day (about 15.5 orbits).
// Reference: certified by stepgauge (no closed form). Error: absolute (m, m/s), with the
// radial / in-track / cross-track split. Checked every hour.
import type { Invariant, JacobianFn, Problem, Rhs } from '../src/core/types.js';
import { EARTH_GM, EARTH_J2, EARTH_RADIUS } from './physics/earth.js';
import { catalogueProblem } from './from-source.js';

const DAY = 86400;
const DEG = Math.PI / 180;

/** Position and velocity from classical elements (true anomaly nu), perifocal frame rotated R3(-RAAN) R1(-i) R3(-argp). */
export function elementsToState(gm: number, a: number, e: number, i: number, raan: number, argp: number, nu: number): number[] {
  const p = a * (1 - e * e);
  const r = p / (1 + e * Math.cos(nu));
  const rp = [r * Math.cos(nu), r * Math.sin(nu)];
  const sq = Math.sqrt(gm / p);
  const vp = [-sq * Math.sin(nu), sq * (e + Math.cos(nu))];
  const [cO, sO, ci, si, cw, sw] = [Math.cos(raan), Math.sin(raan), Math.cos(i), Math.sin(i), Math.cos(argp), Math.sin(argp)];
  // Columns P and Q of the perifocal-to-inertial rotation.
  const P = [cO * cw - sO * sw * ci, sO * cw + cO * sw * ci, sw * si];
  const Q = [-cO * sw - sO * cw * ci, -sO * sw + cO * cw * ci, cw * si];
  return [0, 1, 2].map((k) => rp[0]! * P[k]! + rp[1]! * Q[k]!).concat([0, 1, 2].map((k) => vp[0]! * P[k]! + vp[1]! * Q[k]!));
}

export function j2Rhs(gm: number, j2: number, re: number): Rhs {
  return (_t, y, dy) => {
    const x = y[0]!;
    const yy = y[1]!;
    const z = y[2]!;
    const r2 = x * x + yy * yy + z * z;
    const r = Math.sqrt(r2);
    const k = gm / (r2 * r);
    const f = (1.5 * j2 * re * re) / r2;
    const zz = (5 * z * z) / r2;
    const side = -k * (1 + f * (1 - zz));
    dy[0] = y[3]!;
    dy[1] = y[4]!;
    dy[2] = y[5]!;
    dy[3] = side * x;
    dy[4] = side * yy;
    dy[5] = -k * z * (1 + f * (3 - zz));
  };
}

/**
 * Jacobian of j2Rhs. With a_i = -GM x_i A_i, A_i = r^-3 + 1.5 J2 R^2 (c_i r^-5 - 5 z^2 r^-7)
 * (c = 1, 1, 3): da_i/dx_j = -GM (delta_ij A_i + x_i dA_i/dx_j), where
 * dA_i/dx_j = -3 r^-5 x_j + 1.5 J2 R^2 (-5 c_i r^-7 x_j + 35 z^2 r^-9 x_j - 10 z r^-7 delta_jz).
 */
export function j2Jacobian(gm: number, j2: number, re: number): JacobianFn {
  const q = 1.5 * j2 * re * re;
  return (_t, y, jac) => {
    jac.fill(0);
    const z = y[2]!;
    const r2 = y[0]! * y[0]! + y[1]! * y[1]! + z * z;
    const r = Math.sqrt(r2);
    const r3 = 1 / (r2 * r);
    const r5 = r3 / r2;
    const r7 = r5 / r2;
    const r9 = r7 / r2;
    for (let i = 0; i < 3; i++) {
      jac[i * 6 + 3 + i] = 1;
      const c = i === 2 ? 3 : 1;
      const A = r3 + q * (c * r5 - 5 * z * z * r7);
      const common = -3 * r5 + q * (-5 * c * r7 + 35 * z * z * r9);
      for (let j = 0; j < 3; j++) {
        const dA = common * y[j]! - (j === 2 ? 10 * q * z * r7 : 0);
        jac[(3 + i) * 6 + j] = -gm * ((i === j ? A : 0) + y[i]! * dA);
      }
    }
  };
}

export function j2Energy(gm: number, j2: number, re: number): Invariant {
  return {
    name: 'energy',
    fn: (_t, y) => {
      const x = y[0]!;
      const yy = y[1]!;
      const z = y[2]!;
      const r2 = x * x + yy * yy + z * z;
      const r = Math.sqrt(r2);
      const v2 = y[3]! * y[3]! + y[4]! * y[4]! + y[5]! * y[5]!;
      return 0.5 * v2 - gm / r + ((gm * j2 * re * re) / (2 * r2 * r)) * ((3 * z * z) / r2 - 1);
    },
  };
}

export const polarAngularMomentum: Invariant = { name: 'angular-momentum-z', fn: (_t, y) => y[0]! * y[4]! - y[1]! * y[3]! };

const Y0 = elementsToState(EARTH_GM, EARTH_RADIUS + 500e3, 0.001, 51.6 * DEG, 30 * DEG, 45 * DEG, 0);

export const leoJ2: Problem = catalogueProblem(import.meta.url, {
  id: 'leo-j2',
  title: 'Low Earth orbit with the J2 zonal term, one day',
  source: 'J2 acceleration and potential, Vallado, Fundamentals of Astrodynamics and Applications, 4th ed., ch. 8; WGS 84 GM and radius, EGM96 J2; reference certified by stepgauge',
  dimension: 6,
  stateNames: ['x', 'y', 'z', 'vx', 'vy', 'vz'],
  t0: 0,
  tEnd: DAY,
  y0: Y0,
  f: j2Rhs(EARTH_GM, EARTH_J2, EARTH_RADIUS),
  jacobian: j2Jacobian(EARTH_GM, EARTH_J2, EARTH_RADIUS),
  stiff: false,
  invariants: [j2Energy(EARTH_GM, EARTH_J2, EARTH_RADIUS), polarAngularMomentum],
  errorScale: { kind: 'absolute' },
  reference: { kind: 'certified', points: [] },
  checkTimes: Array.from({ length: 23 }, (_, k) => (k + 1) * 3600),
  // 720 steps a day (2 min) doubling to 92160 (under the default step limit): rk4 from hundreds of
  // kilometres off to its asymptotic range (common practice, no source).
  defaultSteps: [720, 1440, 2880, 5760, 11520, 23040, 46080, 92160],
  separable: { positions: [0, 1, 2], velocities: [3, 4, 5], secondOrder: true },
  orbit: { position: [0, 1, 2], velocity: [3, 4, 5], unit: 'm' },
});
