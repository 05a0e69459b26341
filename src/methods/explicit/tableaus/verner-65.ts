import type { TableauData, TableauMethod } from '../tableau.js';

/**
 * J. H. Verner, "Explicit Runge-Kutta methods with estimates of the local truncation error",
 * SIAM J. Numer. Anal. 15 (1978) 772-790: the eight-stage 6(5) pair of that paper. The
 * sixth-order solution is propagated (local extrapolation).
 */
export const VERNER_65: TableauData = {
  c: [0, 1 / 6, 4 / 15, 2 / 3, 5 / 6, 1, 1 / 15, 1],
  a: [
    [],
    [1 / 6],
    [4 / 75, 16 / 75],
    [5 / 6, -8 / 3, 5 / 2],
    [-165 / 64, 55 / 6, -425 / 64, 85 / 96],
    [12 / 5, -8, 4015 / 612, -11 / 36, 88 / 255],
    [-8263 / 15000, 124 / 75, -643 / 680, -81 / 250, 2484 / 10625, 0],
    [3501 / 1720, -300 / 43, 297275 / 52632, -319 / 2322, 24068 / 84065, 0, 3850 / 26703],
  ],
  b: [3 / 40, 0, 875 / 2244, 23 / 72, 264 / 1955, 0, 125 / 11592, 43 / 616],
  order: 6,
  bHat: [13 / 160, 0, 2375 / 5984, 5 / 16, 12 / 85, 3 / 44, 0, 0],
  embeddedOrder: 5,
};

export const verner65: TableauMethod = {
  id: 'verner-65',
  name: 'Verner 6(5), 8 stages (1978)',
  source:
    'J. H. Verner, Explicit Runge-Kutta methods with estimates of the local truncation error, SIAM J. Numer. Anal. 15 (1978) 772-790',
  tableau: VERNER_65,
};
