// The written-out Rosenbrock attempt (src/methods/implicit/rosenbrock-kernel.ts) against the
// engine's loops (rosenbrock.ts), which it replaces on small dense systems: same operations in
// the same order, so every count and every bit of the final state must agree. The loops are the
// reference here; their own accuracy is checked against published values in implicit.test.ts.
import { describe, expect, test } from 'vitest';
import { catalogue } from '../problems/index.js';
import type { Method, Problem, SolveResult } from '../src/core/types.js';
import { solveAdaptive } from '../src/methods/implicit/common.js';
import type { RosenbrockData } from '../src/methods/implicit/rosenbrock-data.js';
import { rosenbrockStepper } from '../src/methods/implicit/rosenbrock.js';
import { ROSENBROCK_UNROLL_MAX_N, rosenbrockSource } from '../src/methods/implicit/rosenbrock-kernel.js';
import { RODAS4 } from '../src/methods/implicit/rodas4.js';
import { ROS4_L_STABLE } from '../src/methods/implicit/ros4-l-stable.js';

function solveWith(data: RosenbrockData, writtenOut: boolean, p: Problem, rtol: number): SolveResult {
  const factory = rosenbrockStepper(data, 'under-test', writtenOut);
  const atol = rtol * (typeof p.atolScale === 'number' ? p.atolScale : 1);
  return solveAdaptive(p, { rtol, atol }, { maxSteps: 20_000 }, 'under-test', 4, factory);
}

const small = catalogue.filter((p) => p.dimension <= ROSENBROCK_UNROLL_MAX_N && !p.jacobianBand);

function expectSameRuns(data: RosenbrockData, problems: readonly Problem[], rtols: readonly number[]): void {
  for (const p of problems) {
    for (const rtol of rtols) {
      const a = solveWith(data, true, p, rtol);
      const b = solveWith(data, false, p, rtol);
      expect(a.status, `${p.id} rtol ${rtol}`).toBe(b.status);
      expect(a.counts, `${p.id} rtol ${rtol}`).toEqual(b.counts);
      expect(a.tFinal).toBe(b.tFinal);
      // Bitwise: Object.is tells -0 from 0, and NaN equals NaN.
      for (let i = 0; i < p.dimension; i++) expect(Object.is(a.yFinal[i], b.yFinal[i]), `${p.id} rtol ${rtol} y[${i}]`).toBe(true);
    }
  }
}

describe('written-out Rosenbrock attempts', () => {
  test('RODAS4: the same counts and final states, bit for bit, as the loops on every small catalogue problem', () => {
    expect(small.length).toBeGreaterThan(5);
    expectSameRuns(RODAS4, small, [1e-3, 1e-6]);
  });

  test('ROS4 (L-stable set, a stage reusing the previous evaluation, a combined error estimate): the same', () => {
    expectSameRuns(ROS4_L_STABLE, small, [1e-3, 1e-6]);
  });

  test('the generated source is straight-line code (no loops) for each size up to the limit', () => {
    for (let n = 1; n <= ROSENBROCK_UNROLL_MAX_N; n++) expect(rosenbrockSource(RODAS4, 'rodas4', n)).not.toMatch(/\bfor\s*\(/);
    expect(() => rosenbrockSource(RODAS4, 'rodas4', ROSENBROCK_UNROLL_MAX_N + 1)).toThrow(/written-out/);
  });
});
