import type { TableauData, TableauMethod } from '../tableau.js';

/**
 * Ch. Tsitouras, "Runge-Kutta pairs of order 5(4) satisfying only the first column simplifying
 * assumption", Comput. Math. Appl. 62 (2011) 770-775. Seven stages, FSAL; the fifth-order
 * solution is propagated. The paper gives the coefficients as 16-digit decimals.
 */
export const TSITOURAS_54_B: readonly number[] = [
  0.09646076681806523, 0.01, 0.4798896504144996, 1.379008574103742, -3.290069515436081,
  2.324710524099774, 0,
];

/** Error weights b_i - bHat_i from the same paper (their sum is zero). */
export const TSITOURAS_54_E: readonly number[] = [
  0.00178001105222577714, 0.0008164344596567469, -0.007880878010261995, 0.1447110071732629,
  -0.5823571654525552, 0.45808210592918697, -1 / 66,
];

export const TSITOURAS_54: TableauData = {
  c: [0, 0.161, 0.327, 0.9, 0.9800255409045097, 1, 1],
  a: [
    [],
    [0.161],
    [-0.008480655492356989, 0.335480655492357],
    [2.897153057105493, -6.359448489975075, 4.3622954328695815],
    [5.325864828439257, -11.748883564062828, 7.4955393428898365, -0.09249506636175525],
    [5.86145544294642, -12.92096931784711, 8.159367898576159, -0.071584973281401, -0.028269050394068383],
    TSITOURAS_54_B.slice(0, 6),
  ],
  b: TSITOURAS_54_B,
  order: 5,
  bHat: TSITOURAS_54_B.map((bi, i) => bi - TSITOURAS_54_E[i]!),
  embeddedOrder: 4,
};

export const tsitouras54: TableauMethod = {
  id: 'tsitouras-54',
  name: 'Tsitouras 5(4)',
  source:
    'Ch. Tsitouras, Runge-Kutta pairs of order 5(4) satisfying only the first column simplifying assumption, Comput. Math. Appl. 62 (2011) 770-775',
  tableau: TSITOURAS_54,
};
