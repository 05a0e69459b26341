// Fixed-step implicit methods refresh the Jacobian and retry before declaring a Newton failure:
// backward Euler on Robertson's kinetics used to "fail" at t = 0 (explicit-Euler start value and
// the start's Jacobian), an implementation failure, not the method's.
import { describe, expect, it } from 'vitest';
import { findMethod } from '../src/methods/registry.js';
import { robertson } from '../problems/robertson.js';

/** Mazzia and Magherini, Test Set for IVP Solvers, ROBER: y at t = 1e11. */
const Y_END = [0.2083340149701255e-7, 0.8333360770334713e-13, 0.9999999791665050];

describe('backward Euler on Robertson (stiff kinetics, t in [0, 1e11])', () => {
  const be = findMethod('backward-euler')!;
  const relErr = (y: Float64Array) => Math.max(...Y_END.map((r, i) => Math.abs(y[i]! - r) / r));

  it('takes every step from t = 0 and converges to the published end state at first order', () => {
    const coarse = be.solve(robertson, { steps: 10_000 }, { maxSteps: 1e7 });
    const fine = be.solve(robertson, { steps: 100_000 }, { maxSteps: 1e7 });
    expect(coarse.status).toBe('ok');
    expect(fine.status).toBe('ok');
    expect(coarse.counts.accepted).toBe(10_000);
    const e1 = relErr(coarse.yFinal);
    const e2 = relErr(fine.yFinal);
    expect(e2).toBeLessThan(2e-4);
    // Backward Euler is first order (HNW II, sec. IV.3): ten times the steps, about a tenth of the error.
    const order = Math.log10(e1 / e2);
    expect(order).toBeGreaterThan(0.9);
    expect(order).toBeLessThan(1.1);
  });

  it('even ten steps of 1e10 succeed, since full Newton from the step start converges', () => {
    const r = be.solve(robertson, { steps: 10 }, { maxSteps: 1e7 });
    expect(r.status).toBe('ok');
    // Mass y1 + y2 + y3 = 1 is kept by backward Euler (linear invariant; HNW II, sec. IV.3).
    expect(Math.abs(r.yFinal[0]! + r.yFinal[1]! + r.yFinal[2]! - 1)).toBeLessThan(1e-12);
  });
});
