import type { TableauData, TableauMethod } from '../tableau.js';

/**
 * J. R. Dormand and P. J. Prince, "A family of embedded Runge-Kutta formulae", J. Comput. Appl.
 * Math. 6 (1980) 19-26 (RK5(4)7M). Seven stages, FSAL; the fifth-order solution is propagated.
 */
export const DORMAND_PRINCE_54: TableauData = {
  c: [0, 1 / 5, 3 / 10, 4 / 5, 8 / 9, 1, 1],
  a: [
    [],
    [1 / 5],
    [3 / 40, 9 / 40],
    [44 / 45, -56 / 15, 32 / 9],
    [19372 / 6561, -25360 / 2187, 64448 / 6561, -212 / 729],
    [9017 / 3168, -355 / 33, 46732 / 5247, 49 / 176, -5103 / 18656],
    [35 / 384, 0, 500 / 1113, 125 / 192, -2187 / 6784, 11 / 84],
  ],
  b: [35 / 384, 0, 500 / 1113, 125 / 192, -2187 / 6784, 11 / 84, 0],
  order: 5,
  bHat: [5179 / 57600, 0, 7571 / 16695, 393 / 640, -92097 / 339200, 187 / 2100, 1 / 40],
  embeddedOrder: 4,
};

/**
 * Coefficients of the fourth-order continuous extension (L. F. Shampine, "Some practical
 * Runge-Kutta formulas", Math. Comp. 46 (1986) 135-150), in the form given by Hairer, Norsett and
 * Wanner, Solving Ordinary Differential Equations I, 2nd ed., sec. II.6 (dense output of DOPRI5).
 * Index i multiplies stage k_{i+1}; stage 2 does not enter.
 */
export const DORMAND_PRINCE_54_DENSE: readonly number[] = [
  -12715105075 / 11282082432,
  0,
  87487479700 / 32700410799,
  -10690763975 / 1880347072,
  701980252875 / 199316789632,
  -1453857185 / 822651844,
  69997945 / 29380423,
];

export const dormandPrince54: TableauMethod = {
  id: 'dormand-prince-54',
  name: 'Dormand-Prince 5(4)',
  source: 'J. R. Dormand and P. J. Prince, A family of embedded Runge-Kutta formulae, J. Comput. Appl. Math. 6 (1980) 19-26',
  notes: 'dense output: Shampine (1986) 4th-order continuous extension, HNW I sec. II.6',
  tableau: DORMAND_PRINCE_54,
  denseOutput: { form: 'dopri5', d: DORMAND_PRINCE_54_DENSE },
};
