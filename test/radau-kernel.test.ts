// The written-out Newton iteration of radau-iia-5 (src/methods/implicit/radau-kernel.ts) against
// the stepper's loops, which it replaces on small dense systems: same operations in the same
// order, so every count and every bit of the final state must agree. The loops are the reference
// here; their own accuracy is checked against published values in implicit.test.ts.
import { describe, expect, test } from 'vitest';
import { catalogue } from '../problems/index.js';
import type { Problem, SolveResult } from '../src/core/types.js';
import { solveAdaptive } from '../src/methods/implicit/common.js';
import { radauRtol, radauStepper } from '../src/methods/implicit/radau-iia-5.js';
import { RADAU_UNROLL_MAX_N, radauIterationSource, radauUpdateSource } from '../src/methods/implicit/radau-kernel.js';
import { vanDerPolStiff } from '../problems/van-der-pol-stiff.js';
import { robertson } from '../problems/robertson.js';

function solveWith(writtenOut: boolean, p: Problem, rtol: number): SolveResult {
  const atolOf = rtol * (typeof p.atolScale === 'number' ? p.atolScale : 1);
  // The method's own tolerance map, so the runs are the catalogue's.
  const map = (t: { rtol: number; atol: Float64Array }) => {
    const r = radauRtol(t.rtol);
    return { rtol: r, atol: t.atol.map((a) => (a * r) / t.rtol) };
  };
  return solveAdaptive(p, { rtol, atol: atolOf }, { maxSteps: 20_000 }, 'under-test', 5, radauStepper(writtenOut), map);
}

function expectSameRuns(problems: readonly Problem[], rtols: readonly number[]): void {
  for (const p of problems) {
    for (const rtol of rtols) {
      const a = solveWith(true, p, rtol);
      const b = solveWith(false, p, rtol);
      expect(a.status, `${p.id} rtol ${rtol}`).toBe(b.status);
      expect(a.counts, `${p.id} rtol ${rtol}`).toEqual(b.counts);
      expect(a.tFinal).toBe(b.tFinal);
      // Bitwise: Object.is tells -0 from 0, and NaN equals NaN.
      for (let i = 0; i < p.dimension; i++) expect(Object.is(a.yFinal[i], b.yFinal[i]), `${p.id} rtol ${rtol} y[${i}]`).toBe(true);
    }
  }
}

const small = catalogue.filter((p) => p.dimension <= RADAU_UNROLL_MAX_N && !p.jacobianBand && !p.jacobianPattern);

describe('written-out Radau IIA Newton iterations', () => {
  test('the same counts and final states, bit for bit, as the loops on every small catalogue problem', () => {
    expect(small.length).toBeGreaterThan(5);
    expectSameRuns(small, [1e-3, 1e-6, 1e-9]);
  });

  test('the same with finite-difference Jacobians', () => {
    // The catalogue's stiff Van der Pol and Robertson with their Jacobians taken away, so both
    // iteration matrices are formed from difference quotients.
    const fd = [vanDerPolStiff, robertson].map(({ jacobian: _dropped, ...rest }) => ({ ...rest, id: `${rest.id}-fd` }) as Problem);
    expect(fd.every((p) => p.jacobian === undefined)).toBe(true);
    expectSameRuns(fd, [1e-4, 1e-7]);
  });

  test('the generated source is straight-line code (no loops) for each size up to the limit', () => {
    for (let n = 1; n <= RADAU_UNROLL_MAX_N; n++) {
      expect(radauIterationSource(n)).not.toMatch(/\bfor\s*\(/);
      expect(radauUpdateSource(n)).not.toMatch(/\bfor\s*\(/);
    }
  });
});
