// Planar two-body problem x'' = -mu x / |x|^3, mu = 1, eccentricity e = 0.6, semi-major axis 1,
// started at periapsis: (x, y) = (1 - e, 0), (vx, vy) = (0, sqrt((1 + e)/(1 - e))). Span 10
// periods, [0, 20 pi]. Exact solution at any t from Kepler's equation E - e sin E = t, solved by
// Newton to machine precision (problems/physics/kepler.ts; Danby, Fundamentals of Celestial
// Mechanics, 2nd ed., sec. 6.3 and 6.6).
// Error scale: absolute. Invariants: energy -1/2 and angular momentum sqrt(1 - e^2) = 0.8.
// Checked four times per orbit; near periapsis the speed is 2, the hardest part for step control.
import type { Problem } from '../src/core/types.js';
import { ellipticState, twoBodyReference } from './physics/kepler.js';
import { twoBodyAngularMomentum, twoBodyEnergy, twoBodyJacobian, twoBodyRhs } from './physics/two-body.js';
import { catalogueProblem } from './from-source.js';

const MU = 1;
const E = 0.6;
const A = 1;
const T_END = 20 * Math.PI;
const CHECK_TIMES = Array.from({ length: 40 }, (_, k) => ((k + 1) * Math.PI) / 2);

export const keplerEccentric: Problem = catalogueProblem(import.meta.url, {
  id: 'kepler-eccentric',
  title: 'Kepler problem, eccentric orbit e = 0.6 (planar)',
  source: "Kepler's equation solved by Newton to machine precision; Danby, Fundamentals of Celestial Mechanics, 2nd ed., sec. 6.3, 6.6",
  dimension: 4,
  stateNames: ['x', 'y', 'vx', 'vy'],
  t0: 0,
  tEnd: T_END,
  y0: [1 - E, 0, 0, Math.sqrt((1 + E) / (1 - E))],
  f: twoBodyRhs(2, MU),
  jacobian: twoBodyJacobian(2, MU),
  stiff: false,
  invariants: [twoBodyEnergy(2, MU), twoBodyAngularMomentum(2)],
  errorScale: { kind: 'absolute' },
  reference: {
    kind: 'exact',
    source: "Kepler's equation, Newton from Danby's starting guess, converged to machine precision",
    exact(t, out) {
      ellipticState(t, A, E, MU, out);
    },
  },
  exactFromState: (y0) => twoBodyReference(y0, 2, MU, 0),
  checkTimes: CHECK_TIMES,
  // Equal steps from 500 doubling: reaches rk4's asymptotic range (common practice, no source).
  defaultSteps: [500, 1000, 2000, 4000, 8000, 16000, 32000, 64000],
  separable: { positions: [0, 1], velocities: [2, 3], secondOrder: true },
});
