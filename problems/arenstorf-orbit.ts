// A periodic orbit of the planar circular restricted three-body problem (Earth-Moon), in the
// rotating frame, normalised units:
//   x'' = x + 2 y' - mu' (x + mu)/D1 - mu (x - mu')/D2,   y'' = y - 2 x' - mu' y/D1 - mu y/D2,
//   D1 = ((x + mu)^2 + y^2)^(3/2), D2 = ((x - mu')^2 + y^2)^(3/2), mu = 0.012277471, mu' = 1 - mu.
// Source: Hairer, Norsett and Wanner, Solving ODEs I, 2nd ed., sec. II.0, pp. 129-130 (Arenstorf's
// orbit, Arenstorf 1963): x(0) = 0.994, y(0) = 0, x'(0) = 0,
// y'(0) = -2.00158510637908252240537862224, period T = 17.0652165601579625588917206249.
// Reference: published, periodicity: y(T) = y(0). The initial values are printed to 30 digits, but
// they are held here in doubles and the orbit passes close to the Earth twice per period, which
// amplifies small differences: dormand-prince-853 at rtol 1e-14 ends 1.2e-10 from y(0), odex
// (GBS extrapolation) at rtol 1e-12..1e-15 between 2.5e-9 and 1.0e-8 (test/catalogue-orbits.test.ts),
// so the reference is trusted to 8 digits (`digits`), not more.
// Invariant: the Jacobi constant C = x^2 + y^2 + 2 mu'/r1 + 2 mu/r2 - (x'^2 + y'^2)
// (e.g. Szebehely, Theory of Orbits, 1967, ch. 4; chapter from memory).
// Error: absolute (positions and velocities are O(1)).
import type { Problem } from '../src/core/types.js';
import { catalogueProblem } from './from-source.js';

const MU = 0.012277471;
const MU1 = 1 - MU;
const PERIOD = 17.0652165601579625588917206249;
const Y0 = [0.994, 0, 0, -2.00158510637908252240537862224];

export const arenstorfOrbit: Problem = catalogueProblem(import.meta.url, {
  id: 'arenstorf-orbit',
  title: 'Arenstorf periodic orbit, circular restricted three-body problem (Earth-Moon)',
  source: 'Hairer, Norsett and Wanner, Solving Ordinary Differential Equations I, 2nd ed., sec. II.0, pp. 129-130 (Arenstorf 1963)',
  dimension: 4,
  stateNames: ['x', 'y', 'vx', 'vy'],
  t0: 0,
  tEnd: PERIOD,
  y0: Y0,
  f(_t, y, dy) {
    const x = y[0]!;
    const yy = y[1]!;
    const vx = y[2]!;
    const vy = y[3]!;
    const a = (x + MU) * (x + MU) + yy * yy;
    const b = (x - MU1) * (x - MU1) + yy * yy;
    const d1 = a * Math.sqrt(a);
    const d2 = b * Math.sqrt(b);
    dy[0] = vx;
    dy[1] = vy;
    dy[2] = x + 2 * vy - (MU1 * (x + MU)) / d1 - (MU * (x - MU1)) / d2;
    dy[3] = yy - 2 * vx - (MU1 * yy) / d1 - (MU * yy) / d2;
  },
  jacobian(_t, y, jac) {
    const x = y[0]!;
    const yy = y[1]!;
    const p1 = x + MU;
    const p2 = x - MU1;
    const a = p1 * p1 + yy * yy;
    const b = p2 * p2 + yy * yy;
    const a3 = 1 / (a * Math.sqrt(a));
    const b3 = 1 / (b * Math.sqrt(b));
    const a5 = a3 / a;
    const b5 = b3 / b;
    jac.fill(0);
    jac[2] = 1;
    jac[7] = 1;
    jac[8] = 1 - MU1 * (a3 - 3 * p1 * p1 * a5) - MU * (b3 - 3 * p2 * p2 * b5);
    jac[9] = 3 * yy * (MU1 * p1 * a5 + MU * p2 * b5);
    jac[11] = 2;
    jac[12] = jac[9];
    jac[13] = 1 - MU1 * (a3 - 3 * yy * yy * a5) - MU * (b3 - 3 * yy * yy * b5);
    jac[14] = -2;
  },
  stiff: false,
  invariants: [
    {
      name: 'jacobi-constant',
      fn: (_t, y) => {
        const x = y[0]!;
        const yy = y[1]!;
        const r1 = Math.hypot(x + MU, yy);
        const r2 = Math.hypot(x - MU1, yy);
        return x * x + yy * yy + (2 * MU1) / r1 + (2 * MU) / r2 - (y[2]! * y[2]! + y[3]! * y[3]!);
      },
    },
  ],
  errorScale: { kind: 'absolute' },
  reference: {
    kind: 'published',
    digits: 8,
    source: 'periodicity of the published orbit, HNW I sec. II.0: y(T) = y(0)',
    points: [{ t: PERIOD, y: Y0 }],
  },
  checkTimes: [],
  // Equal steps from 1000 doubling (rk4 needs thousands on this orbit, HNW I sec. II.0 fig. 0.1).
  defaultSteps: [1000, 2000, 4000, 8000, 16000, 32000, 64000],
  separableReason: 'the Coriolis terms make each acceleration depend on the velocities',
});
