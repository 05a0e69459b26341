// Small reference problems for the explicit-method tests, each with its analytic solution.
import type { Problem, Rhs } from '../src/core/types.js';

export function makeProblem(p: {
  id: string;
  y0: number[];
  t0?: number;
  tEnd: number;
  f: Rhs;
  exact?: (t: number, out: Float64Array) => void;
  separable?: { positions: number[]; velocities: number[]; secondOrder?: boolean };
}): Problem {
  const base = {
    id: p.id,
    title: p.id,
    source: 'test problem defined in the test file',
    dimension: p.y0.length,
    t0: p.t0 ?? 0,
    tEnd: p.tEnd,
    y0: p.y0,
    f: p.f,
    stiff: false,
    invariants: [],
    errorScale: { kind: 'absolute' as const },
    reference: p.exact ? { kind: 'exact' as const, exact: p.exact } : { kind: 'exact' as const },
    checkTimes: [],
    definition: p.id,
  };
  return p.separable ? { ...base, separable: p.separable } : base;
}

const W = 2 * Math.PI;

/** q' = p, p' = -w^2 q, w = 2 pi, q(0) = 1, p(0) = 0: q = cos(wt), p = -w sin(wt). */
export function oscillator(tEnd = 20): Problem {
  return makeProblem({
    id: 'harmonic-oscillator',
    y0: [1, 0],
    tEnd,
    f: (_t, y, dy) => {
      dy[0] = y[1]!;
      dy[1] = -W * W * y[0]!;
    },
    exact: (t, out) => {
      out[0] = Math.cos(W * t);
      out[1] = -W * Math.sin(W * t);
    },
    separable: { positions: [0], velocities: [1], secondOrder: true },
  });
}

export function oscillatorEnergy(y: ArrayLike<number>): number {
  return 0.5 * (y[1]! * y[1]! + W * W * y[0]! * y[0]!);
}

/** y' = -y, y(0) = 1: y = exp(-t). */
export function decay(tEnd = 1): Problem {
  return makeProblem({
    id: 'decay',
    y0: [1],
    tEnd,
    f: (_t, y, dy) => {
      dy[0] = -y[0]!;
    },
    exact: (t, out) => {
      out[0] = Math.exp(-t);
    },
  });
}

/** Planar Kepler problem, mu = 1, a = 1, eccentricity e; period 2 pi. State x, y, vx, vy. */
export function kepler(e: number, tEnd: number): Problem {
  return makeProblem({
    id: 'kepler',
    y0: [1 - e, 0, 0, Math.sqrt((1 + e) / (1 - e))],
    tEnd,
    f: (_t, y, dy) => {
      const x = y[0]!;
      const z = y[1]!;
      const r2 = x * x + z * z;
      const r3 = r2 * Math.sqrt(r2);
      dy[0] = y[2]!;
      dy[1] = y[3]!;
      dy[2] = -x / r3;
      dy[3] = -z / r3;
    },
    separable: { positions: [0, 1], velocities: [2, 3], secondOrder: true },
  });
}

export function maxAbsDiff(a: ArrayLike<number>, b: ArrayLike<number>): number {
  let m = 0;
  for (let i = 0; i < a.length; i++) m = Math.max(m, Math.abs(a[i]! - b[i]!));
  return m;
}

export function exactAt(p: Problem, t: number): Float64Array {
  const out = new Float64Array(p.dimension);
  p.reference.exact!(t, out);
  return out;
}

/**
 * First same as last, read off the coefficients as HNW I sec. II.5 defines it: the last stage
 * is evaluated at (t + h, y_new), i.e. its row of A equals b, its node is 1 and its weight 0.
 */
export function firstSameAsLast(d: { a: readonly (readonly number[])[]; b: readonly number[]; c: readonly number[] }): boolean {
  const s = d.c.length;
  const last = d.a[s - 1]!;
  return s > 1 && d.c[s - 1] === 1 && d.b[s - 1] === 0 && d.b.slice(0, s - 1).every((bj, j) => Math.abs((last[j] ?? 0) - bj) <= 1e-15 * Math.max(1, Math.abs(bj)));
}

/**
 * A tolerance a pair reaches in a test-sized number of steps: a first-order error estimate takes
 * about tol^-1/2 steps (780,000 for heun-euler-21 on a Kepler orbit at 1e-10), so such pairs run
 * no tighter than 1e-6 (common practice, no source).
 */
export function reachableTolerance(m: { embeddedOrder?: number }, tol: number): number {
  return (m.embeddedOrder ?? 1) >= 2 ? tol : Math.max(tol, 1e-6);
}
