// Backward (implicit) Euler, y1 = y0 + h f(t1, y1): order 1, L-stable.
// Hairer & Wanner, Solving ODEs II, sec. IV.3 (as the 1-stage Radau IIA method). Fixed step.
import type { Method } from '../../core/types.js';
import { oneStageFixedMethod } from './one-stage-fixed.js';

export const backwardEuler: Method = oneStageFixedMethod(
  {
    id: 'backward-euler',
    name: 'Backward Euler',
    order: 1,
    source: 'E. Hairer, G. Wanner, Solving Ordinary Differential Equations II, 2nd ed., Springer 1996, sec. IV.3',
    notes: 'Fixed step; Newton with the Jacobian at each step start, iterated to 1e-14 relative.',
  },
  1,
);
