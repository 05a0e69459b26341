// Interpolants with extra stages, against outside checks: Verner's (verner-76, verner-87,
// verner-98: J. H. Verner, Numer. Algorithms 53 (2010) 383-396, orders 7, 8 and 9 with 6, 8 and 10
// extra stages) and DOP853's (dormand-prince-853: E. Hairer and G. Wanner's continuous extension,
// HNW I sec. II.6, order 7 with 4 extra stages here); the local solution of y' = y cos t through
// each step's start, y0 exp(sin t - sin t0) (exact by substitution), whose interpolation error must
// fall like h^(q+1) for an interpolant of order q; the harmonic oscillator's q = cos(2 pi t),
// p = -2 pi sin(2 pi t); and the work they cost, counted apart from the steps' (which stay those of
// a plain solve).
import { describe, expect, it } from 'vitest';
import { findProblem } from '../problems/index.js';
import { explicitTableaus, type DenseMethod } from '../src/methods/explicit/index.js';
import { findMethod } from '../src/methods/registry.js';
import { measureRun } from '../src/measure/run-one.js';
import { watchRun } from '../src/measure/observer.js';
import { validateResults } from '../src/results/read.js';
import type { ResultsFile } from '../src/results/contract.js';
import { makeProblem } from './methods-explicit-helpers.js';

const withExtraStages = explicitTableaus.flatMap((m) =>
  m.denseOutput?.form === 'extra-stages' ? [[m.id, findMethod(m.id) as unknown as DenseMethod, m.denseOutput.order, m.denseOutput.c.length] as const] : [],
);
const expSin = makeProblem({ id: 'exp-sin', y0: [1], tEnd: 10, f: (t, y, dy) => void (dy[0] = y[0]! * Math.cos(t)) });
const oscillator = findProblem('harmonic-oscillator')!;
const LOOSE = { rtol: 1, atol: 1 };

/** Largest local interpolation error at theta over the steps of a solve with every step bounded to h. */
function localError(m: DenseMethod, h: number, theta: number): number {
  let worst = 0;
  const out = new Float64Array(1);
  const r = m.dense.solve(expSin, LOOSE, { maxSteps: 1e6, maxStep: h }, (tOld, tNew, evaluate) => {
    evaluate(tOld, out);
    const y0 = out[0]!;
    const t = tOld + theta * (tNew - tOld);
    evaluate(t, out);
    worst = Math.max(worst, Math.abs(out[0]! - y0 * Math.exp(Math.sin(t) - Math.sin(tOld))));
  });
  expect(r.status).toBe('ok');
  return worst;
}

describe.each(withExtraStages)('%s interpolant', (id, m, order, extra) => {
  it(`has a local error falling like h^${order + 1} between its steps (order ${order})`, () => {
    // Steps bounded to h0, h0/2, h0/4, larger for the higher order, so that every error stays
    // above the rounding floor the weight coefficients leave (1e-14 to 1e-13 here). Measured
    // slopes: verner-76 8.01, 7.96; verner-87 8.70, 8.88; verner-98 10.30, 10.46;
    // dormand-prince-853 8.10, 8.04 (theta 1/2).
    const h0 = order >= 8 ? 0.8 : 0.4;
    for (const theta of [0.5, 0.3]) {
      const e = [h0, h0 / 2, h0 / 4].map((h) => localError(m, h, theta));
      for (const x of e) expect(x).toBeGreaterThan(1e-14);
      for (let k = 1; k < e.length; k++) {
        const slope = Math.log2(e[k - 1]! / e[k]!);
        expect(slope, `theta ${theta}, h ${h0 / 2 ** k}`).toBeGreaterThan(order + 1 - 0.4);
        expect(slope, `theta ${theta}, h ${h0 / 2 ** k}`).toBeLessThan(order + 1 + 0.8);
      }
    }
  });

  it(`error.dense on the oscillator falls like h^${order} with the step, as the steps' own error does`, () => {
    // Steps bounded to h (a loose tolerance, so the bound sets them), as for dormand-prince-54 in
    // test/dense-accuracy.test.ts: the midpoint error is the global error of order p of the steps
    // plus the interpolant's local h^(q+1), q = p here. Measured slopes: verner-76 7.24, 7.09;
    // verner-87 7.91, 8.03; verner-98 10.07, 9.44 (its order-10 terms still count at these steps).
    // dormand-prince-853 (p = 8, q = 7: both terms of order h^8) 7.97, 7.79.
    const hs = order >= 8 ? [0.2, 0.1, 0.05] : [0.1, 0.05, 0.025];
    const figures = hs.map((h) => {
      const watch = watchRun(oscillator, true);
      const r = m.dense.solve(oscillator, LOOSE, { maxSteps: 1e6, maxStep: h, observer: watch.observer }, watch.denseStep);
      expect(r.status).toBe('ok');
      return { dense: watch.dense()!.value, along: watch.along()!.value };
    });
    for (const f of figures) expect(f.dense).toBeLessThan(1.2 * f.along);
    for (let k = 1; k < figures.length; k++) {
      const slope = Math.log2(figures[k - 1]!.dense / figures[k]!.dense);
      expect(slope).toBeGreaterThan(order - 0.3);
      expect(slope).toBeLessThan(order + 1.2);
    }
  });

  it("gives the step's own end states at theta = 0 and 1, and tends to them from inside", () => {
    const a = new Float64Array(2);
    const b = new Float64Array(2);
    let worstNear = 0;
    let steps = 0;
    const r = m.dense.solve(oscillator, { rtol: 1e-8, atol: 1e-8 }, { maxSteps: 1e6, observer: () => {} }, (tOld, tNew, evaluate) => {
      steps++;
      const h = tNew - tOld;
      evaluate(tOld, a);
      evaluate(tOld + 1e-9 * h, b);
      worstNear = Math.max(worstNear, Math.abs(a[0]! - b[0]!), Math.abs(a[1]! - b[1]!) / (2 * Math.PI));
      evaluate(tNew, a);
      evaluate(tNew - 1e-9 * h, b);
      worstNear = Math.max(worstNear, Math.abs(a[0]! - b[0]!), Math.abs(a[1]! - b[1]!) / (2 * Math.PI));
    });
    expect(steps).toBe(r.counts.accepted);
    // 1e-9 of a step moves the state by about 1e-9 h |y'| (h <= 0.1 here): the polynomial meets
    // both ends to that and to the rounding of its weights.
    expect(worstNear).toBeLessThan(1e-9);
    const end = new Float64Array(2);
    r.evaluate(r.lastStep!.tNew, end);
    expect(Array.from(end)).toEqual(Array.from(r.yFinal));
  });

  it(`costs ${extra} evaluations in each step where a value between steps is asked for, and none otherwise`, () => {
    const setting = { rtol: 1e-9, atol: 1e-9 };
    const plain = m.solve(oscillator, setting, { maxSteps: 1e6 });
    const none = m.dense.solve(oscillator, setting, { maxSteps: 1e6 }, () => {});
    expect(none.counts).toEqual(plain.counts);
    expect(none.denseEvaluations).toBe(0);
    let asked = 0;
    const out = new Float64Array(2);
    const some = m.dense.solve(oscillator, setting, { maxSteps: 1e6 }, (tOld, tNew, evaluate) => {
      if (asked++ % 3 !== 0) return;
      evaluate(tOld + 0.25 * (tNew - tOld), out);
      evaluate(tOld + 0.75 * (tNew - tOld), out);
    });
    expect(some.counts).toEqual(plain.counts);
    expect(some.denseEvaluations).toBe(extra * Math.ceil(plain.counts.accepted / 3));
  });

  it('measured runs: error.dense from it, its evaluations in denseEvaluations, the counts those of a plain solve', () => {
    const setting = { rtol: 1e-9, atol: 1e-9 };
    const run = measureRun(oscillator, m as never, setting, { maxSteps: 1e6 });
    expect(run.counts).toEqual(m.solve(oscillator, setting, { maxSteps: 1e6 }).counts);
    expect(run.denseInterpolant).toContain(`${id}'s own continuous extension`);
    // The oscillator's reference is exact, so every accepted step's midpoint is asked for.
    expect(run.denseEvaluations).toBe(extra * run.counts.accepted);
    // Interpolated values are about as good as the steps (the global error dominates).
    expect(run.error.dense!).toBeLessThan(10 * run.error.max!);
    const file: ResultsFile = {
      format: 'stepgauge-results',
      version: 1,
      createdAt: '2026-01-01T00:00:00.000Z',
      environment: { node: 'v20', platform: 'linux', arch: 'x64', cpu: 'x', stepgauge: '0' },
      runs: [run],
      problems: [],
    };
    expect(validateResults(JSON.parse(JSON.stringify(file)), 'results.json').runs[0]!.denseEvaluations).toBe(run.denseEvaluations);
    const bad = JSON.parse(JSON.stringify(file));
    bad.runs[0].denseEvaluations = 1.5;
    expect(() => validateResults(bad, 'results.json')).toThrow(/runs\[0\]\.denseEvaluations/);
  });
});

describe('events located on an interpolant with extra stages', () => {
  it('eclipse-circular-orbit with verner-87 at rtol 1e-5: every entry and exit found, none extra (analytic shadow times)', () => {
    // Entry and exit are located in different steps of the same orbit; locating one must not
    // change what the other's sign test reads at the step's end (the root search reuses the
    // state buffer). Reference: the cylindrical shadow's analytic times (problems/eclipse-circular-orbit.ts).
    const eclipse = findProblem('eclipse-circular-orbit')!;
    const run = measureRun(eclipse, findMethod('verner-87')!, { rtol: 1e-5, atol: 1e-5 }, { maxSteps: 1e6 });
    for (const name of ['eclipse-entry', 'eclipse-exit']) {
      const e = run.events![name]!;
      expect(e.reference!.length).toBeGreaterThan(1);
      expect([e.missed, e.extra]).toEqual([0, 0]);
      expect(e.locatedBy).toContain("Verner's");
    }
    expect(run.eventEvaluations).toBe(0);
  });
});
