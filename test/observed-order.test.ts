// Observed order only from the asymptotic range: successive local orders that agree, on errors
// the reference resolves and below saturation; otherwise "not in the asymptotic range".
import { describe, expect, it } from 'vitest';
import { findMethod } from '../src/methods/registry.js';
import { measureRun } from '../src/measure/run-one.js';
import { observedOrder } from '../src/results/observed-order.js';
import { resolvedError } from '../src/results/contract.js';
import { harmonicOscillator } from '../problems/harmonic-oscillator.js';
import { keplerEccentric } from '../problems/kepler-eccentric.js';
import type { Problem } from '../src/core/types.js';

function ladder(problem: Problem, methodId: string): { h: number; error: number }[] {
  const m = findMethod(methodId)!;
  const out: { h: number; error: number }[] = [];
  for (const steps of problem.defaultSteps!) {
    const r = measureRun(problem, m, { steps }, { maxSteps: 1e7 });
    const e = resolvedError(r, 'final');
    if (e !== null) out.push({ h: (problem.tEnd - problem.t0) / steps, error: e });
  }
  return out;
}

describe('observed order', () => {
  it('rk4 on the harmonic oscillator: 4.00 +- 0.05 (classical order 4; Kutta 1901)', () => {
    const o = observedOrder(ladder(harmonicOscillator, 'rk4'));
    expect(o.order).not.toBeNull();
    expect(Math.abs(o.order! - 4)).toBeLessThanOrEqual(0.05);
  });

  it('Euler on kepler-eccentric: no number (the orbit is lost at every step count of the ladder)', () => {
    const o = observedOrder(ladder(keplerEccentric, 'euler'));
    expect(o.order).toBeNull();
    if (o.order === null) expect(o.reason).toMatch(/^not in the asymptotic range/);
  });

  it('an exact power law gives its exponent; disagreeing local orders give none (hand-made data)', () => {
    const clean = [1e-1, 5e-2, 2.5e-2, 1.25e-2].map((h) => ({ h, error: 3 * h ** 2 }));
    expect(observedOrder(clean).order).toBeCloseTo(2, 12);
    // Local orders 2, then 4: not asymptotic.
    const bent = [{ h: 0.1, error: 1e-2 }, { h: 0.05, error: 2.5e-3 }, { h: 0.025, error: 1.5625e-4 }];
    expect(observedOrder(bent).order).toBeNull();
    // Saturated errors (>= 0.1) are not used.
    expect(observedOrder([0.4, 0.2, 0.1].map((h) => ({ h, error: 5 * h }))).order).toBeNull();
  });
});
