// Two satellites joined by an elastic tether, in a point-mass Earth field, metres and seconds.
//   m1 r1'' = -GM m1 r1/|r1|^3 - T u,   m2 r2'' = -GM m2 r2/|r2|^3 + T u,
//   u = (r1 - r2)/l, l = |r1 - r2|, T = k (l - L0) when l > L0 and 0 otherwise (the tether goes
//   slack in compression; it pulls, never pushes).
// The multi-scale case: the pair's orbit takes about 92 minutes and the tether's axial oscillation
// about 2.1 s (2 pi sqrt(m_r / k), m_r = m1 m2/(m1 + m2)). Undamped, so energy
//   sum(m |v|^2/2 - GM m/|r|) + k (l - L0)^2/2 (l > L0)
// and the total angular momentum sum(m r x v) are conserved (gravity is central, the tether force
// acts along the line between the bodies; e.g. Goldstein, Classical Mechanics, ch. 1).
// Scenario of our own: m1 = 100 kg, m2 = 50 kg, L0 = 500 m, k = 300 N/m; the centre of mass on a
// circular orbit of radius R_E + 400 km in a plane inclined 51.6 degrees; the pair spins in the
// orbit plane once a minute (the spin, not gravity gradient, keeps the tether taut: about 0.6 m
// of stretch at equilibrium, k (l - L0) = m_r W^2 l), starting along the local vertical stretched
// 1.4 m, so the stretch swings between about +1.4 m and -0.2 m: the tether goes slack briefly at
// the bottom of each oscillation and the force has a kink at every l = L0.
// Span: two minutes (two turns, about 57 tether oscillations; longer spans made this problem most of
// the catalogue sweep's time).
// State: the centre of mass c and the separation s = r1 - r2 with their velocities, so the
// tether's metre-sized motion is not lost beside the 6.8e6 m of the orbit in the step control
// (with each body's inertial position as state, every explicit pair at rtol 1e-10 stepped over
// the oscillation: 1,025 evaluations for dormand-prince-853 over a ten-minute span). The centre of
// mass moves under the mass-weighted gravity of the two bodies, c'' = (m1 g(r1) + m2 g(r2))/M, and
// s'' = g(r1) - g(r2) - T (1/m1 + 1/m2) s/l, with r1 = c + (m2/M) s, r2 = c - (m1/M) s.
// Reference: certified by stepgauge. Error: absolute (m, m/s).
import type { Problem } from '../src/core/types.js';
import { EARTH_GM, EARTH_RADIUS, inclinedPlane } from './physics/earth.js';
import { catalogueProblem } from './from-source.js';

const M1 = 100;
const M2 = 50;
const L0 = 500;
const K = 300;
const STRETCH = 1.4;
/** Spin of the pair about its centre of mass, relative to the orbit's rotation: one turn a minute. */
const SPIN = (2 * Math.PI) / 60;
const RC = EARTH_RADIUS + 400e3;
const N = Math.sqrt(EARTH_GM / (RC * RC * RC));
const SPAN = 120;
const { e1: E1, e2: E2 } = inclinedPlane((51.6 * Math.PI) / 180);

function initialState(): number[] {
  const l = L0 + STRETCH;
  const rc = E1.map((c) => RC * c);
  const rho = E1.map((c) => l * c);
  const vc = E2.map((c) => N * RC * c);
  const vrho = E2.map((c) => (N + SPIN) * l * c);
  return [...rc, ...rho, ...vc, ...vrho];
}

/** Tension of the tether at length l (zero when slack). */
function tension(l: number): number {
  return l > L0 ? K * (l - L0) : 0;
}

/** Each body's position from the centre of mass c and the separation rho = r1 - r2 (writes into r1, r2). */
function bodies(y: Float64Array, r1: Float64Array, r2: Float64Array): void {
  for (let k = 0; k < 3; k++) {
    r1[k] = y[k]! + W2 * y[3 + k]!;
    r2[k] = y[k]! - W1 * y[3 + k]!;
  }
}

const W1 = M1 / (M1 + M2);
const W2 = M2 / (M1 + M2);
/** Each body's velocity, likewise from the state's velocity half. */
function velocities(y: Float64Array, v1: Float64Array, v2: Float64Array): void {
  for (let k = 0; k < 3; k++) {
    v1[k] = y[6 + k]! + W2 * y[9 + k]!;
    v2[k] = y[6 + k]! - W1 * y[9 + k]!;
  }
}

/** Gravity gradient d(-GM r/|r|^3)/dr = -GM (I/r^3 - 3 r r^T/r^5), row-major 3 x 3 into out. */
function gravityGradient(r: Float64Array, out: Float64Array): void {
  const s = r[0]! * r[0]! + r[1]! * r[1]! + r[2]! * r[2]!;
  const r3 = 1 / (s * Math.sqrt(s));
  const r5 = r3 / s;
  for (let i = 0; i < 3; i++) for (let j = 0; j < 3; j++) out[i * 3 + j] = -EARTH_GM * ((i === j ? r3 : 0) - 3 * r[i]! * r[j]! * r5);
}

const G1 = new Float64Array(9);
const G2 = new Float64Array(9);
const B1 = new Float64Array(3);
const B2 = new Float64Array(3);
const V1 = new Float64Array(3);
const V2 = new Float64Array(3);

const Y0 = initialState();

export const tetheredPair: Problem = catalogueProblem(import.meta.url, {
  id: 'tethered-pair',
  title: 'Two satellites joined by an elastic tether that goes slack (orbit of 92 min, tether period 2 s)',
  source: 'Newtonian two-body gravity and a one-sided linear spring (e.g. Goldstein, Classical Mechanics, ch. 1); scenario of our own; reference certified by stepgauge',
  dimension: 12,
  stateNames: ['cx', 'cy', 'cz', 'sx', 'sy', 'sz', 'vcx', 'vcy', 'vcz', 'vsx', 'vsy', 'vsz'],
  t0: 0,
  tEnd: SPAN,
  y0: Y0,
  f(_t, y, dy) {
    bodies(y, B1, B2);
    const x1 = B1[0]!, y1 = B1[1]!, z1 = B1[2]!;
    const x2 = B2[0]!, y2 = B2[1]!, z2 = B2[2]!;
    const s1 = x1 * x1 + y1 * y1 + z1 * z1;
    const s2 = x2 * x2 + y2 * y2 + z2 * z2;
    const g1 = -EARTH_GM / (s1 * Math.sqrt(s1));
    const g2 = -EARTH_GM / (s2 * Math.sqrt(s2));
    const px = y[3]!, py = y[4]!, pz = y[5]!;
    const l = Math.sqrt(px * px + py * py + pz * pz);
    const tl = (tension(l) / l) * (1 / M1 + 1 / M2);
    for (let k = 0; k < 6; k++) dy[k] = y[6 + k]!;
    dy[6] = W1 * g1 * x1 + W2 * g2 * x2;
    dy[7] = W1 * g1 * y1 + W2 * g2 * y2;
    dy[8] = W1 * g1 * z1 + W2 * g2 * z2;
    dy[9] = g1 * x1 - g2 * x2 - tl * px;
    dy[10] = g1 * y1 - g2 * y2 - tl * py;
    dy[11] = g1 * z1 - g2 * z2 - tl * pz;
  },
  // With r1 = c + W2 s, r2 = c - W1 s and G the gravity gradient: d c''/dc = W1 G1 + W2 G2,
  // d c''/ds = W1 W2 (G1 - G2), d s''/dc = G1 - G2, d s''/ds = W2 G1 + W1 G2 - d(tension term)/ds,
  // where, taut, d(k (1 - L0/l) s_i)/ds_j = k (1 - L0/l) delta_ij + k L0 s_i s_j / l^3 (times 1/m1 + 1/m2).
  jacobian(_t, y, jac) {
    jac.fill(0);
    bodies(y, B1, B2);
    gravityGradient(B1, G1);
    gravityGradient(B2, G2);
    const l = Math.hypot(y[3]!, y[4]!, y[5]!);
    const kappa = 1 / M1 + 1 / M2;
    const taut = l > L0;
    for (let i = 0; i < 6; i++) jac[i * 12 + 6 + i] = 1;
    for (let i = 0; i < 3; i++) {
      for (let j = 0; j < 3; j++) {
        const g1 = G1[i * 3 + j]!;
        const g2 = G2[i * 3 + j]!;
        jac[(6 + i) * 12 + j] = W1 * g1 + W2 * g2;
        jac[(6 + i) * 12 + 3 + j] = W1 * W2 * (g1 - g2);
        jac[(9 + i) * 12 + j] = g1 - g2;
        const spring = taut ? kappa * K * ((i === j ? 1 - L0 / l : 0) + (L0 * y[3 + i]! * y[3 + j]!) / (l * l * l)) : 0;
        jac[(9 + i) * 12 + 3 + j] = W2 * g1 + W1 * g2 - spring;
      }
    }
  },
  stiff: false,
  invariants: [
    {
      name: 'energy',
      fn: (_t, y) => {
        bodies(y, B1, B2);
        velocities(y, V1, V2);
        const v1 = V1[0]! ** 2 + V1[1]! ** 2 + V1[2]! ** 2;
        const v2 = V2[0]! ** 2 + V2[1]! ** 2 + V2[2]! ** 2;
        const r1 = Math.hypot(B1[0]!, B1[1]!, B1[2]!);
        const r2 = Math.hypot(B2[0]!, B2[1]!, B2[2]!);
        const l = Math.hypot(y[3]!, y[4]!, y[5]!);
        const spring = l > L0 ? 0.5 * K * (l - L0) ** 2 : 0;
        return 0.5 * M1 * v1 + 0.5 * M2 * v2 - (EARTH_GM * M1) / r1 - (EARTH_GM * M2) / r2 + spring;
      },
    },
    {
      name: 'angular-momentum',
      fn: (_t, y) => {
        bodies(y, B1, B2);
        velocities(y, V1, V2);
        let hx = 0, hy = 0, hz = 0;
        for (const [m, r, v] of [[M1, B1, V1], [M2, B2, V2]] as const) {
          hx += m * (r[1]! * v[2]! - r[2]! * v[1]!);
          hy += m * (r[2]! * v[0]! - r[0]! * v[2]!);
          hz += m * (r[0]! * v[1]! - r[1]! * v[0]!);
        }
        return Math.sqrt(hx * hx + hy * hy + hz * hz);
      },
    },
  ],
  errorScale: { kind: 'absolute' },
  reference: { kind: 'certified', points: [] },
  checkTimes: [20, 40, 60, 80, 100],
  // From 2 s steps (one per tether oscillation, far too coarse) doubling to 1/64 s.
  defaultSteps: [60, 120, 240, 480, 960, 1920, 3840, 7680],
  separable: { positions: [0, 1, 2, 3, 4, 5], velocities: [6, 7, 8, 9, 10, 11], secondOrder: true },
});
