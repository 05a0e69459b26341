// Van der Pol oscillator y1' = y2, y2' = mu (1 - y1^2) y2 - y1, shared by the mildly nonlinear
// (mu = 1) and the stiff (mu = 1000) catalogue entries.
import type { JacobianFn, Rhs } from '../../src/core/types.js';

export function vanDerPolRhs(mu: number): Rhs {
  return (_t, y, dy) => {
    const y1 = y[0]!;
    const y2 = y[1]!;
    dy[0] = y2;
    dy[1] = mu * (1 - y1 * y1) * y2 - y1;
  };
}

export function vanDerPolJacobian(mu: number): JacobianFn {
  return (_t, y, jac) => {
    const y1 = y[0]!;
    const y2 = y[1]!;
    jac[0] = 0;
    jac[1] = 1;
    jac[2] = -2 * mu * y1 * y2 - 1;
    jac[3] = mu * (1 - y1 * y1);
  };
}
