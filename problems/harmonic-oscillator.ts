// Harmonic oscillator q' = p, p' = -w^2 q with w = 2 pi, q(0) = 1, p(0) = 0, t in [0, 20].
// Source: textbook analytic solution q = cos(w t), p = -w sin(w t) (any mechanics text, e.g.
// Hairer, Lubich and Wanner, Geometric Numerical Integration, sec. I.1).
// Error scale: absolute (both components are O(1) and O(w) for all t and never decay).
// Invariant: energy (p^2 + w^2 q^2) / 2 = w^2 / 2. Separable: q' depends on p only, p' on q only.
// Checked once per period (period 1), so phase and amplitude errors are both visible.
import type { Problem } from '../src/core/types.js';
import { catalogueProblem } from './from-source.js';

const W = 2 * Math.PI;
const W2 = W * W;
const T_END = 20;
const CHECK_TIMES = Array.from({ length: T_END }, (_, k) => k + 1);

export const harmonicOscillator: Problem = catalogueProblem(import.meta.url, {
  id: 'harmonic-oscillator',
  title: 'Harmonic oscillator',
  source: 'Analytic solution q = cos(wt), p = -w sin(wt); e.g. Hairer, Lubich and Wanner, Geometric Numerical Integration, sec. I.1',
  dimension: 2,
  stateNames: ['q', 'p'],
  t0: 0,
  tEnd: T_END,
  y0: [1, 0],
  f(_t, y, dy) {
    dy[0] = y[1]!;
    dy[1] = -W2 * y[0]!;
  },
  jacobian(_t, _y, jac) {
    jac[0] = 0;
    jac[1] = 1;
    jac[2] = -W2;
    jac[3] = 0;
  },
  stiff: false,
  invariants: [{ name: 'energy', fn: (_t, y) => 0.5 * (y[1]! * y[1]! + W2 * y[0]! * y[0]!) }],
  errorScale: { kind: 'absolute' },
  reference: {
    kind: 'exact',
    source: 'analytic: q = cos(w t), p = -w sin(w t)',
    exact(t, out) {
      out[0] = Math.cos(W * t);
      out[1] = -W * Math.sin(W * t);
    },
  },
  checkTimes: CHECK_TIMES,
  // Equal steps from 200 doubling: reaches rk4's asymptotic range (common practice, no source).
  defaultSteps: [200, 400, 800, 1600, 3200, 6400, 12800, 25600],
  separable: { positions: [0], velocities: [1], secondOrder: true },
});
