// RODAS4: stiffly accurate, L-stable Rosenbrock method of order 4 with embedded order 3, 6 stages.
// E. Hairer & G. Wanner, Solving Ordinary Differential Equations II, 2nd ed., Springer 1996,
// sec. IV.7 (method RODAS; coefficients as distributed with the authors' code RODAS), in the
// transformed form (7.25)-(7.26) stepped by rosenbrock.ts; the error estimate is u_6.
import type { Method, Problem, Setting, SolveOptions, SolveResult } from '../../core/types.js';
import { solveAdaptive } from './common.js';
import type { RosenbrockData } from './rosenbrock-data.js';
import { rosenbrockStepper } from './rosenbrock.js';

/** Coefficients of RODAS4 (Hairer & Wanner 1996, sec. IV.7), transformed form. */
export const RODAS4: RosenbrockData = {
  gamma: 0.25,
  alpha: [0, 0.386, 0.21, 0.63, 1, 1],
  gammaSum: [0.25, -0.1043, 0.1035, -0.0362, 0, 0],
  /** a_ij, j < i, row by row. */
  a: [
    [],
    [1.544],
    [0.9466785280815826, 0.2557011698983284],
    [3.314825187068521, 2.896124015972201, 0.9986419139977817],
    [1.221224509226641, 6.019134481288629, 12.53708332932087, -0.687886036105895],
    [1.221224509226641, 6.019134481288629, 12.53708332932087, -0.687886036105895, 1],
  ] as number[][],
  /** c_ij, j < i, row by row. */
  c: [
    [],
    [-5.6688],
    [-2.430093356833875, -0.2063599157091915],
    [-0.1073529058151375, -9.594562251023355, -20.47028614809616],
    [7.496443313967647, -10.24680431464352, -33.99990352819905, 11.7089089320616],
    [8.083246795921522, -7.981132988064893, -31.52159432874371, 16.31930543123136, -6.058818238834054],
  ] as number[][],
  m: [1.221224509226641, 6.019134481288629, 12.53708332932087, -0.687886036105895, 1, 1],
  /** Error estimate is u_6. */
  e: [0, 0, 0, 0, 0, 1],
  /** Every stage evaluates f anew. */
  reuse: [false, false, false, false, false, false],
  errorExponent: 0.25,
};

const createStepper = rosenbrockStepper(RODAS4, 'hairer-wanner-rodas4');

// The record spells out its solve: solve's text is part of the method's sha256 (src/sweep/run.ts),
// which a baseline compares, so it stays as it was when the method was first stepped.
export const rodas4: Method = {
  id: 'hairer-wanner-rodas4',
  name: 'RODAS4 (Hairer-Wanner)',
  family: 'implicit',
  order: 4,
  embeddedOrder: 3,
  source: 'E. Hairer, G. Wanner, Solving Ordinary Differential Equations II, 2nd ed., Springer 1996, sec. IV.7 (RODAS)',
  adaptive: true,
  stiff: true,
  notes:
    'L-stable, stiffly accurate Rosenbrock 4(3), one Jacobian and one LU per attempt; ' +
    'df/dt by forward difference (1 f evaluation per step, counted in nfev).',
  solve(problem: Problem, setting: Setting, options: SolveOptions): SolveResult {
    return solveAdaptive(problem, setting, options, 'hairer-wanner-rodas4', 4, createStepper);
  },
};
