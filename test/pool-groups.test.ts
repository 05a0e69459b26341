// How a parallel sweep deals its runs to workers: whole (problem, method) groups, costliest first
// (property tests; the invariants are the definition of the schedule, common practice, no source).
import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import { affinityGroups } from '../src/sweep/pool.js';
import type { PlannedRun } from '../src/sweep/plan.js';

const plannedArb = fc
  .array(
    fc.record({
      problem: fc.constantFrom('a', 'b', 'c'),
      method: fc.constantFrom('m1', 'm2'),
      // Whole numbers, so a group's cost sums exactly in any order.
      expectedCost: fc.integer({ min: 0, max: 1_000_000 }),
    }),
    { maxLength: 80 },
  )
  .map((rows) => rows.map((r, planIndex): PlannedRun => ({ ...r, setting: { steps: planIndex + 1 }, planIndex })));

describe('affinityGroups', () => {
  it('holds every run exactly once, each group a single (problem, method)', () => {
    fc.assert(
      fc.property(plannedArb, (runs) => {
        const groups = affinityGroups(runs);
        const seen = groups.flatMap((g) => g.runs.map((r) => r.planIndex)).sort((a, b) => a - b);
        expect(seen).toEqual(runs.map((r) => r.planIndex));
        for (const g of groups) expect(new Set(g.runs.map((r) => `${r.problem}/${r.method}`)).size).toBe(1);
        expect(new Set(groups.map((g) => `${g.runs[0]!.problem}/${g.runs[0]!.method}`)).size).toBe(groups.length);
      }),
    );
  });

  it('orders groups and the runs inside them costliest first, and the same input the same way', () => {
    fc.assert(
      fc.property(plannedArb, (runs) => {
        const groups = affinityGroups(runs);
        for (let i = 1; i < groups.length; i++) expect(groups[i - 1]!.cost).toBeGreaterThanOrEqual(groups[i]!.cost);
        for (const g of groups) {
          for (let i = 1; i < g.runs.length; i++) expect(g.runs[i - 1]!.expectedCost).toBeGreaterThanOrEqual(g.runs[i]!.expectedCost);
          expect(g.cost).toBeCloseTo(g.runs.reduce((s, r) => s + r.expectedCost, 0), 6);
        }
        const again = affinityGroups([...runs].reverse());
        expect(again.map((g) => g.runs.map((r) => r.planIndex))).toEqual(groups.map((g) => g.runs.map((r) => r.planIndex)));
      }),
    );
  });
});

describe('planned cost of a method that maps its tolerance', () => {
  it('grows like rtol^(-1/2) for trapezoidal-bdf2 and rtol^(-1/(p+1)) without stepGrowth', async () => {
    // Exponents: per-step control of order p gives h ~ tol^(1/(p+1)) (Hairer, Norsett & Wanner I,
    // sec. II.4); the map rtol' ~ rtol^(3/2) of tr-bdf2.ts turns p = 2 into rtol^(-1/2).
    const { planSweep } = await import('../src/sweep/plan.js');
    const { findMethod } = await import('../src/methods/registry.js');
    const { findProblem } = await import('../problems/index.js');
    const problem = findProblem('harmonic-oscillator')!;
    const cost = (id: string, rtol: number) =>
      planSweep({ problems: [problem], methods: [findMethod(id)!], tolerances: [rtol], methodsNamed: true }).runs[0]!.expectedCost;
    expect(Math.log10(cost('trapezoidal-bdf2', 1e-8) / cost('trapezoidal-bdf2', 1e-6)) / 2).toBeCloseTo(0.5, 12);
    expect(Math.log10(cost('dormand-prince-54', 1e-8) / cost('dormand-prince-54', 1e-6)) / 2).toBeCloseTo(1 / 6, 12);
  });
});
