// Fixed rates: choose answers with the lowest rate (Hz) that meets a position target on the J2
// orbit, checked by rerunning that rate and the next lower one against the certified reference.
import { describe, expect, it } from 'vitest';
import { useTempCache } from './helpers/temp-cache.js';
import { findProblem } from '../problems/index.js';
import { findMethod } from '../src/methods/registry.js';
import { measureRun } from '../src/measure/run-one.js';
import { withCertifiedReference } from '../src/measure/certify.js';
import { chooseMethod } from '../src/sweep/choose.js';
import { fixedCandidates, stepCost } from '../src/sweep/fixed-rates.js';

useTempCache('sg-rates-');

/** Length of the position error at the end against the certified reference. */
function positionError(y: readonly number[], ref: readonly number[]): number {
  return Math.hypot(y[0]! - ref[0]!, y[1]! - ref[1]!, y[2]! - ref[2]!);
}

describe('fixed rates', () => {
  it('leo-j2, 100 m target: rk4 at the lowest listed rate that meets it, and the next lower rate does not', async () => {
    const p = withCertifiedReference(findProblem('leo-j2')!);
    const rk4 = findMethod('rk4')!;
    const rates = [0.0025, 0.005, 0.01, 0.02, 0.05, 0.1];
    const list = fixedCandidates(p, { rates });
    expect(list.map((c) => c.steps)).toEqual([216, 432, 864, 1728, 4320, 8640]);
    const choice = await chooseMethod(p, [rk4], {
      target: 100, measure: 'position', cost: 'nfev', timing: { budgetSeconds: 0.01, minSamples: 1 }, maxSteps: 1e6, fixedCandidates: list,
    });
    const rec = choice.recommended!;
    expect(rec).not.toBeNull();
    const rate = rec.rateHz!;
    expect(rates).toContain(rate);
    const ref = p.reference.points!.at(-1)!.y;
    const at = (r: number) => positionError(measureRun(p, rk4, { steps: Math.round(86400 * r) }, { maxSteps: 1e6 }).yFinal, ref);
    expect(at(rate)).toBeLessThanOrEqual(100);
    const lower = rates[rates.indexOf(rate) - 1];
    expect(lower).toBeDefined();
    expect(at(lower!)).toBeGreaterThan(100);
    // Classical RK4 takes four stages per step (Kutta 1901), every step.
    expect(rec.stepCost!.worstNfev).toBe(4);
    expect(rec.stepCost!.meanNfev).toBe(4);
  });

  it('an implicit method\'s worst step costs more than its mean (Newton iterations vary)', () => {
    const p = findProblem('van-der-pol')!;
    const c = stepCost(p, findMethod('implicit-midpoint')!, { steps: 200 }, 1e6)!;
    expect(c.worstNfev).toBeGreaterThan(c.meanNfev);
  });

  it('refuses a rate that does not divide the span into whole steps, naming the flag', () => {
    const p = findProblem('leo-j2')!;
    expect(() => fixedCandidates(p, { rates: [0.007] })).toThrow(/--rates|whole steps/);
    expect(fixedCandidates(p, { stepSizes: [60] })).toEqual([{ steps: 1440, h: 60, rateHz: null }]);
  });
});

describe('catalogue problems with a certified reference', () => {
  it('are certified when resolved, so a sweep or choose measures their error', async () => {
    const { resolveProblems } = await import('../src/sweep/resolve.js');
    const { items } = await resolveProblems('leo-j2,kepler-circular');
    const leo = items.find((p) => p.id === 'leo-j2')!;
    expect(leo.reference.kind).toBe('certified');
    expect(leo.reference.points!.at(-1)!.t).toBe(86400);
    expect(leo.reference.digits!).toBeGreaterThanOrEqual(8);
    const run = measureRun(leo, findMethod('rk4')!, { steps: 5760 }, { maxSteps: 1e6 });
    expect(run.error.final).not.toBeNull();
    expect(run.orbitError!.final!.position).toBeGreaterThan(0);
    expect(items.find((p) => p.id === 'kepler-circular')!.reference.kind).toBe('exact');
  });
});
