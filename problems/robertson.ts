// Robertson's chemical kinetics (three species):
//   y1' = -0.04 y1 + 1e4 y2 y3
//   y2' =  0.04 y1 - 1e4 y2 y3 - 3e7 y2^2
//   y3' =  3e7 y2^2,                y(0) = (1, 0, 0), t in [0, 1e11].
// Sources: t = 40 from Hairer and Wanner, Solving ODEs II, sec. IV.1 (10 digits printed);
// t = 1e11 from Mazzia and Magherini, Test Set for IVP Solvers, problem
// ROBER (16 digits printed). `digits` is the smaller of the two, 10. Checked here with odex
// (test/catalogue-stiff.test.ts): at t = 40 y2 converges to 0.91855347645(6)e-5, so its printed
// last digit is truncated, not rounded (off by 0.56 units); at t = 1e11 the printed values sum to
// 1 + 1.0e-14, so they are good to about 14 digits, not 16.
// Error scale: relative per component with floor 1e-20. y2 is ~8.3e-14 at the end and y1
// ~2.1e-8, so any floor near those sizes would turn the measure into an absolute one for exactly
// the components that make the problem hard; 1e-20 is below every reference value by seven orders
// and only keeps the ratio finite.
// atolScale 1e-12 for every component: atol = rtol * 1e-12, so the step control is relative in
// effect. The error is measured relative per component and y1 ~ 2e-8, y2 ~ 8e-14 at t = 1e11, so
// any absolute tolerance near those sizes would let exactly the hard components go unmeasured by
// the controller (with 1e-6 of each peak, radau-iia-5 at rtol 1e-8 ended 4.5e-6 off in y2).
// Invariant: mass y1 + y2 + y3 = 1 (the right-hand sides sum to zero).
import type { Problem } from '../src/core/types.js';
import { catalogueProblem } from './from-source.js';

const K1 = 0.04;
const K2 = 3e7;
const K3 = 1e4;
/** Hairer and Wanner, Solving ODEs II, sec. IV.1. */
const Y_40 = [0.7158270687, 0.9185534764e-5, 0.2841637457];
/** Mazzia and Magherini, Test Set for IVP Solvers, ROBER. */
const Y_END = [0.2083340149701255e-7, 0.8333360770334713e-13, 0.9999999791665050];

export const robertson: Problem = catalogueProblem(import.meta.url, {
  id: 'robertson',
  title: 'Robertson chemical kinetics (stiff)',
  source: 'Hairer and Wanner, Solving ODEs II, sec. IV.1 (t = 40); Mazzia and Magherini, Test Set for IVP Solvers, ROBER (t = 1e11)',
  dimension: 3,
  stateNames: ['y1', 'y2', 'y3'],
  t0: 0,
  tEnd: 1e11,
  y0: [1, 0, 0],
  f(_t, y, dy) {
    const y1 = y[0]!;
    const y2 = y[1]!;
    const y3 = y[2]!;
    const a = K1 * y1;
    const b = K3 * y2 * y3;
    const c = K2 * y2 * y2;
    dy[0] = -a + b;
    dy[1] = a - b - c;
    dy[2] = c;
  },
  jacobian(_t, y, jac) {
    const y2 = y[1]!;
    const y3 = y[2]!;
    jac[0] = -K1;
    jac[1] = K3 * y3;
    jac[2] = K3 * y2;
    jac[3] = K1;
    jac[4] = -K3 * y3 - 2 * K2 * y2;
    jac[5] = -K3 * y2;
    jac[6] = 0;
    jac[7] = 2 * K2 * y2;
    jac[8] = 0;
  },
  stiff: true,
  invariants: [{ name: 'mass', fn: (_t, y) => y[0]! + y[1]! + y[2]! }],
  errorScale: { kind: 'relative', floor: 1e-20 },
  atolScale: 1e-12,
  reference: {
    kind: 'published',
    digits: 10,
    source: 'Hairer and Wanner, Solving ODEs II, sec. IV.1 (t = 40); Test Set for IVP Solvers, ROBER (t = 1e11)',
    points: [
      { t: 40, y: Y_40 },
      { t: 1e11, y: Y_END },
    ],
  },
  checkTimes: [40],
});
