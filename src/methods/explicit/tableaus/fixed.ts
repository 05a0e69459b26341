// Classical fixed-step explicit Runge-Kutta tableaux.
import type { TableauData } from '../tableau.js';

/** Forward Euler: L. Euler, Institutionum calculi integralis, vol. 1 (1768). Order 1. */
export const EULER: TableauData = {
  c: [0],
  a: [[]],
  b: [1],
  order: 1,
};

/**
 * Explicit midpoint rule: C. Runge, "Ueber die numerische Aufloesung von Differentialgleichungen",
 * Math. Ann. 46 (1895) 167-178. Order 2.
 */
export const EXPLICIT_MIDPOINT: TableauData = {
  c: [0, 1 / 2],
  a: [[], [1 / 2]],
  b: [0, 1],
  order: 2,
};

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

/** Kutta's 3/8 rule, from the same paper (Z. Math. Phys. 46 (1901) 435-453). Order 4. */
export const RK4_38: TableauData = {
  c: [0, 1 / 3, 2 / 3, 1],
  a: [[], [1 / 3], [-1 / 3, 1], [1, -1, 1]],
  b: [1 / 8, 3 / 8, 3 / 8, 1 / 8],
  order: 4,
};
