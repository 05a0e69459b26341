import type { TableauData, TableauMethod } from '../tableau.js';

/**
 * Heun's second-order formula (the explicit trapezoidal rule): K. Heun, "Neue Methoden zur
 * approximativen Integration der Differentialgleichungen einer unabhaengigen Veraenderlichen",
 * Z. Math. Phys. 45 (1900) 23-38. Its first stage alone is Euler's formula (L. Euler, Institutionum
 * calculi integralis, vol. 1, 1768), which gives the embedded first-order solution at no extra
 * evaluation; the second-order solution is propagated. Two stages, not FSAL.
 */
export const HEUN_EULER_21: TableauData = {
  c: [0, 1],
  a: [[], [1]],
  b: [1 / 2, 1 / 2],
  order: 2,
  bHat: [1, 0],
  embeddedOrder: 1,
};

export const heunEuler21: TableauMethod = {
  id: 'heun-euler-21',
  name: 'Heun-Euler 2(1)',
  source:
    'K. Heun, Neue Methoden zur approximativen Integration der Differentialgleichungen einer unabhaengigen Veraenderlichen, Z. Math. Phys. 45 (1900) 23-38; embedded Euler solution (Euler 1768)',
  notes: 'the simplest embedded pair; the error estimate is the difference of the two formulas',
  tableau: HEUN_EULER_21,
};
