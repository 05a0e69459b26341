// Implicit midpoint rule, y1 = y0 + h f(t0 + h/2, (y0 + y1)/2): order 2, A-stable, symmetric.
// Hairer, Lubich & Wanner, Geometric Numerical Integration, sec. II.1; Hairer & Wanner, Solving
// ODEs II, sec. IV.3 (1-stage Gauss method). Fixed step. Solved for z = (y0 + y1)/2 from
// z = y0 + (h/2) f(t0 + h/2, z), then y1 = 2 z - y0.
import type { Method } from '../../core/types.js';
import { oneStageFixedMethod } from './one-stage-fixed.js';

export const implicitMidpoint: Method = oneStageFixedMethod(
  {
    id: 'implicit-midpoint',
    name: 'Implicit midpoint rule',
    order: 2,
    source: 'E. Hairer, C. Lubich, G. Wanner, Geometric Numerical Integration, 2nd ed., Springer 2006, sec. II.1',
    notes: 'Fixed step; Newton with the Jacobian at each step start, iterated to 1e-14 relative. Not L-stable.',
  },
  0.5,
);
