// ROS4 with the L-stable parameter set: Rosenbrock method of order 4 with embedded order 3,
// 4 stages, of which the fourth reuses the third's evaluation (alpha_4 = alpha_3, the same a row),
// so each step costs 3 evaluations of f plus the df/dt difference, against RODAS4's 6 stages.
// E. Hairer & G. Wanner, Solving Ordinary Differential Equations II, 2nd ed., Springer 1996,
// sec. IV.7, Table 7.2 (the L-stable set, gamma = 0.57282, beside Shampine's 1982 set, Kaps and
// Rentrop's GRK4T and Van Veldhuizen's); coefficients in the transformed form (7.25)-(7.26) as
// distributed with the authors' code ROS4, stepped by rosenbrock.ts. Error estimate sum e_i u_i.
import type { Method, Problem, Setting, SolveOptions, SolveResult } from '../../core/types.js';
import { solveAdaptive } from './common.js';
import type { RosenbrockData } from './rosenbrock-data.js';
import { rosenbrockStepper } from './rosenbrock.js';

/** The L-stable ROS4 set (Hairer & Wanner 1996, sec. IV.7, Table 7.2), transformed form. */
export const ROS4_L_STABLE: RosenbrockData = {
  gamma: 0.57282,
  alpha: [0, 1.14564, 0.65521686381559, 0.65521686381559],
  gammaSum: [0.57282, -1.769193891319233, 0.7592633437920482, -0.104902108710045],
  a: [[], [2], [1.867943637803922, 0.2344449711399156], [1.867943637803922, 0.2344449711399156, 0]],
  c: [
    [],
    [-7.13761503641231],
    [2.580708087951457, 0.6515950076447975],
    [-2.137148994382534, -0.3214669691237626, -0.6949742501781779],
  ],
  m: [2.255570073418735, 0.2870493262186792, 0.435317943184018, 1.093502252409163],
  e: [-0.2815431932141155, -0.0727619912493892, -0.1082196201495311, -1.093502252409163],
  /** Stage 4 has stage 3's argument. */
  reuse: [false, false, false, true],
  errorExponent: 0.25,
};

const createStepper = rosenbrockStepper(ROS4_L_STABLE, 'hairer-wanner-ros4-l-stable');

export const ros4LStable: Method = {
  id: 'hairer-wanner-ros4-l-stable',
  name: 'ROS4, L-stable set (Hairer-Wanner)',
  family: 'implicit',
  order: 4,
  embeddedOrder: 3,
  source: 'E. Hairer, G. Wanner, Solving Ordinary Differential Equations II, 2nd ed., Springer 1996, sec. IV.7, Table 7.2 (ROS4, L-stable set)',
  adaptive: true,
  stiff: true,
  notes:
    'L-stable Rosenbrock 4(3), 4 stages with 3 evaluations of f, one Jacobian and one LU per attempt; ' +
    'df/dt by forward difference (1 f evaluation per step, counted in nfev).',
  solve(problem: Problem, setting: Setting, options: SolveOptions): SolveResult {
    return solveAdaptive(problem, setting, options, 'hairer-wanner-ros4-l-stable', 4, createStepper);
  },
};
