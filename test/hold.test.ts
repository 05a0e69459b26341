// Zero- and first-order-hold discretisations against mathjs's matrix exponential (an outside
// implementation) on inputs they hold exactly, and their order on a smooth input against the
// catalogue's exact linear-oscillator-chain.
import { describe, expect, it } from 'vitest';
import { expm, matrix, multiply } from 'mathjs';
import type { Problem } from '../src/core/types.js';
import { uniformProblem } from '../src/problems/uniform.js';
import { findMethod } from '../src/methods/registry.js';
import { findProblem } from '../problems/index.js';
import { measureRun } from '../src/measure/run-one.js';
import { pairingGap } from '../src/sweep/plan.js';

const A = [[0, 1], [-4, -0.4]];
const B = [[0], [1]];

function linearProblem(input: (t: number) => number): Problem {
  const a = Float64Array.from(A.flat());
  const b = Float64Array.from(B.flat());
  return uniformProblem({
    id: 'damped-spring', title: 'damped spring', source: 'test', dimension: 2, t0: 0, tEnd: 3, y0: [1, 0],
    f: (t, y, dy) => {
      const u = input(t);
      dy[0] = y[1]!;
      dy[1] = -4 * y[0]! - 0.4 * y[1]! + u;
    },
    stiff: false, invariants: [], errorScale: { kind: 'absolute' }, reference: { kind: 'certified', points: [] }, checkTimes: [],
    linear: { A: a, B: b, inputs: 1, input: (t, out) => void (out[0] = input(t)) },
    definition: 'test',
  });
}

/** x(3) from mathjs: expm of the system augmented with u and its slope (constant or ramp inputs). */
function mathjsFinal(u0: number, slope: number): number[] {
  const M = [
    [0, 1, 0, 0],
    [-4, -0.4, 1, 0],
    [0, 0, 0, 1],
    [0, 0, 0, 0],
  ].map((row) => row.map((v) => v * 3));
  const z = multiply(expm(matrix(M)), matrix([1, 0, u0, slope])).toArray() as number[];
  return z.slice(0, 2);
}

describe('hold discretisations', () => {
  it('zero-order hold is exact for a constant input at any step (mathjs expm)', () => {
    const p = linearProblem(() => 0.7);
    const want = mathjsFinal(0.7, 0);
    for (const steps of [1, 7, 30]) {
      const r = findMethod('zero-order-hold')!.solve(p, { steps }, { maxSteps: 1e6 });
      expect(r.status).toBe('ok');
      expect(r.counts).toEqual({ nfev: 0, njev: 0, nlu: 0, accepted: steps, rejected: 0 });
      for (let i = 0; i < 2; i++) expect(Math.abs(r.yFinal[i]! - want[i]!)).toBeLessThan(1e-13);
    }
  });

  it('first-order hold is exact for a ramp input; zero-order hold is not (mathjs expm)', () => {
    const p = linearProblem((t) => 0.2 + 0.5 * t);
    const want = mathjsFinal(0.2, 0.5);
    const foh = findMethod('first-order-hold')!.solve(p, { steps: 5 }, { maxSteps: 1e6 });
    for (let i = 0; i < 2; i++) expect(Math.abs(foh.yFinal[i]! - want[i]!)).toBeLessThan(1e-13);
    const zoh = findMethod('zero-order-hold')!.solve(p, { steps: 5 }, { maxSteps: 1e6 });
    expect(Math.abs(zoh.yFinal[0]! - want[0]!)).toBeGreaterThan(1e-3);
  });

  it('on a sinusoidal input: zero-order hold converges at order 1, first-order hold at order 2 (exact reference)', () => {
    const p = findProblem('linear-oscillator-chain')!;
    const err = (id: string, steps: number) => measureRun(p, findMethod(id)!, { steps }, { maxSteps: 1e6 }).error.final!;
    const zoh = Math.log2(err('zero-order-hold', 400) / err('zero-order-hold', 800));
    const foh = Math.log2(err('first-order-hold', 400) / err('first-order-hold', 800));
    expect(zoh).toBeGreaterThan(0.9);
    expect(zoh).toBeLessThan(1.1);
    expect(foh).toBeGreaterThan(1.9);
    expect(foh).toBeLessThan(2.1);
    // Beside rk4 at the same rate: rk4 integrates the true input, so it wins at fine steps.
    expect(err('rk4', 800)).toBeLessThan(err('first-order-hold', 800));
  });

  it('pairs only with linear problems', () => {
    expect(pairingGap(findProblem('kepler-circular')!, findMethod('zero-order-hold')!)).toMatch(/needs a linear problem/);
    expect(pairingGap(findProblem('linear-oscillator-chain')!, findMethod('first-order-hold')!)).toBeNull();
  });
});
