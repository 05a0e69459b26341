// Right-hand side, Jacobian and invariants of the two-body problem x'' = -mu x / |x|^3 in d
// dimensions, state (positions, velocities). Shared by the circular and eccentric Kepler problems.
import type { Invariant, JacobianFn, Rhs } from '../../src/core/types.js';

export function twoBodyRhs(d: number, mu: number): Rhs {
  // The plane and space written out, as the compiled peers write it (bench/compiled/peers.cpp):
  // loops of 2 or 3 cost more in loop control than in arithmetic. Same operations in the same
  // order as the loop below (0 + x^2 is x^2 exactly), so the same bits.
  if (d === 2) {
    return (_t, y, dy) => {
      const x = y[0]!;
      const z = y[1]!;
      const r2 = x * x + z * z;
      const k = -mu / (r2 * Math.sqrt(r2));
      dy[0] = y[2]!;
      dy[2] = k * x;
      dy[1] = y[3]!;
      dy[3] = k * z;
    };
  }
  if (d === 3) {
    return (_t, y, dy) => {
      const x = y[0]!;
      const z = y[1]!;
      const w = y[2]!;
      const r2 = x * x + z * z + w * w;
      const k = -mu / (r2 * Math.sqrt(r2));
      dy[0] = y[3]!;
      dy[3] = k * x;
      dy[1] = y[4]!;
      dy[4] = k * z;
      dy[2] = y[5]!;
      dy[5] = k * w;
    };
  }
  return (_t, y, dy) => {
    let r2 = 0;
    for (let i = 0; i < d; i++) r2 += y[i]! * y[i]!;
    const k = -mu / (r2 * Math.sqrt(r2));
    for (let i = 0; i < d; i++) {
      dy[i] = y[d + i]!;
      dy[d + i] = k * y[i]!;
    }
  };
}

/** d(-mu x_i / r^3)/dx_j = -mu (delta_ij / r^3 - 3 x_i x_j / r^5); the position block is I. */
export function twoBodyJacobian(d: number, mu: number): JacobianFn {
  const n = 2 * d;
  return (_t, y, jac) => {
    jac.fill(0);
    let r2 = 0;
    for (let i = 0; i < d; i++) r2 += y[i]! * y[i]!;
    const r3 = r2 * Math.sqrt(r2);
    const a = -mu / r3;
    const b = (3 * mu) / (r3 * r2);
    for (let i = 0; i < d; i++) {
      jac[i * n + d + i] = 1;
      for (let j = 0; j < d; j++) {
        jac[(d + i) * n + j] = b * y[i]! * y[j]! + (i === j ? a : 0);
      }
    }
  };
}

/** Energy |v|^2 / 2 - mu / |x|. */
export function twoBodyEnergy(d: number, mu: number): Invariant {
  return {
    name: 'energy',
    fn: (_t, y) => {
      let r2 = 0;
      let v2 = 0;
      for (let i = 0; i < d; i++) {
        r2 += y[i]! * y[i]!;
        v2 += y[d + i]! * y[d + i]!;
      }
      return 0.5 * v2 - mu / Math.sqrt(r2);
    },
  };
}

/** Magnitude of x cross v (in the plane, |x vy - y vx|). */
export function twoBodyAngularMomentum(d: 2 | 3): Invariant {
  return {
    name: 'angular-momentum',
    fn: (_t, y) => {
      if (d === 2) return Math.abs(y[0]! * y[3]! - y[1]! * y[2]!);
      const hx = y[1]! * y[5]! - y[2]! * y[4]!;
      const hy = y[2]! * y[3]! - y[0]! * y[5]!;
      const hz = y[0]! * y[4]! - y[1]! * y[3]!;
      return Math.sqrt(hx * hx + hy * hy + hz * hz);
    },
  };
}
