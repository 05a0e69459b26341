// Stiff van der Pol oscillator y1' = y2, y2' = mu (1 - y1^2) y2 - y1, mu = 1000, y(0) = (2, 0),
// t in [0, 2000]. This is the Test Set's VDPOL problem (y'' = ((1 - y^2) y' - y) / eps,
// eps = 1e-6, t in [0, 2], y(0) = (2, 0)) in unscaled time t = 1000 tau, so y2 here is the Test
// Set's y2 divided by 1000.
// Source: F. Mazzia and C. Magherini, Test Set for IVP Solvers, problem "van der
// Pol": y(2) = (0.1706167732170469e1, -0.8928097010248125e0), i.e. here
// y(2000) = (1.706167732170469, -0.8928097010248125e-3). The Test Set prints 16 digits; odex at
// rtol 1e-12 (test/catalogue-stiff.test.ts) confirms 11, which is the `digits` claimed.
// Error scale: relative per component, floor 1e-6. y1 is O(1) and y2 is about 1e-3 on the slow
// branches (and up to ~1e3 in the fast jumps), so an absolute error would ignore y2; a floor of
// 1e-6, far below both reference magnitudes at t = 2000 (1.7 and 8.9e-4), keeps the error truly
// relative there and only guards against division by a passing zero.
// atolScale [1, 1e-3]: atol_i = rtol times the slow-branch magnitude of each component.
// Invariants: none.
import type { Problem } from '../src/core/types.js';
import { vanDerPolJacobian, vanDerPolRhs } from './physics/van-der-pol.js';
import { catalogueProblem } from './from-source.js';

const MU = 1000;
const Y_END = [1.706167732170469, -0.8928097010248125e-3];

export const vanDerPolStiff: Problem = catalogueProblem(import.meta.url, {
  id: 'van-der-pol-stiff',
  title: 'Van der Pol oscillator, mu = 1000 (stiff)',
  source: 'Mazzia and Magherini, Test Set for IVP Solvers, problem "van der Pol" (VDPOL), in unscaled time',
  dimension: 2,
  stateNames: ['y1', 'y2'],
  t0: 0,
  tEnd: 2000,
  y0: [2, 0],
  f: vanDerPolRhs(MU),
  jacobian: vanDerPolJacobian(MU),
  stiff: true,
  invariants: [],
  errorScale: { kind: 'relative', floor: [1e-6, 1e-6] },
  atolScale: [1, 1e-3],
  reference: {
    kind: 'published',
    digits: 11,
    source: 'Mazzia and Magherini, Test Set for IVP Solvers, VDPOL (16 digits printed; 11 confirmed here with odex)',
    points: [{ t: 2000, y: Y_END }],
  },
  checkTimes: [],
});
