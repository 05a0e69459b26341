// Observed order of every registered embedded pair, both of its solutions, at equal steps.
// 1. y' = (q+1) t^q on [0, 1], y(1) = 1: a method of order q integrates every polynomial f of
//    degree < q exactly (the bushy-tree conditions sum b_i c_i^(k-1) = 1/k, k <= q), so each step's
//    error is the same constant (q+1) h^(q+1) (sum b_i c_i^q - 1/(q+1)) and the global error is
//    exactly C h^q (HNW I, sec. II.1: the quadrature conditions; derivation by hand). The slope is
//    then q to rounding, however small the optimal pairs make their next-order coefficients.
// 2. A nonlinear problem, y' = y cos t, y = exp(sin t) (exact by substitution): Verner's optimal
//    pairs make the order q+1 error coefficients small on purpose (Numer. Algorithms 53 (2010)
//    383-396), so in the range doubles resolve the error falls faster than h^q (measured: 9.2-10.3
//    for verner-98's two solutions); the check is that it falls at least like h^q.
import { describe, expect, it } from 'vitest';
import { explicitTableaus, fixedStepMethod } from '../src/methods/explicit/index.js';
import { unrolledSource, CALLS_PER_PIECE } from '../src/methods/explicit/kernels/unrolled.js';
import { VERNER_98 } from '../src/methods/explicit/tableaus/verner-98.js';
import type { TableauData } from '../src/methods/explicit/tableau.js';
import { makeProblem } from './methods-explicit-helpers.js';

const OPTS = { maxSteps: 1_000_000 };

/** The tableau with weights w of order q, stepped at equal steps (no error estimate). */
function equalSteps(d: TableauData, w: readonly number[], q: number) {
  return fixedStepMethod({ id: 'pair-weights', name: 'pair weights', source: 'test' }, { a: d.a, b: w, c: d.c, order: q });
}

const solutions = explicitTableaus
  .filter((m) => m.tableau.bHat)
  .flatMap((m) => [
    [`${m.id} (order ${m.tableau.order})`, m.tableau, m.tableau.b, m.tableau.order] as const,
    [`${m.id} embedded (order ${m.tableau.embeddedOrder})`, m.tableau, m.tableau.bHat!, m.tableau.embeddedOrder!] as const,
  ]);

describe('observed order of the pairs on a quadrature problem', () => {
  it.each(solutions)('%s: slope equals the order within 0.02', (_name, d, w, q) => {
    const p = makeProblem({ id: 'power', y0: [0], tEnd: 1, f: (t, _y, dy) => void (dy[0] = (q + 1) * t ** q) });
    const m = equalSteps(d, w, q);
    // Steps 1, 2, 4: the smallest error stays above 1e-12 for every pair (measured 6.7e-11 for
    // verner-98), far from rounding.
    const errors = [1, 2, 4].map((steps) => Math.abs(m.solve(p, { steps }, OPTS).yFinal[0]! - 1));
    for (const e of errors) expect(e).toBeGreaterThan(1e-12);
    expect(Math.abs(Math.log2(errors[0]! / errors[1]!) - q)).toBeLessThan(0.02);
    expect(Math.abs(Math.log2(errors[1]! / errors[2]!) - q)).toBeLessThan(0.02);
  });
});

describe('verner-98 on a nonlinear problem', () => {
  const p = makeProblem({ id: 'exp-sin', y0: [1], tEnd: 10, f: (t, y, dy) => void (dy[0] = y[0]! * Math.cos(t)) });
  const exact = Math.exp(Math.sin(10));
  it.each([
    ['ninth-order solution', VERNER_98.b, 9],
    ['eighth-order solution', VERNER_98.bHat!, 8],
  ] as const)('%s: the error falls at least like h^q while above 1e-13', (_name, w, q) => {
    const m = equalSteps(VERNER_98, w, q);
    const errors = [10, 20, 40].map((steps) => Math.abs(m.solve(p, { steps }, OPTS).yFinal[0]! - exact));
    for (const e of errors) expect(e).toBeGreaterThan(1e-13);
    expect(Math.log2(errors[0]! / errors[1]!)).toBeGreaterThan(q - 0.2);
    expect(Math.log2(errors[1]! / errors[2]!)).toBeGreaterThan(q - 0.2);
  });
});

describe('verner-98 generated kernel', () => {
  it(`makes its 15 evaluations in pieces of at most ${CALLS_PER_PIECE} calls`, () => {
    // 16 stages, not FSAL: stage 1 comes from the engine, stages 2..16 from the kernel.
    const src = unrolledSource(VERNER_98, 'verner-98', 4);
    const pieces = src.split(/\nfunction /).slice(1);
    const calls = pieces.map((body) => (body.match(/\n\s*f\(/g) ?? []).length);
    expect(calls.reduce((a, b) => a + b, 0)).toBe(15);
    for (const c of calls) expect(c).toBeLessThanOrEqual(CALLS_PER_PIECE);
  });
});
