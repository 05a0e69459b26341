// Dense-output accuracy (error.dense, issue 28 item 5) and events located on a method's own
// interpolant, against outside checks: the harmonic oscillator's analytic solution
// q = cos(2 pi t), p = -2 pi sin(2 pi t), the published order of Dormand-Prince 5(4)'s continuous
// extension (Shampine 1986, order 4, so an O(h^5) local interpolation error on top of the
// method's O(h^5) global error: Hairer, Norsett and Wanner, Solving ODEs I, sec. II.6), and the
// eclipse orbit's analytic shadow times (problems/eclipse-circular-orbit.ts), located on
// dormand-prince-54's, dormand-prince-853's and bogacki-shampine-32's own interpolants and on
// stepgauge's Hermite for a method without one (fehlberg-45).
import { describe, expect, it } from 'vitest';
import { findProblem } from '../problems/index.js';
import { findMethod } from '../src/methods/registry.js';
import { dormandPrince54 } from '../src/methods/explicit/index.js';
import { measureRun } from '../src/measure/run-one.js';
import { watchRun } from '../src/measure/observer.js';
import { resultsCsv, CSV_COLUMNS } from '../src/results/csv.js';
import { validateResults } from '../src/results/read.js';
import type { ResultsFile } from '../src/results/contract.js';
import type { Problem } from '../src/core/types.js';
import { sectionColumns, tableRows } from '../src/report/table.js';
import { interpolantNotes } from '../src/report/interpolant-notes.js';

const oscillator = findProblem('harmonic-oscillator')!;
const W = 2 * Math.PI;

/** error.dense of dormand-prince-54 with every step bounded to h (a loose tolerance, so the bound sets the steps). */
function denseWithStep(h: number): { dense: number; accepted: number } {
  const watch = watchRun(oscillator, true);
  const r = dormandPrince54.dense.solve(oscillator, { rtol: 1e-2, atol: 1e-2 }, { maxSteps: 1e6, maxStep: h, observer: watch.observer }, watch.denseStep);
  expect(r.status).toBe('ok');
  return { dense: watch.dense()!.value, accepted: r.counts.accepted };
}

/**
 * y' = 5 t^4, y = t^5 on [0, 1]. A method of order 5 integrates a quartic f exactly (its
 * quadrature conditions sum b_i c_i^(k-1) = 1/k hold for k <= 5), so its steps land on t^5 to
 * round-off; an interpolant of order 4 misses the t^4 term of f by a fixed multiple of h^5 in every
 * step (a cubic Hermite would miss by h^4 y''''/384, order 4), so error.dense is the interpolant's own error.
 */
const quartic: Problem = {
  id: 'quartic-quadrature',
  title: "y' = 5 t^4",
  source: 'analytic: y = t^5',
  dimension: 1,
  t0: 0,
  tEnd: 1,
  y0: [0],
  f: (t, _y, dy) => void (dy[0] = 5 * t ** 4),
  stiff: false,
  invariants: [],
  errorScale: { kind: 'absolute' },
  reference: { kind: 'exact', source: 'y = t^5', exact: (t, out) => void (out[0] = t ** 5) },
  checkTimes: [],
};

describe('error.dense', () => {
  it('is the worst error of the method interpolant at step midpoints, as the analytic solution gives it', () => {
    const run = measureRun(oscillator, dormandPrince54, { rtol: 1e-6, atol: 1e-6 }, { maxSteps: 1e6 });
    // Independent: the same steps, the interpolant at each midpoint, against q = cos(wt), p = -w sin(wt).
    let worst = 0;
    const y = new Float64Array(2);
    const plain = dormandPrince54.dense.solve(oscillator, { rtol: 1e-6, atol: 1e-6 }, { maxSteps: 1e6 }, (tOld, tNew, evaluate) => {
      const t = (tOld + tNew) / 2;
      evaluate(t, y);
      worst = Math.max(worst, Math.abs(y[0]! - Math.cos(W * t)), Math.abs(y[1]! + W * Math.sin(W * t)));
    });
    expect(run.error.dense).toBe(worst);
    expect(run.counts).toEqual(plain.counts);
    expect(run.denseInterpolant).toContain('Shampine (1986)');
    expect(run.resolution!.dense).toBeGreaterThan(0);
    expect(run.unresolved ?? []).not.toContain('dense');
    // Measuring takes nothing from the steps: the same counts as a plain solve without observers.
    expect(run.counts).toEqual(dormandPrince54.solve(oscillator, { rtol: 1e-6, atol: 1e-6 }, { maxSteps: 1e6 }).counts);
  });

  it('falls like h^5 with the step (Dormand-Prince 5(4) and its order-4 continuous extension, HNW I sec. II.6)', () => {
    const hs = [0.02, 0.01, 0.005];
    const runs = hs.map(denseWithStep);
    // Equal steps: the bound set every step (20 / h of them, the last one perhaps shorter).
    runs.forEach((r, k) => expect(r.accepted).toBeGreaterThanOrEqual(Math.round(20 / hs[k]!)));
    for (let k = 1; k < runs.length; k++) {
      const order = Math.log2(runs[k - 1]!.dense / runs[k]!.dense);
      expect(order).toBeGreaterThan(4.7);
      expect(order).toBeLessThan(5.3);
    }
  });

  it('isolates the interpolant: exact steps, and an h^5 error between them on a quartic quadrature', () => {
    const errors = [0.1, 0.05, 0.025].map((h) => {
      const watch = watchRun(quartic, true);
      const r = dormandPrince54.dense.solve(quartic, { rtol: 1, atol: 1 }, { maxSteps: 1e6, maxStep: h, observer: watch.observer }, watch.denseStep);
      expect(r.status).toBe('ok');
      expect(watch.along()!.value).toBeLessThan(1e-14); // the steps: exact to round-off
      return watch.dense()!.value;
    });
    expect(errors[0]!).toBeGreaterThan(1e-9);
    // A fixed multiple of h^5 per step (the same in every step, since only f's t^4 term is missed): ratio 2^5.
    expect(errors[0]! / errors[1]!).toBeCloseTo(32, 1);
    expect(errors[1]! / errors[2]!).toBeCloseTo(32, 1);
  });

  it('is absent for methods without their own interpolant, and written to results.csv and read back', () => {
    const run = measureRun(oscillator, findMethod('fehlberg-45')!, { rtol: 1e-6, atol: 1e-6 }, { maxSteps: 1e6 });
    expect(run.error.dense).toBeUndefined();
    expect(run.denseInterpolant).toBeUndefined();
    const own = measureRun(oscillator, dormandPrince54, { rtol: 1e-6, atol: 1e-6 }, { maxSteps: 1e6 });
    const file: ResultsFile = {
      format: 'stepgauge-results',
      version: 1,
      createdAt: '2026-01-01T00:00:00.000Z',
      environment: { node: 'v20', platform: 'linux', arch: 'x64', cpu: 'x', stepgauge: '0' },
      runs: [run, own],
      problems: [],
    };
    const rows = resultsCsv(file).trim().split('\n').map((l) => l.split(','));
    const col = CSV_COLUMNS.indexOf('error_dense');
    expect(rows[1]![col]).toBe('');
    expect(Number(rows[2]![col])).toBe(own.error.dense);
    const back = validateResults(JSON.parse(JSON.stringify(file)), 'results.json');
    expect(back.runs[1]!.error.dense).toBe(own.error.dense);
    const bad = JSON.parse(JSON.stringify(file));
    bad.runs[1].error.dense = 'small';
    expect(() => validateResults(bad, 'results.json')).toThrow(/runs\[1\]\.error\.dense/);
  });
});

describe('bogacki-shampine-32 and its cubic Hermite (free with the FSAL stage)', () => {
  const bs = findMethod('bogacki-shampine-32') as unknown as typeof dormandPrince54;
  const cubic: Problem = { ...quartic, id: 'cubic-quadrature', f: (t, _y, dy) => void (dy[0] = 3 * t * t), reference: { kind: 'exact', source: 'y = t^3', exact: (t, out) => void (out[0] = t ** 3) } };

  it('reproduces a cubic exactly (a cubic Hermite through exact ends and slopes is the cubic; the third-order pair integrates a quadratic f exactly)', () => {
    const watch = watchRun(cubic, true);
    bs.dense.solve(cubic, { rtol: 1, atol: 1 }, { maxSteps: 1e6, maxStep: 0.1, observer: watch.observer }, watch.denseStep);
    expect(watch.along()!.value).toBeLessThan(1e-14);
    expect(watch.dense()!.value).toBeLessThan(1e-14);
  });

  it('falls like h^3 on the oscillator (the pair is of order 3; the Hermite adds an O(h^4) local error)', () => {
    const errors = [0.01, 0.005, 0.0025].map((h) => {
      const watch = watchRun(oscillator, true);
      bs.dense.solve(oscillator, { rtol: 1e-1, atol: 1e-1 }, { maxSteps: 1e7, maxStep: h, observer: watch.observer }, watch.denseStep);
      return watch.dense()!.value;
    });
    for (let k = 1; k < errors.length; k++) {
      const order = Math.log2(errors[k - 1]! / errors[k]!);
      expect(order).toBeGreaterThan(2.8);
      expect(order).toBeLessThan(3.2);
    }
  });
});

describe('events on the method interpolant', () => {
  const p = findProblem('eclipse-circular-orbit')!;
  const analytic = p.reference.eventTimes!;
  // Circular speed sqrt(GM/R) with GM = 3.986004418e14 m^3/s^2 (IERS/WGS 84) and R = 7078137 m (the problem's radius).
  const speed = Math.sqrt(3.986004418e14 / 7078137);

  it('dormand-prince-54 locates entries and exits on its continuous extension, with no evaluation beyond its own', () => {
    const setting = { rtol: 1e-10, atol: 1e-10 };
    const run = measureRun(p, dormandPrince54, setting, { maxSteps: 1e6 });
    expect(run.eventEvaluations).toBe(0);
    expect(run.counts).toEqual(dormandPrince54.solve(p, setting, { maxSteps: 1e6 }).counts);
    for (const name of ['eclipse-entry', 'eclipse-exit']) {
      const e = run.events![name]!;
      expect(e.locatedBy).toContain("dormand-prince-54's own continuous extension");
      expect(e.missed).toBe(0);
      expect(e.extra).toBe(0);
      // Timing error is the in-track error seen through the shadow edge: at most its size over the speed.
      expect(e.maxTimeError!).toBeLessThan(2 * (run.orbitError!.max!.inTrack / speed) + 1e-7);
      expect(e.maxTimeError!).toBeLessThan(1e-4);
      e.times.forEach((t, k) => expect(Math.abs(t - analytic[name]![k]!)).toBeLessThan(1e-4));
    }
  });

  it('dormand-prince-853 locates them on its 7th-order continuous extension (HNW I sec. II.6), its extra stages counted apart', () => {
    const setting = { rtol: 1e-8, atol: 1e-8 };
    const dop853 = findMethod('dormand-prince-853')!;
    const run = measureRun(p, dop853, setting, { maxSteps: 1e6 });
    expect(run.counts).toEqual(dop853.solve(p, setting, { maxSteps: 1e6 }).counts);
    expect(run.eventEvaluations).toBe(0);
    for (const name of ['eclipse-entry', 'eclipse-exit']) {
      const e = run.events![name]!;
      expect(e.locatedBy).toContain("dormand-prince-853's own continuous extension");
      expect([e.missed, e.extra]).toEqual([0, 0]);
      expect(e.maxTimeError!).toBeLessThan(2 * (run.orbitError!.max!.inTrack / speed) + 1e-7);
      e.times.forEach((t, k) => expect(Math.abs(t - analytic[name]![k]!)).toBeLessThan(1e-3));
    }
  });

  it('bogacki-shampine-32 locates them on its cubic Hermite, evaluated at step ends far from t = 0 without a rounding complaint', () => {
    const run = measureRun(p, findMethod('bogacki-shampine-32')!, { rtol: 1e-8, atol: 1e-8 }, { maxSteps: 1e7 });
    expect(run.status).toBe('ok');
    expect(run.eventEvaluations).toBe(0);
    for (const e of Object.values(run.events!)) {
      expect(e.locatedBy).toContain("bogacki-shampine-32's own continuous extension");
      expect([e.missed, e.extra]).toEqual([0, 0]);
      expect(e.maxTimeError!).toBeLessThan(2 * (run.orbitError!.max!.inTrack / speed) + 1e-7);
    }
  });

  it('methods without one use the Hermite of the accepted steps, and its evaluations are counted apart (3 per step)', () => {
    const run = measureRun(p, findMethod('fehlberg-45')!, { rtol: 1e-8, atol: 1e-8 }, { maxSteps: 1e6 });
    expect(run.events!['eclipse-entry']!.locatedBy).toContain('Hermite');
    expect(run.eventEvaluations).toBe(3 * (run.counts.accepted + 1));
  });
});

describe('the report table', () => {
  it('shows error.dense and event timing where some run has them, and says which interpolant gave them', () => {
    const p = findProblem('eclipse-circular-orbit')!;
    const runs = ['dormand-prince-54', 'fehlberg-45'].map((id) => measureRun(p, findMethod(id)!, { rtol: 1e-8, atol: 1e-8 }, { maxSteps: 1e6 }));
    const columns = sectionColumns(runs, new Map());
    const headers = columns.map((c) => c.header);
    expect(headers).toContain('error.dense');
    expect(headers).toContain('event time error');
    const rows = tableRows(runs, new Map(), columns);
    const worst = Math.max(...Object.values(runs[1]!.events!).map((e) => e.maxTimeError!));
    expect(rows[1]![headers.indexOf('event time error')]!.sort).toBe(worst);
    expect(rows[1]![headers.indexOf('error.dense')]!.text).toBe('—');
    const notes = interpolantNotes(runs);
    expect(notes.some((n) => n.startsWith('Event times of dormand-prince-54: located on dormand-prince-54') && n.includes('Shampine'))).toBe(true);
    expect(notes.some((n) => n.startsWith('Event times of fehlberg-45: located on') && n.includes('Hermite'))).toBe(true);
    expect(notes.some((n) => n.startsWith('error.dense of dormand-prince-54:'))).toBe(true);
    // A problem without events and runs without an interpolant of their own: neither column.
    const plain = sectionColumns([measureRun(oscillator, findMethod('rk4')!, { steps: 200 }, { maxSteps: 1e6 })], new Map()).map((c) => c.header);
    expect(plain).not.toContain('error.dense');
    expect(plain).not.toContain('event time error');
  });
});
