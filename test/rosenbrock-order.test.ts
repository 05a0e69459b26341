// Observed order of the Rosenbrock methods: equal steps (initialStep = maxStep = h, tolerances
// so loose that every attempt is accepted) on problems with exact solutions, the error at the end
// against h. Order 4 for both (HW II sec. IV.7: RODAS4 and the ROS4 sets are of order 4), so
// halving h divides the error by about 16.
import { describe, expect, test } from 'vitest';
import type { Method, Problem } from '../src/core/types.js';
import { rodas4 } from '../src/methods/implicit/rodas4.js';
import { ros4LStable } from '../src/methods/implicit/ros4-l-stable.js';

// y' = -y^2, y(0) = 1: y = 1 / (1 + t) (separation of variables).
const riccati: Problem = {
  id: 'riccati', dimension: 1, y0: [1], t0: 0, tEnd: 2, invariants: [],
  f: (_t, y, dy) => { dy[0] = -y[0]! * y[0]!; },
  jacobian: (_t, y, j) => { j[0] = -2 * y[0]!; },
};
// Prothero and Robinson's test equation y' = lambda (y - cos t) - sin t, y(0) = 1: y = cos t for
// every lambda (A. Prothero, A. Robinson, Math. Comp. 28 (1974) 145-162); non-autonomous, so the
// df/dt term of the stages is exercised. lambda = -1 keeps it non-stiff, where the classical
// order shows.
const protheroRobinson: Problem = {
  id: 'prothero-robinson', dimension: 1, y0: [1], t0: 0, tEnd: 2, invariants: [],
  f: (t, y, dy) => { dy[0] = -(y[0]! - Math.cos(t)) - Math.sin(t); },
  jacobian: (_t, _y, j) => { j[0] = -1; },
};
const exact: Record<string, (t: number) => number> = { riccati: (t) => 1 / (1 + t), 'prothero-robinson': Math.cos };

function slopes(m: Method, p: Problem): number[] {
  const errs: number[] = [];
  for (const steps of [10, 20, 40, 80]) {
    const h = (p.tEnd - p.t0) / steps;
    const r = m.solve(p, { rtol: 0.5, atol: 1e3 }, { maxSteps: 10_000, initialStep: h, maxStep: h });
    expect(r.status).toBe('ok');
    expect(r.counts.accepted).toBe(steps);
    expect(r.counts.rejected).toBe(0);
    errs.push(Math.abs(r.yFinal[0]! - exact[p.id]!(p.tEnd)));
  }
  return errs.slice(1).map((e, i) => Math.log2(errs[i]! / e));
}

describe.each([[rodas4.id, rodas4], [ros4LStable.id, ros4LStable]] as const)('%s observed order', (_id, m) => {
  test.each([[riccati.id, riccati], [protheroRobinson.id, protheroRobinson]] as const)('4 within 0.3 on %s', (_pid, p) => {
    for (const s of slopes(m, p)) expect(Math.abs(s - 4)).toBeLessThan(0.3);
  });
});
