import type { TableauData, TableauMethod } from '../tableau.js';

/**
 * The classic fourth-order method: W. Kutta, "Beitrag zur naeherungsweisen Integration totaler
 * Differentialgleichungen", Z. Math. Phys. 46 (1901) 435-453.
 */
export const RK4: TableauData = {
  c: [0, 1 / 2, 1 / 2, 1],
  a: [[], [1 / 2], [0, 1 / 2], [0, 0, 1]],
  b: [1 / 6, 1 / 3, 1 / 3, 1 / 6],
  order: 4,
};

export const rk4: TableauMethod = {
  id: 'rk4',
  name: 'Classic Runge-Kutta 4 (Kutta)',
  source: 'W. Kutta, Beitrag zur naeherungsweisen Integration totaler Differentialgleichungen, Z. Math. Phys. 46 (1901) 435-453',
  tableau: RK4,
};
