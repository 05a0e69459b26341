import type { TableauData, TableauMethod } from '../tableau.js';

/**
 * J. R. Cash and A. H. Karp, "A variable order Runge-Kutta method for initial value problems with
 * rapidly varying right-hand sides", ACM Trans. Math. Softw. 16 (1990) 201-222. Six stages; the
 * fifth-order solution is propagated with the fourth-order one as error estimate.
 */
export const CASH_KARP_45: TableauData = {
  c: [0, 1 / 5, 3 / 10, 3 / 5, 1, 7 / 8],
  a: [
    [],
    [1 / 5],
    [3 / 40, 9 / 40],
    [3 / 10, -9 / 10, 6 / 5],
    [-11 / 54, 5 / 2, -70 / 27, 35 / 27],
    [1631 / 55296, 175 / 512, 575 / 13824, 44275 / 110592, 253 / 4096],
  ],
  b: [37 / 378, 0, 250 / 621, 125 / 594, 0, 512 / 1771],
  order: 5,
  bHat: [2825 / 27648, 0, 18575 / 48384, 13525 / 55296, 277 / 14336, 1 / 4],
  embeddedOrder: 4,
};

export const cashKarp45: TableauMethod = {
  id: 'cash-karp-45',
  name: 'Cash-Karp 5(4)',
  source:
    'J. R. Cash and A. H. Karp, A variable order Runge-Kutta method for initial value problems with rapidly varying right-hand sides, ACM Trans. Math. Softw. 16 (1990) 201-222',
  tableau: CASH_KARP_45,
};
