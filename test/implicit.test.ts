// Implicit integrators on problems with published or analytic solutions: Robertson (t = 40 and
// t = 1e11), stiff van der Pol, observed order of the fixed-step methods, conservation of the
// linear invariant, SolveOptions semantics and exact counts.
import { beforeAll, describe, expect, test } from 'vitest';
import { robertson } from '../problems/robertson.js';
import type { Method, Problem, SolveResult } from '../src/core/types.js';
import { InputError } from '../src/core/errors.js';
import { implicitMethods } from '../src/methods/implicit/index.js';
import { backwardEuler } from '../src/methods/implicit/backward-euler.js';
import { implicitMidpoint } from '../src/methods/implicit/implicit-midpoint.js';
import { radauIIA5 } from '../src/methods/implicit/radau-iia-5.js';
import { bdfVariable } from '../src/methods/implicit/bdf-variable.js';
import { trBdf2, trBdf2Tolerances } from '../src/methods/implicit/tr-bdf2.js';
import { maxRelErr, robertson as localRobertson, ROBER_1E11, ROBER_40, vanDerPol, VDPOL_2000 } from './implicit-helpers.js';

const adaptive = implicitMethods.filter((m) => m.adaptive);
// atol 1e-20 is far below every component at t = 1e11 (y2 = 8.3e-14), so the control is relative.
const ROBER_SETTING = { rtol: 1e-8, atol: 1e-20 };

interface Run { res: SolveResult; y40: number[]; maxMassDrift: number; observed: number; tObserved: number[] }

function runRobertson(m: Method, p: Problem = robertson): Run {
  let y40: number[] = [];
  let maxMassDrift = 0;
  let observed = 0;
  const tObserved: number[] = [];
  const res = m.solve(p, ROBER_SETTING, {
    maxSteps: 200000,
    checkTimes: [40],
    observer: (t, y) => {
      observed++;
      if (tObserved.length < 3 || t === 40) tObserved.push(t);
      if (t === 40) y40 = Array.from(y);
      maxMassDrift = Math.max(maxMassDrift, Math.abs(y[0]! + y[1]! + y[2]! - 1));
    },
  });
  return { res, y40, maxMassDrift, observed, tObserved };
}

const runs = new Map<string, Run>();
beforeAll(() => {
  for (const m of adaptive) runs.set(m.id, runRobertson(m));
});

describe.each(adaptive.map((m) => [m.id]))('%s on Robertson, rtol 1e-8', (id) => {
  test('reaches tEnd exactly with status ok, lands on t = 40', () => {
    const r = runs.get(id)!;
    expect(r.res.status).toBe('ok');
    expect(r.res.tFinal).toBe(1e11);
    expect(r.tObserved[0]).toBe(0);
    expect(r.tObserved).toContain(40);
    // observer at t0 and after each accepted step
    expect(r.observed).toBe(r.res.counts.accepted + 1);
  });
  test('relative error per component below 1e-6 at t = 1e11 (Test Set ROBER) and 1e-6 at t = 40 (HW II sec. IV.1)', () => {
    const r = runs.get(id)!;
    expect(maxRelErr(r.res.yFinal, ROBER_1E11)).toBeLessThan(1e-6);
    // The t = 40 values are published to 10 digits.
    expect(maxRelErr(r.y40, ROBER_40)).toBeLessThan(1e-6);
  });
  test('linear invariant y1 + y2 + y3 = 1 held to 1e-12 over the whole run', () => {
    expect(runs.get(id)!.maxMassDrift).toBeLessThan(1e-12);
  });
});

describe('efficiency targets on Robertson at rtol 1e-8', () => {
  test.each([['radau-iia-5'], ['bdf-variable']])('%s needs fewer than 4000 f evaluations', (id) => {
    const c = runs.get(id)!.res.counts;
    expect(c.nfev).toBeLessThan(4000);
    expect(c.njev).toBeGreaterThan(0);
    expect(c.nlu).toBeGreaterThan(0);
  });
});

describe('trapezoidal-bdf2 tolerance map', () => {
  test('rel. error at t = 1e11 below 1e-6 at rtol 1e-8 against the Test Set ROBER values', () => {
    // Reference: Mazzia and Magherini, Test Set for IVP Solvers, problem ROBER (ROBER_1E11).
    // Before the map this run ended 2.9e-6 off (global error 0.63 rtol^(2/3)).
    const r = runs.get('trapezoidal-bdf2')!;
    expect(r.res.status).toBe('ok');
    expect(maxRelErr(r.res.yFinal, ROBER_1E11)).toBeLessThan(1e-6);
  });
  test('global error at t = 1e11 proportional to rtol: one decade of rtol gives one of error (1e-6 to 1e-8)', () => {
    // The map's purpose (header of tr-bdf2.ts); without it the ratio was 10^(2/3) per decade.
    // Reference values: Test Set ROBER. The band 10^(1 +- 0.15) per decade is common practice, no source.
    const e8 = maxRelErr(runs.get('trapezoidal-bdf2')!.res.yFinal, ROBER_1E11);
    const r6 = trBdf2.solve(robertson, { rtol: 1e-6, atol: 1e-18 }, { maxSteps: 200000, checkTimes: [40] });
    expect(r6.status).toBe('ok');
    const perDecade = Math.log10(maxRelErr(r6.yFinal, ROBER_1E11) / e8) / 2;
    expect(perDecade).toBeGreaterThan(0.85);
    expect(perDecade).toBeLessThan(1.15);
  });
  test('the map: unchanged at rtol >= 1e-3, rtol^(3/2) scaling below, floored at 10 eps / 0.03, atol keeps its ratio', () => {
    // Values follow from the rule stated in the method's header (no outside source).
    const at = (rtol: number, atol = 0) => trBdf2Tolerances({ rtol, atol: Float64Array.of(atol) });
    expect(at(1e-2).rtol).toBe(1e-2);
    expect(at(1e-3).rtol).toBeCloseTo(1e-3, 15);
    expect(at(1e-9).rtol / 1e-12).toBeCloseTo(1, 12);
    const m = at(1e-8, 1e-20);
    expect(m.atol[0]! / m.rtol).toBeCloseTo(1e-12, 24);
    const floor = (10 * 2.220446049250313e-16) / 0.03;
    expect(at(1e-11).rtol).toBe(floor);
    // A request already below the floor is never loosened.
    expect(at(1e-14).rtol).toBe(1e-14);
  });
});

describe('counts are exact and deterministic', () => {
  test('a second run gives identical counts and state', () => {
    for (const m of adaptive) {
      const a = runs.get(m.id)!.res;
      const b = runRobertson(m).res;
      expect(b.counts).toEqual(a.counts);
      expect(Array.from(b.yFinal)).toEqual(Array.from(a.yFinal));
    }
  });
  test('without an analytic Jacobian, nfev grows by n per Jacobian (finite differences)', () => {
    for (const m of [radauIIA5, bdfVariable]) {
      const p = localRobertson(40, false);
      const r = m.solve(p, ROBER_SETTING, { maxSteps: 100000 });
      expect(r.status).toBe('ok');
      expect(maxRelErr(r.yFinal, ROBER_40)).toBeLessThan(1e-6);
      // Count f calls independently of the solver's bookkeeping.
      let calls = 0;
      const counted = { ...p, f: (t: number, y: Float64Array, dy: Float64Array) => { calls++; p.f(t, y, dy); } };
      const r2 = m.solve(counted, ROBER_SETTING, { maxSteps: 100000 });
      expect(r2.counts.nfev).toBe(calls);
      expect(r2.counts.njev).toBeGreaterThan(0);
    }
  });
  test('nfev equals the number of f calls for every adaptive method', () => {
    for (const m of adaptive) {
      let calls = 0;
      const p = { ...robertson, tEnd: 100, checkTimes: [], f: (t: number, y: Float64Array, dy: Float64Array) => { calls++; robertson.f(t, y, dy); } };
      const r = m.solve(p, ROBER_SETTING, { maxSteps: 100000 });
      expect(r.counts.nfev).toBe(calls);
    }
  });
});

describe('van der Pol mu = 1000 at t = 2000 (Test Set VDPOL in the unscaled time)', () => {
  test.each([['radau-iia-5'], ['bdf-variable']])('%s at rtol 1e-8', (id) => {
    const m = implicitMethods.find((x) => x.id === id)!;
    const r = m.solve(vanDerPol(1000, 2000), { rtol: 1e-8, atol: 1e-10 }, { maxSteps: 100000 });
    expect(r.status).toBe('ok');
    // Relaxation oscillations amplify local errors near the fast transitions; 1e-4 relative is
    // common practice for this problem at this tolerance (no source).
    expect(maxRelErr(r.yFinal, VDPOL_2000)).toBeLessThan(1e-4);
  });
});

/** y' = -y + cos t ... linear test with exact solution: y' = A y, A = [[0, 1], [-1, 0]] -> rotation. */
const oscillator: Problem = {
  ...localRobertson(1),
  id: 'oscillator', dimension: 2, y0: [1, 0], t0: 0, tEnd: 2, invariants: [],
  f: (_t, y, dy) => { dy[0] = y[1]!; dy[1] = -y[0]!; },
  jacobian: (_t, _y, j) => { j[0] = 0; j[1] = 1; j[2] = -1; j[3] = 0; },
};

describe('observed order of the fixed-step methods (exact solution cos t, -sin t)', () => {
  test.each([[backwardEuler, 1], [implicitMidpoint, 2]] as const)('%s', (m, order) => {
    const errs: number[] = [];
    for (const steps of [50, 100, 200, 400]) {
      const r = m.solve(oscillator, { steps }, { maxSteps: 10000 });
      expect(r.status).toBe('ok');
      expect(r.h).toBe(2 / steps);
      expect(r.tFinal).toBe(2);
      expect(r.counts.accepted).toBe(steps);
      errs.push(Math.hypot(r.yFinal[0]! - Math.cos(2), r.yFinal[1]! + Math.sin(2)));
    }
    for (let i = 1; i < errs.length; i++) {
      const slope = Math.log2(errs[i - 1]! / errs[i]!);
      expect(Math.abs(slope - order)).toBeLessThan(0.2);
    }
  });
  test('implicit midpoint preserves the quadratic invariant y1^2 + y2^2 (symmetric, Gauss; GNI sec. IV.2)', () => {
    const r = implicitMidpoint.solve(oscillator, { steps: 37 }, { maxSteps: 100 });
    expect(Math.abs(r.yFinal[0]! ** 2 + r.yFinal[1]! ** 2 - 1)).toBeLessThan(1e-13);
  });
});

describe('SolveOptions semantics', () => {
  test('check times are landed on exactly, never stepped past', () => {
    for (const m of adaptive) {
      const times: number[] = [];
      const p = { ...robertson, tEnd: 100 };
      const r = m.solve(p, ROBER_SETTING, { maxSteps: 100000, checkTimes: [0.5, 3, 40], observer: (t) => times.push(t) });
      expect(r.status).toBe('ok');
      for (const c of [0.5, 3, 40, 100]) expect(times).toContain(c);
      for (let i = 1; i < times.length; i++) expect(times[i]!).toBeGreaterThan(times[i - 1]!);
    }
  });
  test('maxSteps gives step-limit with accepted + rejected = maxSteps', () => {
    for (const m of adaptive) {
      const r = m.solve(robertson, ROBER_SETTING, { maxSteps: 25 });
      expect(r.status).toBe('step-limit');
      expect(r.counts.accepted + r.counts.rejected).toBe(25);
      expect(r.tFinal).toBeLessThan(1e11);
    }
    expect(backwardEuler.solve(oscillator, { steps: 100 }, { maxSteps: 10 }).status).toBe('step-limit');
  });
  test('a passed deadline gives timeout', () => {
    for (const m of implicitMethods) {
      const setting = m.adaptive ? ROBER_SETTING : { steps: 10 };
      const p = m.adaptive ? robertson : oscillator;
      expect(m.solve(p, setting, { maxSteps: 1000, deadline: performance.now() - 1 }).status).toBe('timeout');
    }
  });
  test('finite-time blow-up y\' = y^2, y(0) = 1 (exact 1/(1-t)) ends diverged or step-underflow, never ok', () => {
    const blow: Problem = { ...oscillator, dimension: 1, y0: [1], tEnd: 2, f: (_t, y, dy) => { dy[0] = y[0]! * y[0]!; }, jacobian: (_t, y, j) => { j[0] = 2 * y[0]!; } };
    for (const m of adaptive) {
      const r = m.solve(blow, { rtol: 1e-6, atol: 1e-6 }, { maxSteps: 100000 });
      // An implicit method may step across the pole onto the other branch, so only the status is pinned.
      expect(['diverged', 'step-underflow', 'step-limit']).toContain(r.status);
      expect(r.message).toBeTruthy();
    }
  });
  test('bad settings throw InputError', () => {
    expect(() => radauIIA5.solve(robertson, { steps: 10 }, { maxSteps: 10 })).toThrow(InputError);
    expect(() => radauIIA5.solve(robertson, { rtol: -1, atol: 1 }, { maxSteps: 10 })).toThrow(InputError);
    expect(() => radauIIA5.solve(robertson, { rtol: 1e-6, atol: [1, 2] }, { maxSteps: 10 })).toThrow(InputError);
    expect(() => backwardEuler.solve(oscillator, { rtol: 1e-6, atol: 1 }, { maxSteps: 10 })).toThrow(InputError);
    expect(() => backwardEuler.solve(oscillator, { steps: 0 }, { maxSteps: 10 })).toThrow(InputError);
  });
});
