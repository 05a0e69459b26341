import type { NystromPair } from './pair.js';

/**
 * The 9-stage Runge-Kutta-Nystrom pair of order 8 with an embedded order-6 solution for
 * q'' = g(t, q): J. R. Dormand, M. E. A. El-Mikkawy and P. J. Prince, "High-order embedded
 * Runge-Kutta-Nystrom formulae", IMA J. Numer. Anal. 7 (1987) 423-430. The rational values below
 * are as transcribed in a public implementation's tableau (not checked here against the printed
 * paper); test/nystrom-order-conditions.test.ts checks them against the special Nystrom order
 * conditions of HNW I, sec. II.14. The ninth stage is g(t + h, q_new), the next step's first.
 */
export const DORMAND_EL_MIKKAWY_PRINCE_86: NystromPair = {
  id: 'dormand-el-mikkawy-prince-rkn86',
  name: 'Dormand-El-Mikkawy-Prince RKN 8(6)',
  source:
    'J. R. Dormand, M. E. A. El-Mikkawy and P. J. Prince, High-order embedded Runge-Kutta-Nystrom formulae, IMA J. Numer. Anal. 7 (1987) 423-430',
  notes: 'Runge-Kutta-Nystrom: steps q\'\' = g(t, q) directly, so it runs only on problems whose split says q\' = v; 8 evaluations per step (first same as last); no dense output of its own',
  order: 8,
  embeddedOrder: 6,
  c: [0, 1 / 20, 1 / 10, 3 / 10, 1 / 2, 7 / 10, 9 / 10, 1, 1],
  a: [
    [],
    [1 / 800],
    [1 / 600, 1 / 300],
    [9 / 200, -9 / 100, 9 / 100],
    [-66701 / 197352, 28325 / 32892, -2665 / 5482, 2170 / 24669],
    [227015747 / 304251000, -54897451 / 30425100, 12942349 / 10141700, -9499 / 304251, 539 / 9250],
    [-1131891597 / 901789000, 41964921 / 12882700, -6663147 / 3220675, 270954 / 644135, -108 / 5875, 114 / 1645],
    [13836959 / 3667458, -17731450 / 1833729, 1063919505 / 156478208, -33213845 / 39119552, 13335 / 28544, -705 / 14272, 1645 / 57088],
    [223 / 7938, 0, 1175 / 8064, 925 / 6048, 41 / 448, 925 / 14112, 1175 / 72576, 0],
  ],
  bPosition: [223 / 7938, 0, 1175 / 8064, 925 / 6048, 41 / 448, 925 / 14112, 1175 / 72576, 0, 0],
  bVelocity: [223 / 7938, 0, 5875 / 36288, 4625 / 21168, 41 / 224, 4625 / 21168, 5875 / 36288, 223 / 7938, 0],
  bPositionHat: [7987313 / 109941300, 0, 1610737 / 44674560, 10023263 / 33505920, -497221 / 12409600, 10023263 / 78180480, 1610737 / 402071040, 0, 0],
  bVelocityHat: [
    7987313 / 109941300, 0, 1610737 / 40207104, 10023263 / 23454144, -497221 / 6204800, 10023263 / 23454144, 1610737 / 40207104,
    -4251941 / 54970650, 3 / 20,
  ],
};
