// Van der Pol oscillator y1' = y2, y2' = mu (1 - y1^2) y2 - y1 with mu = 1, y(0) = (2, 0),
// t in [0, 20] (about three periods of the limit cycle, period ~6.66).
// Source of the reference: certified by this project. The values at t = 5, 10, 15, 20 were
// computed twice, independently: (a) odex (Hairer's GBS extrapolation code, npm `odex`) at
// rtol = atol = 1e-14, and (b) classic RK4 with 1000 and 2000 steps per unit time and one
// Richardson extrapolation (16 y_{h/2} - y_h) / 15, which agreed with a further level
// (2000/4000 steps) to 5e-16. The stored values are (b); (a) and (b) agree to within 3e-13
// absolute in every component, i.e. at least 11 significant digits (the smallest component is
// y2(10) = 0.0329), so `digits` is 11. test/catalogue-vdp.test.ts recomputes both.
// Error scale: absolute (components stay O(1), |y1| <= 2.01, |y2| <= 2.7).
// Invariants: none (dissipative on one part of the cycle, pumped on the other).
import type { Problem } from '../src/core/types.js';
import { vanDerPolJacobian, vanDerPolRhs } from './physics/van-der-pol.js';
import { catalogueProblem } from './from-source.js';

const MU = 1;

/** Certified reference (see header): RK4 + Richardson, confirmed by odex to 11 digits. */
export const VAN_DER_POL_REFERENCE = [
  { t: 5, y: [-0.8370774502947652, 1.3070889377996717] },
  { t: 10, y: [-2.0083407825797126, 0.03290706586332343] },
  { t: 15, y: [0.8304374342969234, -1.3133658789061757] },
  { t: 20, y: [2.008149762174949, -0.042508875273200845] },
] as const;

const POINTS = VAN_DER_POL_REFERENCE.map((p) => ({ t: p.t, y: [...p.y] }));

export const vanDerPol: Problem = catalogueProblem(import.meta.url, {
  id: 'van-der-pol',
  title: 'Van der Pol oscillator, mu = 1',
  source: 'Van der Pol (1926); reference certified by odex (rtol = atol = 1e-14) and RK4 with Richardson extrapolation, agreeing to 11 digits',
  dimension: 2,
  stateNames: ['y1', 'y2'],
  t0: 0,
  tEnd: 20,
  y0: [2, 0],
  f: vanDerPolRhs(MU),
  jacobian: vanDerPolJacobian(MU),
  stiff: false,
  invariants: [],
  errorScale: { kind: 'absolute' },
  reference: {
    kind: 'certified',
    digits: 11,
    source: 'odex at rtol = atol = 1e-14 and RK4 (1000, 2000 steps per unit) with Richardson extrapolation',
    certifiedBy: { methods: ['odex', 'rk4'] },
    points: POINTS,
  },
  checkTimes: [5, 10, 15],
});
