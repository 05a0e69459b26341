// Orbit error in the radial / in-track / cross-track frame and event timing, against independent
// computations: the frame from its textbook definition (Vallado, Fundamentals of Astrodynamics and
// Applications, 4th ed., ch. 3, RSW frame: R = r/|r|, C = r x v/|r x v|, I = C x R; chapter from
// memory) and the eclipse times from the cylindrical shadow geometry (problems/eclipse-circular-orbit.ts).
import { describe, expect, it } from 'vitest';
import { useTempCache } from './helpers/temp-cache.js';
import { findProblem } from '../problems/index.js';
import { eclipseOrbit } from '../problems/eclipse-circular-orbit.js';
import { findMethod } from '../src/methods/registry.js';
import { measureRun } from '../src/measure/run-one.js';
import { withCertifiedReference } from '../src/measure/certify.js';
import { illinoisRoot } from '../src/core/root.js';
import { hermiteAt } from '../src/measure/hermite.js';
import type { Problem } from '../src/core/types.js';

type V3 = [number, number, number];
const sub = (a: V3, b: V3): V3 => [a[0] - b[0], a[1] - b[1], a[2] - b[2]];
const dot = (a: V3, b: V3) => a[0] * b[0] + a[1] * b[1] + a[2] * b[2];
const cross = (a: V3, b: V3): V3 => [a[1] * b[2] - a[2] * b[1], a[2] * b[0] - a[0] * b[2], a[0] * b[1] - a[1] * b[0]];
const unit = (a: V3): V3 => {
  const n = Math.sqrt(dot(a, a));
  return [a[0] / n, a[1] / n, a[2] / n];
};

/** Textbook RIC split of y's position error against the reference state (both (r, v) at 0..5). */
function textbookRic(y: readonly number[], ref: ArrayLike<number>) {
  const r: V3 = [ref[0]!, ref[1]!, ref[2]!];
  const v: V3 = [ref[3]!, ref[4]!, ref[5]!];
  const R = unit(r);
  const C = unit(cross(r, v));
  const I = cross(C, R);
  const d = sub([y[0]!, y[1]!, y[2]!], r);
  return { position: Math.sqrt(dot(d, d)), radial: dot(d, R), inTrack: dot(d, I), crossTrack: dot(d, C) };
}

useTempCache('sg-orbit-');

describe('radial / in-track / cross-track error', () => {
  it('matches the textbook frame computed from yFinal and the exact reference (eclipse orbit, dormand-prince-54 rtol 1e-6)', () => {
    const p = findProblem('eclipse-circular-orbit')!;
    const run = measureRun(p, findMethod('dormand-prince-54')!, { rtol: 1e-6, atol: 1e-6 }, { maxSteps: 1e6 });
    const ref = new Float64Array(6);
    p.reference.exact!(p.tEnd, ref);
    const want = textbookRic(run.yFinal, ref);
    const got = run.orbitError!.final!;
    expect(run.orbitError!.unit).toBe('m');
    for (const k of ['position', 'radial', 'inTrack', 'crossTrack'] as const) expect(Math.abs(got[k] - want[k])).toBeLessThan(1e-9 * want.position);
    // The in-track part dominates after three orbits (phase error grows secularly), the
    // cross-track part stays at round-off on this planar motion.
    expect(Math.abs(got.inTrack)).toBeGreaterThan(10 * Math.abs(got.radial));
    expect(Math.abs(got.crossTrack)).toBeLessThan(1e-6 * want.position);
    // Along the run: the maxima bound the final values, the trace ends at the end of the span.
    const max = run.orbitError!.max!;
    expect(max.inTrack).toBeGreaterThanOrEqual(Math.abs(got.inTrack));
    expect(run.orbitError!.trace!.t.at(-1)).toBe(p.tEnd);
  });

  it('matches the textbook frame against the certified reference (leo-j2, rk4 at 5760 steps)', () => {
    const p = withCertifiedReference(findProblem('leo-j2')!);
    const run = measureRun(p, findMethod('rk4')!, { steps: 5760 }, { maxSteps: 1e6 });
    const ref = p.reference.points!.at(-1)!.y;
    const want = textbookRic(run.yFinal, Float64Array.from(ref));
    const got = run.orbitError!.final!;
    for (const k of ['position', 'radial', 'inTrack', 'crossTrack'] as const) expect(Math.abs(got[k] - want[k])).toBeLessThan(1e-9 * want.position);
    expect(got.position).toBeGreaterThan(1); // metres: rk4 at 15 s steps is visibly off after a day
  });
});

describe('Hermite interpolant and root finder', () => {
  it('the degree-5 interpolant reproduces a quintic; the orbit one a degree-7 polynomial, with its derivative', () => {
    const P = (t: number) => 1 - 2 * t + 0.5 * t ** 3 + 0.25 * t ** 5;
    const dP = (t: number) => -2 + 1.5 * t ** 2 + 1.25 * t ** 4;
    const ddP = (t: number) => 3 * t + 5 * t ** 3;
    const Q = (t: number) => t ** 7 - t ** 4 + 3;
    const dQ = (t: number) => 7 * t ** 6 - 4 * t ** 3;
    const ddQ = (t: number) => 42 * t ** 5 - 12 * t ** 2;
    const dddQ = (t: number) => 210 * t ** 4 - 24 * t;
    const [a, b] = [0.3, 1.7];
    // Component 0: P; orbit position 1 with velocity component 2 (= Q'); 3..6 filler positions/velocities.
    const y = (t: number) => Float64Array.from([P(t), Q(t), dQ(t), 0, 0, 0, 0]);
    const f = (t: number) => Float64Array.from([dP(t), dQ(t), ddQ(t), 0, 0, 0, 0]);
    const g = (t: number) => Float64Array.from([ddP(t), ddQ(t), dddQ(t), 0, 0, 0, 0]);
    const ends = { tA: a, tB: b, yA: y(a), yB: y(b), fA: f(a), fB: f(b), gA: g(a), gB: g(b) };
    const out = new Float64Array(7);
    for (const t of [0.4, 0.9, 1.33, 1.69]) {
      hermiteAt(ends, t, out, { position: [1, 3, 5], velocity: [2, 4, 6], unit: 'm' });
      expect(out[0]).toBeCloseTo(P(t), 12);
      expect(out[1]).toBeCloseTo(Q(t), 11);
      expect(out[2]).toBeCloseTo(dQ(t), 10);
    }
  });

  it('Illinois finds cos(t) = t to 1e-14 (root 0.7390851332151607, the Dottie number)', () => {
    const g = (t: number) => Math.cos(t) - t;
    expect(illinoisRoot(g, 0, g(0), 1, g(1), 1e-15)).toBeCloseTo(0.7390851332151607, 14);
  });
});

describe('eclipse events', () => {
  const p = findProblem('eclipse-circular-orbit')!;
  const analytic = p.reference.eventTimes!;

  it('dormand-prince-853 at rtol 1e-10 finds every entry and exit within 2e-6 s of the analytic times', () => {
    // Located on its own 7th-order continuous extension: measured 1.01e-6 s (entry) and 6.5e-7 s
    // (exit), twice the in-track error over the speed at most (3.7e-3 m / 7504 m/s = 4.9e-7 s).
    const run = measureRun(p, findMethod('dormand-prince-853')!, { rtol: 1e-10, atol: 1e-10 }, { maxSteps: 1e6 });
    // Circular speed sqrt(GM/R) with GM = 3.986004418e14 m^3/s^2 (IERS/WGS 84) and R = 7078137 m (the problem's radius).
    const speed = Math.sqrt(3.986004418e14 / 7078137);
    for (const name of ['eclipse-entry', 'eclipse-exit']) {
      const e = run.events![name]!;
      expect(e.reference).toEqual(analytic[name]);
      expect(e.missed).toBe(0);
      expect(e.extra).toBe(0);
      e.times.forEach((t, k) => expect(Math.abs(t - analytic[name]![k]!)).toBeLessThan(2e-6));
      expect(e.maxTimeError!).toBeLessThan(2 * (run.orbitError!.max!.inTrack / speed) + 1e-7);
    }
  });

  it('a loose fixed-step run (rk4, 100 steps over three orbits) reports its timing error, consistent with its in-track error', () => {
    const run = measureRun(p, findMethod('rk4')!, { steps: 100 }, { maxSteps: 1e6 });
    const e = run.events!['eclipse-exit']!;
    expect(e.missed).toBe(0);
    const last = e.timeErrors!.at(-1)!;
    expect(Math.abs(last - (e.times.at(-1)! - analytic['eclipse-exit']!.at(-1)!))).toBe(0);
    // Timing error ~ in-track error / speed (|v| = sqrt(GM/R) = 7504.3 m/s), here tens of seconds.
    const speed = Math.sqrt(3.986004418e14 / 7078137);
    expect(Math.abs(last)).toBeGreaterThan(0.1);
    const inTrackAtEnd = Math.abs(run.orbitError!.final!.inTrack);
    expect(Math.abs(last)).toBeGreaterThan(0.3 * (inTrackAtEnd / speed) * (2.5 / 3)); // the last exit is at 2.6 of 3 orbits
    expect(Math.abs(last)).toBeLessThan(3 * (inTrackAtEnd / speed));
  });

  it('a run whose step jumps over a half-minute eclipse reports it missed', () => {
    // Sun 64.3 deg above the plane: half-angle acos(sqrt(1 - (R_E/R)^2)/cos beta), about 30 s in shadow.
    const short: Problem = eclipseOrbit(64.3);
    const ref = short.reference.eventTimes!;
    const duration = ref['eclipse-exit']![0]! - ref['eclipse-entry']![0]!;
    expect(duration).toBeGreaterThan(20);
    expect(duration).toBeLessThan(40);
    const steps: number[] = [];
    const m = findMethod('rk4')!;
    const run = measureRun(short, m, { steps: 200 }, { maxSteps: 1e6 });
    m.solve(short, { steps: 200 }, { maxSteps: 1e6, observer: (t) => void steps.push(t) });
    // Eclipses that fall inside one step (entry and exit between the same two steps).
    const jumped = ref['eclipse-entry']!.filter((t0, k) => {
      const t1 = ref['eclipse-exit']![k]!;
      return steps.some((s, j) => j > 0 && steps[j - 1]! < t0 && s > t1);
    }).length;
    expect(jumped).toBe(2); // 89 s steps against a 30 s eclipse: the first and third fall inside a step
    expect(run.events!['eclipse-entry']!.missed).toBe(jumped);
    expect(run.events!['eclipse-exit']!.missed).toBe(jumped);
    // The missed ones have no time error; the found one has.
    expect(run.events!['eclipse-entry']!.timeErrors!.map((e) => e === null)).toEqual([true, false, true]);
  });
});

describe('choose on orbit and event measures', () => {
  it('in-track error at the end: the recommended setting, rerun, meets the target against the exact reference', async () => {
    const { chooseMethod } = await import('../src/sweep/choose.js');
    const p = findProblem('eclipse-circular-orbit')!;
    const methods = ['dormand-prince-853', 'rk4'].map((id) => findMethod(id)!);
    const choice = await chooseMethod(p, methods, { target: 1, measure: 'in-track', cost: 'nfev', timing: { budgetSeconds: 0.01, minSamples: 1 }, maxSteps: 1e6 });
    expect(choice.recommended).not.toBeNull();
    for (const c of choice.candidates.filter((x) => x.met)) {
      const m = findMethod(c.method)!;
      const s = c.run!.setting;
      const rerun = measureRun(p, m, 'rtol' in s ? { rtol: s.rtol, atol: s.atol } : { steps: s.steps }, { maxSteps: 1e6 });
      const ref = new Float64Array(6);
      p.reference.exact!(p.tEnd, ref);
      expect(Math.abs(textbookRic(rerun.yFinal, ref).inTrack)).toBeLessThanOrEqual(1);
    }
  });

  it('event time: the recommended setting, rerun, finds every crossing within the target of the analytic times', async () => {
    const { chooseMethod } = await import('../src/sweep/choose.js');
    const p = findProblem('eclipse-circular-orbit')!;
    const choice = await chooseMethod(p, [findMethod('dormand-prince-54')!], { target: 1e-3, measure: 'event-time', cost: 'nfev', timing: { budgetSeconds: 0.01, minSamples: 1 }, maxSteps: 1e6 });
    const rec = choice.recommended!;
    const s = rec.run!.setting as { rtol: number; atol: number };
    const rerun = measureRun(p, findMethod('dormand-prince-54')!, { rtol: s.rtol, atol: s.atol }, { maxSteps: 1e6 });
    for (const name of ['eclipse-entry', 'eclipse-exit']) {
      const times = rerun.events![name]!.times;
      const analytic = p.reference.eventTimes![name]!;
      expect(times.length).toBe(analytic.length);
      times.forEach((t, k) => expect(Math.abs(t - analytic[k]!)).toBeLessThanOrEqual(1e-3));
    }
  });

  it('refuses an orbit measure on a problem without an orbit, naming the flag', async () => {
    const { chooseMethod } = await import('../src/sweep/choose.js');
    await expect(chooseMethod(findProblem('van-der-pol')!, [findMethod('rk4')!], { target: 1, measure: 'in-track', cost: 'nfev', timing: { budgetSeconds: 0.01, minSamples: 1 }, maxSteps: 10 })).rejects.toThrow(/names no orbit/);
  });
});

describe('orbit and events in a module problem (defineProblem)', () => {
  it('a unit circular orbit crosses the x axis downward at t = pi: reference located on the exact solution, run within 1e-8', async () => {
    const { defineProblem } = await import('../src/authoring/define-problem.js');
    const p = defineProblem({
      id: 'unit-circle',
      title: 'unit circle',
      source: 'circular two-body motion, mu = 1 (x = cos t, y = sin t)',
      y0: [1, 0, 0, 0, 1, 0],
      span: [0, 2 * Math.PI - 0.1],
      f: (_t, y, dy) => {
        const r3 = Math.hypot(y[0]!, y[1]!, y[2]!) ** 3;
        for (let k = 0; k < 3; k++) {
          dy[k] = y[3 + k]!;
          dy[3 + k] = -y[k]! / r3;
        }
      },
      reference: { kind: 'exact', exact: (t, out) => out.set([Math.cos(t), Math.sin(t), 0, -Math.sin(t), Math.cos(t), 0]) },
      orbit: { position: [0, 1, 2], velocity: [3, 4, 5], unit: 'length units' },
      events: [{ name: 'descending-x-axis', fn: (_t, y) => y[1]!, direction: 'falling' }],
    });
    const run = measureRun(p, findMethod('dormand-prince-853')!, { rtol: 1e-10, atol: 1e-10 }, { maxSteps: 1e6 });
    const e = run.events!['descending-x-axis']!;
    expect(e.reference!.length).toBe(1);
    expect(Math.abs(e.reference![0]! - Math.PI)).toBeLessThan(1e-12);
    expect(e.missed).toBe(0);
    expect(e.extra).toBe(0);
    expect(e.maxTimeError!).toBeLessThan(1e-8);
    expect(run.orbitError!.unit).toBe('length units');
  });

  it('refuses an event without a valid direction, naming the problem', async () => {
    const { defineProblem } = await import('../src/authoring/define-problem.js');
    expect(() =>
      defineProblem({
        id: 'bad-event', title: 'x', source: 'x', y0: [1], span: [0, 1], f: (_t, y, dy) => void (dy[0] = -y[0]!),
        events: [{ name: 'half', fn: (_t, y) => y[0]! - 0.5, direction: 'down' as never }],
      }),
    ).toThrow(/bad-event.*direction must be rising, falling or both|direction must be rising, falling or both/);
  });
});

describe('orbit and events in a problem file', () => {
  it('the eclipse orbit written as a file finds the catalogue\'s analytic eclipse times within 1e-6 s (dormand-prince-853, rtol 1e-10)', async () => {
    const { loadProblemFile } = await import('../src/problems/load-file.js');
    const { join } = await import('node:path');
    const p = await loadProblemFile(join(import.meta.dirname, '..', 'examples', 'eclipse-orbit.yaml'));
    expect(p.orbit).toEqual({ position: [0, 1, 2], velocity: [3, 4, 5], unit: 'm' });
    const analytic = findProblem('eclipse-circular-orbit')!.reference.eventTimes!;
    const run = measureRun(p, findMethod('dormand-prince-853')!, { rtol: 1e-10, atol: 1e-10 }, { maxSteps: 1e6 });
    for (const name of ['eclipse-entry', 'eclipse-exit']) {
      const e = run.events![name]!;
      // The reference crossings are located on the file's exact solution; they are the analytic ones.
      e.reference!.forEach((t, k) => expect(Math.abs(t - analytic[name]![k]!)).toBeLessThan(1e-7));
      expect(e.missed).toBe(0);
      expect(e.extra).toBe(0);
      e.times.forEach((t, k) => expect(Math.abs(t - analytic[name]![k]!)).toBeLessThan(1e-6));
    }
    expect(run.orbitError!.final!.position).toBeGreaterThan(0);
  });
});

describe('reference crossings without an exact reference', () => {
  it('are located on a tight solve: within 1e-7 s of the analytic eclipse times', async () => {
    const { referenceEventTimes } = await import('../src/measure/events.js');
    const p = findProblem('eclipse-circular-orbit')!;
    const withoutExact: Problem = { ...p, reference: { kind: 'certified', points: [] }, definition: `${p.definition}\n(no exact reference)` };
    const times = referenceEventTimes(withoutExact)!;
    for (const name of ['eclipse-entry', 'eclipse-exit']) {
      const analytic = p.reference.eventTimes![name]!;
      expect(times[name]!.length).toBe(analytic.length);
      times[name]!.forEach((t, k) => expect(Math.abs(t - analytic[k]!)).toBeLessThan(1e-7));
    }
  });
});
