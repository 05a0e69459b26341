// How a parallel sweep deals its runs to workers: whole methods, costliest first, each in plan
// order, idle lanes taking the back half of another lane's claim
// (property tests; the invariants are the definition of the schedule, common practice, no source).
import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import { methodGroups, RunDealer } from '../src/sweep/dealer.js';
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

/** Deals every run, the lanes still asking taking turns in the order `turns` gives. */
function dealAll(runs: readonly PlannedRun[], lanes: number, turns: readonly number[]): { lane: number; run: PlannedRun }[] {
  const dealer = new RunDealer(runs, lanes);
  const open = new Set(Array.from({ length: lanes }, (_, i) => i));
  const dealt: { lane: number; run: PlannedRun }[] = [];
  for (let k = 0; open.size > 0; k++) {
    const asking = [...open];
    const lane = asking[(turns.length ? turns[k % turns.length]! : k) % asking.length]!;
    const run = dealer.next(lane);
    if (run) dealt.push({ lane, run });
    else open.delete(lane);
  }
  return dealt;
}

describe('methodGroups', () => {
  it('holds every run exactly once, a group per method, costliest first, problems contiguous, plan order within', () => {
    fc.assert(
      fc.property(plannedArb, (runs) => {
        const groups = methodGroups(runs);
        const seen = groups.flatMap((g) => g.runs.map((r) => r.planIndex)).sort((a, b) => a - b);
        expect(seen).toEqual(runs.map((r) => r.planIndex));
        expect(new Set(groups.map((g) => g.method)).size).toBe(groups.length);
        for (let i = 1; i < groups.length; i++) expect(groups[i - 1]!.cost).toBeGreaterThanOrEqual(groups[i]!.cost);
        for (const g of groups) {
          for (const r of g.runs) expect(r.method).toBe(g.method);
          expect(g.cost).toBeCloseTo(g.runs.reduce((s, r) => s + r.expectedCost, 0), 6);
          // A problem's runs sit together, problems in order of first appearance, runs in plan order.
          const order = g.runs.map((r) => r.problem).filter((p, i, a) => i === 0 || a[i - 1] !== p);
          expect(new Set(order).size).toBe(order.length);
          const firstIndex = (p: string) => Math.min(...g.runs.filter((r) => r.problem === p).map((r) => r.planIndex));
          for (let i = 1; i < order.length; i++) expect(firstIndex(order[i - 1]!)).toBeLessThan(firstIndex(order[i]!));
          for (let i = 1; i < g.runs.length; i++) {
            if (g.runs[i]!.problem === g.runs[i - 1]!.problem) expect(g.runs[i - 1]!.planIndex).toBeLessThan(g.runs[i]!.planIndex);
          }
        }
        const again = methodGroups([...runs].reverse());
        expect(again.map((g) => g.runs.map((r) => r.planIndex))).toEqual(groups.map((g) => g.runs.map((r) => r.planIndex)));
      }),
    );
  });
});

describe('RunDealer', () => {
  it('deals every run exactly once whatever order the lanes ask in', () => {
    fc.assert(
      fc.property(plannedArb, fc.integer({ min: 1, max: 4 }), fc.array(fc.nat({ max: 7 }), { maxLength: 30 }), (runs, lanes, turns) => {
        const dealt = dealAll(runs, lanes, turns);
        expect(dealt.map((d) => d.run.planIndex).sort((a, b) => a - b)).toEqual(runs.map((r) => r.planIndex));
      }),
    );
  });

  it('gives one lane a whole method while other methods are left to claim', () => {
    const runs: PlannedRun[] = ['m1', 'm1', 'm1', 'm2', 'm2', 'm3'].map((method, planIndex) => ({
      problem: 'a',
      method,
      setting: { steps: planIndex + 1 },
      planIndex,
      expectedCost: 10 - planIndex,
    }));
    const dealt = dealAll(runs, 2, [0, 1]);
    const lanesOf = (m: string) => new Set(dealt.filter((d) => d.run.method === m).map((d) => d.lane));
    expect(lanesOf('m1').size).toBe(1);
    expect(lanesOf('m2').size).toBe(1);
    expect([...lanesOf('m1')]).not.toEqual([...lanesOf('m2')]);
  });

  it('splits a single method over idle lanes, the idle lane taking the back half', () => {
    const runs: PlannedRun[] = Array.from({ length: 8 }, (_, planIndex) => ({
      problem: 'a',
      method: 'm1',
      setting: { rtol: 10 ** -(planIndex + 3) },
      planIndex,
      expectedCost: planIndex + 1,
    }));
    const dealer = new RunDealer(runs, 2);
    // Lane 0 claims the group (plan order: 0, 1, ..., 7); lane 1 then takes the back half (the
    // smaller, when odd) of the seven lane 0 has left.
    expect(dealer.next(0)!.planIndex).toBe(0);
    expect([dealer.next(1), dealer.next(1), dealer.next(1)].map((r) => r!.planIndex)).toEqual([5, 6, 7]);
    expect(dealer.next(0)!.planIndex).toBe(1);
    // Lane 1 has run dry: of lane 0's remaining 2, 3, 4 it takes the last, then of 2, 3 the 3.
    expect(dealer.next(1)!.planIndex).toBe(4);
    expect(dealer.next(1)!.planIndex).toBe(3);
    expect(dealer.next(0)!.planIndex).toBe(2);
    expect(dealer.next(0)).toBeUndefined();
    expect(dealer.next(1)).toBeUndefined();
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

describe('RunDealer batches', () => {
  // Batches: a lane takes up to `max` runs of its claim at once, and its worker may hand back the
  // ones it did not start (executeOnPool). The invariant is the schedule's definition (common
  // practice, no source): every run is finished exactly once, whatever is handed back.
  it('finishes every run exactly once when lanes take batches and hand back unstarted runs', () => {
    fc.assert(
      fc.property(
        plannedArb,
        fc.integer({ min: 1, max: 3 }),
        fc.array(fc.record({ lane: fc.nat({ max: 2 }), max: fc.integer({ min: 1, max: 5 }), started: fc.nat({ max: 5 }) }), { maxLength: 60 }),
        (runs, lanes, script) => {
          const dealer = new RunDealer(runs, lanes);
          const finished: number[] = [];
          const open = new Set(Array.from({ length: lanes }, (_, i) => i));
          for (let k = 0; open.size > 0; k++) {
            const step = script.length ? script[k % script.length]! : { lane: k, max: 2, started: 1 };
            const lane = [...open][step.lane % open.size]!;
            const batch = dealer.take(lane, step.max);
            if (batch.length === 0) {
              open.delete(lane);
              continue;
            }
            expect(batch.length).toBeLessThanOrEqual(step.max);
            // A worker always starts the first run of a batch.
            const started = Math.max(1, Math.min(batch.length, step.started));
            finished.push(...batch.slice(0, started).map((r) => r.planIndex));
            dealer.giveBack(lane, batch.slice(started));
          }
          expect(finished.sort((a, b) => a - b)).toEqual(runs.map((r) => r.planIndex));
        },
      ),
    );
  });

  it('keeps a batch within one claim and hands back to the front of it', () => {
    const runs: PlannedRun[] = ['m1', 'm1', 'm1', 'm1', 'm2', 'm2'].map((method, planIndex) => ({
      problem: 'a',
      method,
      setting: { steps: planIndex + 1 },
      planIndex,
      expectedCost: 10 - planIndex,
    }));
    const dealer = new RunDealer(runs, 1);
    // m1 is the costlier method, claimed first; a batch of 8 stops at the end of its claim.
    expect(dealer.take(0, 8).map((r) => r.planIndex)).toEqual([0, 1, 2, 3]);
    dealer.giveBack(0, [runs[2]!, runs[3]!]);
    expect(dealer.take(0, 1).map((r) => r.planIndex)).toEqual([2]);
    expect(dealer.take(0, 8).map((r) => r.planIndex)).toEqual([3]);
    expect(dealer.take(0, 8).map((r) => r.planIndex)).toEqual([4, 5]);
    expect(dealer.take(0, 8)).toEqual([]);
  });

  it('lets an idle lane steal runs another lane handed back', () => {
    const runs: PlannedRun[] = Array.from({ length: 6 }, (_, planIndex) => ({
      problem: 'a',
      method: 'm1',
      setting: { steps: planIndex + 1 },
      planIndex,
      expectedCost: 1,
    }));
    const dealer = new RunDealer(runs, 2);
    const batch = dealer.take(0, 6);
    expect(batch.map((r) => r.planIndex)).toEqual([0, 1, 2, 3, 4, 5]);
    dealer.giveBack(0, batch.slice(1));
    // Lane 1 has nothing of its own: it takes the back half of the five handed back.
    expect(dealer.take(1, 6).map((r) => r.planIndex)).toEqual([4, 5]);
    expect(dealer.take(0, 6).map((r) => r.planIndex)).toEqual([1, 2, 3]);
  });
});
