// The odex adapter against an analytic solution and against odex's own counters.
import { describe, expect, test } from 'vitest';
import { createRequire } from 'node:module';
import type { Problem } from '../src/core/types.js';
import { InputError } from '../src/core/errors.js';
import { odexMethod } from '../src/methods/external/odex.js';
import { externalMethods } from '../src/methods/external/index.js';

const require = createRequire(import.meta.url);
const { Solver } = require('odex') as { Solver: new (n: number) => any };

/** Harmonic oscillator q' = p, p' = -q, q(0) = 1, p(0) = 0: exact q = cos t, p = -sin t. */
const oscillator: Problem = {
  id: 'osc', title: 'oscillator', source: 'analytic', dimension: 2, t0: 0, tEnd: 10, y0: [1, 0],
  f: (_t, y, dy) => { dy[0] = y[1]!; dy[1] = -y[0]!; },
  stiff: false, invariants: [], errorScale: { kind: 'absolute' }, reference: { kind: 'exact' }, checkTimes: [], definition: 'osc',
};

describe('odex adapter', () => {
  test('is registered as an external adaptive method', () => {
    expect(externalMethods.map((m) => m.id)).toEqual(['odex']);
    expect(odexMethod.family).toBe('external');
    expect(odexMethod.adaptive).toBe(true);
  });

  test('matches cos t, -sin t at t = 10 to 1e-9 at tol 1e-11', () => {
    const r = odexMethod.solve(oscillator, { rtol: 1e-11, atol: 1e-11 }, { maxSteps: 10000 });
    expect(r.status).toBe('ok');
    expect(r.tFinal).toBe(10);
    expect(Math.abs(r.yFinal[0]! - Math.cos(10))).toBeLessThan(1e-9);
    expect(Math.abs(r.yFinal[1]! + Math.sin(10))).toBeLessThan(1e-9);
  });

  test('counts equal those odex reports when called directly', () => {
    const s = new Solver(2);
    s.relativeTolerance = 1e-8;
    s.absoluteTolerance = 1e-8;
    s.initialStepSize = 1e-4;
    const direct = s.solve((_x: number, y: number[]) => [y[1], -y[0]], 0, [1, 0], 10);
    const r = odexMethod.solve(oscillator, { rtol: 1e-8, atol: 1e-8 }, { maxSteps: 10000, initialStep: 1e-4 });
    expect(r.counts).toEqual({ nfev: direct.nEval, njev: 0, nlu: 0, accepted: direct.nAccept, rejected: direct.nReject });
    expect(Array.from(r.yFinal)).toEqual(direct.y);
  });

  test('lands exactly on check times, observes t0 and every accepted step', () => {
    const times: number[] = [];
    const r = odexMethod.solve(oscillator, { rtol: 1e-9, atol: 1e-9 }, {
      maxSteps: 10000, checkTimes: [1, 2.5, 7], observer: (t, y) => {
        times.push(t);
        if (t === 2.5) expect(Math.abs(y[0]! - Math.cos(2.5))).toBeLessThan(1e-7);
      },
    });
    expect(r.status).toBe('ok');
    expect(times[0]).toBe(0);
    for (const c of [1, 2.5, 7, 10]) expect(times).toContain(c);
    expect(times.length).toBe(r.counts.accepted + 1);
    for (let i = 1; i < times.length; i++) expect(times[i]!).toBeGreaterThan(times[i - 1]!);
  });

  test('step limit, deadline and bad settings', () => {
    const lim = odexMethod.solve(oscillator, { rtol: 1e-12, atol: 1e-12 }, { maxSteps: 3 });
    expect(lim.status).toBe('step-limit');
    expect(lim.tFinal).toBeLessThan(10);
    expect(odexMethod.solve(oscillator, { rtol: 1e-8, atol: 1e-8 }, { maxSteps: 1000, deadline: performance.now() - 1 }).status).toBe('timeout');
    expect(() => odexMethod.solve(oscillator, { steps: 10 }, { maxSteps: 10 })).toThrow(InputError);
  });
});
