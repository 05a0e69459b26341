import type { TableauData, TableauMethod } from '../tableau.js';

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

export const midpoint: TableauMethod = {
  id: 'midpoint',
  name: 'Explicit midpoint (Runge)',
  source: 'C. Runge, Ueber die numerische Aufloesung von Differentialgleichungen, Math. Ann. 46 (1895) 167-178',
  tableau: EXPLICIT_MIDPOINT,
};
