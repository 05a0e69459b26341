import type { TableauData, TableauMethod } from '../tableau.js';

/**
 * P. Bogacki and L. F. Shampine, "A 3(2) pair of Runge-Kutta formulas", Appl. Math. Lett. 2 (1989)
 * 321-325. Four stages, FSAL; the third-order solution is propagated.
 */
export const BOGACKI_SHAMPINE_32: TableauData = {
  c: [0, 1 / 2, 3 / 4, 1],
  a: [[], [1 / 2], [0, 3 / 4], [2 / 9, 1 / 3, 4 / 9]],
  b: [2 / 9, 1 / 3, 4 / 9, 0],
  order: 3,
  bHat: [7 / 24, 1 / 4, 1 / 3, 1 / 8],
  embeddedOrder: 2,
};

export const bogackiShampine32: TableauMethod = {
  id: 'bogacki-shampine-32',
  name: 'Bogacki-Shampine 3(2)',
  source: 'P. Bogacki and L. F. Shampine, A 3(2) pair of Runge-Kutta formulas, Appl. Math. Lett. 2 (1989) 321-325',
  notes: "dense output: cubic Hermite of the step's end values and slopes (free with the FSAL stage; third order)",
  tableau: BOGACKI_SHAMPINE_32,
  denseOutput: { form: 'fsal-hermite' },
};
