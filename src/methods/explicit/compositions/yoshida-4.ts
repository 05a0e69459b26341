import type { CompositionMethod } from '../symplectic.js';

/**
 * Yoshida's fourth-order triple jump, H. Yoshida, "Construction of higher order symplectic
 * integrators", Phys. Lett. A 150 (1990) 262-268: three Stormer-Verlet substeps of relative
 * lengths w1, w0, w1 with w1 = 1/(2 - 2^(1/3)), w0 = -2^(1/3) w1 (2 w1 + w0 = 1, 2 w1^3 + w0^3 = 0).
 */
const CBRT2 = Math.cbrt(2);
const W1 = 1 / (2 - CBRT2);
const W0 = -CBRT2 / (2 - CBRT2);

export const yoshida4: CompositionMethod = {
  id: 'yoshida-4',
  name: 'Yoshida 4th-order triple jump',
  source: 'H. Yoshida, Construction of higher order symplectic integrators, Phys. Lett. A 150 (1990) 262-268',
  order: 4,
  weights: [W1, W0, W1],
};
