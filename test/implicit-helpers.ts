// Test problems defined locally (the catalogue in problems/ is written separately).
import type { Problem } from '../src/core/types.js';

/**
 * Robertson chemical kinetics, Hairer & Wanner, Solving ODEs II, sec. IV.1, eq. (1.3):
 * y1' = -0.04 y1 + 1e4 y2 y3, y2' = 0.04 y1 - 1e4 y2 y3 - 3e7 y2^2, y3' = 3e7 y2^2.
 */
export function robertson(tEnd: number, withJacobian = true): Problem {
  const p: Problem = {
    id: 'robertson-local',
    title: 'Robertson',
    source: 'Hairer & Wanner, Solving ODEs II, sec. IV.1',
    dimension: 3,
    t0: 0,
    tEnd,
    y0: [1, 0, 0],
    f(_t, y, dy) {
      const a = 0.04 * y[0]!;
      const b = 1e4 * y[1]! * y[2]!;
      const c = 3e7 * y[1]! * y[1]!;
      dy[0] = -a + b;
      dy[1] = a - b - c;
      dy[2] = c;
    },
    stiff: true,
    invariants: [{ name: 'mass', fn: (_t, y) => y[0]! + y[1]! + y[2]! }],
    errorScale: { kind: 'relative', floor: 1e-30 },
    reference: { kind: 'published' },
    checkTimes: [],
    definition: 'robertson',
  };
  if (withJacobian) {
    return {
      ...p,
      jacobian(_t, y, j) {
        j[0] = -0.04; j[1] = 1e4 * y[2]!; j[2] = 1e4 * y[1]!;
        j[3] = 0.04; j[4] = -1e4 * y[2]! - 6e7 * y[1]!; j[5] = -1e4 * y[1]!;
        j[6] = 0; j[7] = 6e7 * y[1]!; j[8] = 0;
      },
    };
  }
  return p;
}

/** Van der Pol y1' = y2, y2' = mu (1 - y1^2) y2 - y1; with t = mu*tau it is the Test Set (Mazzia & Magherini) VDPOL form with eps = 1/mu^2. */
export function vanDerPol(mu: number, tEnd: number): Problem {
  return {
    id: 'vdpol-local',
    title: 'van der Pol',
    source: 'Test Set for IVP Solvers, Mazzia & Magherini, problem VDPOL',
    dimension: 2,
    t0: 0,
    tEnd,
    y0: [2, 0],
    f(_t, y, dy) {
      dy[0] = y[1]!;
      dy[1] = mu * (1 - y[0]! * y[0]!) * y[1]! - y[0]!;
    },
    jacobian(_t, y, j) {
      j[0] = 0; j[1] = 1;
      j[2] = -2 * mu * y[0]! * y[1]! - 1; j[3] = mu * (1 - y[0]! * y[0]!);
    },
    stiff: true,
    invariants: [],
    errorScale: { kind: 'relative', floor: 1e-8 },
    reference: { kind: 'published' },
    checkTimes: [],
    definition: 'vdpol',
  };
}

/** Robertson at t = 1e11, Test Set for IVP Solvers (Mazzia & Magherini), problem ROBER. */
export const ROBER_1E11 = [0.2083340149701255e-7, 0.8333360770334713e-13, 0.9999999791665050];
/** Robertson at t = 40, Hairer & Wanner, Solving ODEs II, sec. IV.1 (Table 1.1 / text). */
export const ROBER_40 = [0.7158270687, 0.9185534764e-5, 0.2841637457];
/** Van der Pol mu = 1000 at t = 2000, Test Set for IVP Solvers (VDPOL, eps = 1e-6 form rescaled). */
export const VDPOL_2000 = [1.706167732170469, -0.8928097010248125e-3];

export function maxRelErr(y: ArrayLike<number>, ref: readonly number[]): number {
  let m = 0;
  for (let i = 0; i < ref.length; i++) m = Math.max(m, Math.abs(y[i]! - ref[i]!) / Math.abs(ref[i]!));
  return m;
}
