import type { TableauData, TableauMethod } from '../tableau.js';

/**
 * Kutta's 3/8 rule: W. Kutta, "Beitrag zur naeherungsweisen Integration totaler
 * Differentialgleichungen", Z. Math. Phys. 46 (1901) 435-453. Order 4.
 */
export const RK4_38: TableauData = {
  c: [0, 1 / 3, 2 / 3, 1],
  a: [[], [1 / 3], [-1 / 3, 1], [1, -1, 1]],
  b: [1 / 8, 3 / 8, 3 / 8, 1 / 8],
  order: 4,
};

export const rk438: TableauMethod = {
  id: 'rk4-38',
  name: "Kutta's 3/8 rule",
  source: 'W. Kutta, Beitrag zur naeherungsweisen Integration totaler Differentialgleichungen, Z. Math. Phys. 46 (1901) 435-453',
  tableau: RK4_38,
};
