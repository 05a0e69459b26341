// brusselator-1d (Hairer and Wanner II, sec. IV.10): the right-hand side against the Brusselator's
// fixed point, and the certified reference (radau-iia-5 and bdf-variable at 1e-12) against a
// third method that took no part in certifying it. The equations and data (A = 1, B = 3,
// alpha = 1/50, u = 1 and v = 3 at both ends, u(x, 0) = 1 + sin(2 pi x), v(x, 0) = 3) are written
// in the problem from memory of that section; a public method-of-lines example collection (the
// MatMol group's Brusselator example, 2016) states the same problem with the same values.
import { describe, expect, it } from 'vitest';
import { findMethod } from '../src/methods/registry.js';
import { findProblem } from '../problems/index.js';

const p = findProblem('brusselator-1d')!;

describe('brusselator-1d', () => {
  it('f vanishes at the uniform state u = A = 1, v = B / A = 3, the Brusselator fixed point (boundary values alike)', () => {
    const y = new Float64Array(p.dimension);
    for (let i = 0; i < p.dimension; i += 2) {
      y[i] = 1;
      y[i + 1] = 3;
    }
    const dy = new Float64Array(p.dimension);
    p.f(0, y, dy);
    for (const v of dy) expect(v).toBe(0);
  });
  it('hairer-wanner-rodas4 at rtol 1e-9 ends within 1e-6 of the stored reference (certified to 8 digits)', () => {
    const r = findMethod('hairer-wanner-rodas4')!.solve(p, { rtol: 1e-9, atol: 1e-9 }, { maxSteps: 100_000, checkTimes: [] });
    expect(r.status).toBe('ok');
    const ref = p.reference.points!.at(-1)!.y;
    let worst = 0;
    for (let i = 0; i < p.dimension; i++) worst = Math.max(worst, Math.abs(r.yFinal[i]! - ref[i]!));
    expect(worst).toBeLessThan(1e-6);
  });
});
