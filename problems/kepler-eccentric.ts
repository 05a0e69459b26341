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

const MU = 1;
const E = 0.6;
const A = 1;
const T_END = 20 * Math.PI;
const CHECK_TIMES = Array.from({ length: 40 }, (_, k) => ((k + 1) * Math.PI) / 2);

export const keplerEccentric: Problem = {
  id: 'kepler-eccentric',
  title: 'Kepler problem, eccentric orbit e = 0.6 (planar)',
  source: "Kepler's equation solved by Newton to machine precision; Danby, Fundamentals of Celestial Mechanics, 2nd ed., sec. 6.3, 6.6",
  description:
    "x'' = -mu x/|x|^3 in the plane, state (x, y, vx, vy), mu = 1, e = 0.6, a = 1, start at periapsis " +
    'x = 1 - e, y = 0, vx = 0, vy = sqrt((1 + e)/(1 - e)); t in [0, 20 pi] (10 periods). ' +
    "Exact solution from Kepler's equation E - e sin E = t: x = cos E - e, y = sqrt(1 - e^2) sin E. " +
    'Error: absolute. Invariants: energy (-1/2) and angular-momentum (0.8). Separable (positions | velocities).',
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
  separable: { positions: [0, 1], velocities: [2, 3] },
  definition: [
    'id: kepler-eccentric',
    "equations: x'' = -mu x / |x|^3 (planar), state (x, y, vx, vy)",
    'parameters: mu = 1, e = 0.6, a = 1',
    'span: [0, 20*pi]',
    'initial: (1 - e, 0, 0, sqrt((1 + e)/(1 - e)))',
    "reference: exact, Kepler's equation E - e sin E = t; x = cos E - e, y = sqrt(1 - e^2) sin E",
    'error: absolute',
    'invariants: energy = |v|^2/2 - mu/|x|; angular-momentum = |x vy - y vx|',
    'checkTimes: k*pi/2, k = 1..40',
  ].join('\n'),
};
