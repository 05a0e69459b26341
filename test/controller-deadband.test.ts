// The deadband controller (--controller deadband): the standard controller, except that an accepted
// step with 0.5 <= err <= 1 keeps its size. Checked against the rule's definition, against the
// analytic solutions of the oscillator and of Kepler's eccentric orbit, and for its wiring into
// the explicit pairs, the Runge-Kutta-Nystrom pairs, the CLI and the request record.
import { describe, expect, it } from 'vitest';
import type { Method, Problem } from '../src/core/types.js';
import { DEADBAND_LOW, FAC_MAX, SAFETY, deadbandFactor, standardFactor } from '../src/methods/explicit/control.js';
import { findMethod } from '../src/methods/registry.js';
import { requestFromRecord } from '../src/sweep/request-record.js';
import { keplerEccentric } from '../problems/kepler-eccentric.js';
import { exactAt, maxAbsDiff, oscillator } from './methods-explicit-helpers.js';

const OPTS = { maxSteps: 1_000_000 };
const method = (id: string): Method => findMethod(id)!;

/** Accepted step sizes, from the observer's times (the last step may be shortened to land on tEnd). */
function acceptedSteps(m: Method, p: Problem, rtol: number, controller: 'standard' | 'deadband'): number[] {
  const ts: number[] = [];
  const r = m.solve(p, { rtol, atol: rtol }, { ...OPTS, controller, observer: (t) => ts.push(t) });
  expect(r.status).toBe('ok');
  return ts.slice(1, -1).map((t, i) => t - ts[i]!);
}

/** Share of consecutive accepted steps of the same size (to the rounding of t). */
function heldShare(h: readonly number[]): number {
  let held = 0;
  for (let i = 1; i < h.length; i++) if (Math.abs(h[i]! / h[i - 1]! - 1) < 1e-9) held++;
  return held / (h.length - 1);
}

describe('the deadband factor', () => {
  it('is 1 on 0.5 <= err <= 1 and the standard factor elsewhere', () => {
    // The rule as Boost.Odeint's default step adjuster states it (controlled_runge_kutta.hpp,
    // Boost 1.74): no change while 0.5 <= err <= 1.
    for (const err of [0.5, 0.6, 0.75, 0.999, 1]) expect(deadbandFactor(err, 5, FAC_MAX)).toBe(1);
    for (const err of [1e-12, 1e-3, 0.1, 0.4999]) expect(deadbandFactor(err, 5, FAC_MAX)).toBe(standardFactor(err, 5, FAC_MAX));
    // Just below the band the standard factor is safety * 0.5^(-1/5), so a step that changes
    // grows by at least 3.4% (HNW I, sec. II.4, eq. (4.13) with q = 4).
    expect(deadbandFactor(0.4999, 5, FAC_MAX)).toBeGreaterThan(SAFETY * 2 ** 0.2 - 1e-12);
    // The band's lower edge is Boost's 0.5 (same header).
    expect(DEADBAND_LOW).toBe(0.5);
    expect(deadbandFactor(1e-30, 5, FAC_MAX)).toBe(FAC_MAX);
    expect(deadbandFactor(0.5, 5, 1)).toBe(1);
  });
});

describe('dormand-prince-54 with the deadband controller', () => {
  const dp54 = method('dormand-prince-54');

  it('holds the step on most steps where the standard controller never does, on the oscillator', () => {
    const p = oscillator(20);
    const held = heldShare(acceptedSteps(dp54, p, 1e-8, 'deadband'));
    const standard = heldShare(acceptedSteps(dp54, p, 1e-8, 'standard'));
    // The standard factor 0.9 err^(-1/5) is 1 only at err = 0.59 exactly: no held steps.
    expect(standard).toBe(0);
    expect(held).toBeGreaterThan(0.5);
  });

  it('meets the tolerance on the oscillator (exact: cos, sin) as the standard controller does', () => {
    const p = oscillator(20);
    for (const rtol of [1e-6, 1e-8, 1e-10]) {
      const rd = dp54.solve(p, { rtol, atol: rtol }, { ...OPTS, controller: 'deadband' });
      const rs = dp54.solve(p, { rtol, atol: rtol }, OPTS);
      const ed = maxAbsDiff(rd.yFinal, exactAt(p, 20));
      const es = maxAbsDiff(rs.yFinal, exactAt(p, 20));
      // Same bound as the standard controller's test (1000 tol: common practice, no source), and
      // within a factor 3 of the standard controller's own error (a hold keeps err <= 1).
      expect(ed).toBeLessThan(1e3 * rtol);
      expect(ed).toBeLessThan(3 * es);
      expect(rd.counts.accepted).not.toBe(rs.counts.accepted);
    }
  });

  it('meets the target on Kepler e = 0.9 over 10 periods (reference: Kepler\'s equation)', () => {
    // Final error of the standard controller at this rtol is about 1e-8 (bench/README, compiled peers).
    const p = keplerEccentric;
    const setting = { rtol: 6.55e-13, atol: 6.55e-13 };
    const ref = new Float64Array(p.dimension);
    p.reference.exact!(p.tEnd, ref);
    const rd = dp54.solve(p, setting, { ...OPTS, controller: 'deadband' });
    const rs = dp54.solve(p, setting, OPTS);
    expect(rd.status).toBe('ok');
    const ed = maxAbsDiff(rd.yFinal, ref);
    const es = maxAbsDiff(rs.yFinal, ref);
    expect(ed).toBeLessThan(2 * es);
    expect(es).toBeLessThan(2 * ed);
    // Holding lets err creep past 1 now and then: some rejected steps, few more evaluations.
    expect(rd.counts.rejected).toBeGreaterThan(rs.counts.rejected);
    expect(rd.counts.nfev).toBeLessThan(1.1 * rs.counts.nfev);
  });
});

describe('wiring', () => {
  it('the Runge-Kutta-Nystrom pairs use it too', () => {
    const p = oscillator(20);
    const m = method('dormand-el-mikkawy-prince-rkn86');
    const rd = m.solve(p, { rtol: 1e-9, atol: 1e-9 }, { ...OPTS, controller: 'deadband' });
    const rs = m.solve(p, { rtol: 1e-9, atol: 1e-9 }, OPTS);
    expect(rd.counts.accepted).not.toBe(rs.counts.accepted);
    expect(maxAbsDiff(rd.yFinal, exactAt(p, 20))).toBeLessThan(1e3 * 1e-9);
  });

  it('an unknown controller is an input error naming the field', () => {
    const dp54 = method('dormand-prince-54');
    expect(() => dp54.solve(oscillator(1), { rtol: 1e-6, atol: 1e-6 }, { ...OPTS, controller: 'fuzzy' as 'pi' })).toThrow(/options\.controller.*standard, pi, deadband/);
  });

  it('a saved request with it reads back', () => {
    expect(requestFromRecord({ controller: 'deadband' }, 'results.json').controller).toBe('deadband');
  });
});
