import type { CompositionMethod } from '../symplectic.js';

/**
 * Stormer-Verlet in its kick-drift-kick (velocity Verlet) form, one substep per step: E. Hairer,
 * C. Lubich and G. Wanner, "Geometric numerical integration illustrated by the Stormer-Verlet
 * method", Acta Numerica 12 (2003) 399-450. Symmetric and symplectic, order 2.
 */
export const stormerVerlet: CompositionMethod = {
  id: 'stormer-verlet',
  name: 'Stormer-Verlet (velocity Verlet)',
  source:
    'E. Hairer, C. Lubich and G. Wanner, Geometric numerical integration illustrated by the Stormer-Verlet method, Acta Numerica 12 (2003) 399-450',
  order: 2,
  weights: [1],
};
