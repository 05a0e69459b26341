// A bracketing root finder: the Illinois variant of regula falsi (Dowell and Jarratt, BIT 11
// (1971) 168-174). Each step keeps a sign change; when the same end is kept twice, its function
// value is halved, which restores superlinear convergence. It never leaves the bracket.

/** Most iterations; Illinois converges in far fewer on smooth functions (order about 1.44). */
const MAX_ITERATIONS = 100;

/**
 * A root of g in [a, b] given g(a) = ga and g(b) = gb of opposite signs (or one of them zero),
 * to within `tol` in t. g is called at most MAX_ITERATIONS times.
 */
export function illinoisRoot(g: (t: number) => number, a: number, ga: number, b: number, gb: number, tol: number): number {
  if (ga === 0) return a;
  if (gb === 0) return b;
  let side = 0;
  for (let k = 0; k < MAX_ITERATIONS && Math.abs(b - a) > tol; k++) {
    const c = (a * gb - b * ga) / (gb - ga);
    const gc = g(c);
    if (gc === 0) return c;
    if ((gc < 0) === (gb < 0)) {
      // c replaces b; a is kept.
      b = c;
      gb = gc;
      if (side === -1) ga /= 2;
      side = -1;
    } else {
      a = c;
      ga = gc;
      if (side === 1) gb /= 2;
      side = 1;
    }
  }
  return Math.abs(ga) < Math.abs(gb) ? a : b;
}
