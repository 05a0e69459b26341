import type { TableauData, TableauMethod } from '../tableau.js';

/**
 * E. Fehlberg, "Low-order classical Runge-Kutta formulas with stepsize control and their
 * application to some heat transfer problems", NASA Technical Report R-315 (1969), RKF4(5).
 * As published, the fourth-order solution is propagated and the fifth-order one only estimates
 * the error (no local extrapolation).
 */
export const FEHLBERG_45: TableauData = {
  c: [0, 1 / 4, 3 / 8, 12 / 13, 1, 1 / 2],
  a: [
    [],
    [1 / 4],
    [3 / 32, 9 / 32],
    [1932 / 2197, -7200 / 2197, 7296 / 2197],
    [439 / 216, -8, 3680 / 513, -845 / 4104],
    [-8 / 27, 2, -3544 / 2565, 1859 / 4104, -11 / 40],
  ],
  b: [25 / 216, 0, 1408 / 2565, 2197 / 4104, -1 / 5, 0],
  order: 4,
  bHat: [16 / 135, 0, 6656 / 12825, 28561 / 56430, -9 / 50, 2 / 55],
  embeddedOrder: 5,
};

export const fehlberg45: TableauMethod = {
  id: 'fehlberg-45',
  name: 'Runge-Kutta-Fehlberg 4(5)',
  source:
    'E. Fehlberg, Low-order classical Runge-Kutta formulas with stepsize control and their application to some heat transfer problems, NASA TR R-315 (1969)',
  notes: 'propagates the fourth-order solution, as published',
  tableau: FEHLBERG_45,
};
