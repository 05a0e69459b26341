// Two-body problem in 3-D, x'' = -mu x / |x|^3, mu = 1, on a circular orbit of radius 1 whose
// plane is inclined 30 degrees to the x-y plane; start (1, 0, 0) with velocity (0, cos 30, sin 30).
// Source: exact circular motion x(t) = cos(t) e1 + sin(t) e2 with e1 = (1, 0, 0),
// e2 = (0, cos 30, sin 30) (angular rate sqrt(mu / r^3) = 1; e.g. Danby, Fundamentals of
// Celestial Mechanics, ch. 6). Span 10 periods, [0, 20 pi].
// Error scale: absolute (positions and velocities stay O(1)).
// Invariants: energy |v|^2/2 - 1/|x| = -1/2 and angular momentum |x cross v| = 1.
// Checked four times per orbit, so phase drift shows up as it grows.
import type { Problem } from '../src/core/types.js';
import { twoBodyReference } from './physics/kepler.js';
import { twoBodyAngularMomentum, twoBodyEnergy, twoBodyJacobian, twoBodyRhs } from './physics/two-body.js';
import { catalogueProblem } from './from-source.js';

const MU = 1;
const C30 = Math.cos(Math.PI / 6);
const S30 = Math.sin(Math.PI / 6);
const T_END = 20 * Math.PI;
const CHECK_TIMES = Array.from({ length: 40 }, (_, k) => ((k + 1) * Math.PI) / 2);

export const keplerCircular: Problem = catalogueProblem(import.meta.url, {
  id: 'kepler-circular',
  title: 'Kepler problem, inclined circular orbit (3-D)',
  source: 'Exact circular two-body motion, e.g. Danby, Fundamentals of Celestial Mechanics, 2nd ed., ch. 6',
  dimension: 6,
  stateNames: ['x', 'y', 'z', 'vx', 'vy', 'vz'],
  t0: 0,
  tEnd: T_END,
  y0: [1, 0, 0, 0, C30, S30],
  f: twoBodyRhs(3, MU),
  jacobian: twoBodyJacobian(3, MU),
  stiff: false,
  invariants: [twoBodyEnergy(3, MU), twoBodyAngularMomentum(3)],
  errorScale: { kind: 'absolute' },
  reference: {
    kind: 'exact',
    source: 'analytic circular motion at unit angular rate',
    exact(t, out) {
      const c = Math.cos(t);
      const s = Math.sin(t);
      out[0] = c;
      out[1] = s * C30;
      out[2] = s * S30;
      out[3] = -s;
      out[4] = c * C30;
      out[5] = c * S30;
    },
  },
  exactFromState: (y0) => twoBodyReference(y0, 3, MU, 0),
  checkTimes: CHECK_TIMES,
  // Equal steps from 200 doubling: reaches rk4's asymptotic range (common practice, no source).
  defaultSteps: [200, 400, 800, 1600, 3200, 6400, 12800, 25600],
  separable: { positions: [0, 1, 2], velocities: [3, 4, 5], secondOrder: true },
});
