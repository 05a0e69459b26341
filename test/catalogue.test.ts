// The built-in catalogue: shape, analytic solutions, invariants, Jacobians and separable splits.
import { describe, expect, it } from 'vitest';
import odex from 'odex';
import { catalogue, findProblem } from '../problems/index.js';
import type { Problem } from '../src/core/types.js';
import { sha256 } from '../src/core/hash.js';

/** Small deterministic generator so a failure can be replayed (common practice, no source). */
function lcg(seed: number): () => number {
  let s = seed >>> 0;
  return () => {
    s = (Math.imul(s, 1664525) + 1013904223) >>> 0;
    return s / 2 ** 32;
  };
}

const analytic = catalogue.filter((p) => p.reference.kind === 'exact');

function exactAt(p: Problem, t: number): Float64Array {
  const out = new Float64Array(p.dimension);
  p.reference.exact!(t, out);
  return out;
}

function rhs(p: Problem, t: number, y: Float64Array): Float64Array {
  const dy = new Float64Array(p.dimension);
  p.f(t, y, dy);
  return dy;
}

/** States at which to check algebraic identities: near the solution, perturbed. */
function sampleStates(p: Problem, rand: () => number, count: number): { t: number; y: Float64Array }[] {
  const bases: { t: number; y: Float64Array }[] = [];
  if (p.reference.exact) {
    for (let k = 0; k < count; k++) {
      const t = p.t0 + rand() * (p.tEnd - p.t0);
      bases.push({ t, y: exactAt(p, t) });
    }
  } else {
    const pts = [{ t: p.t0, y: p.y0 }, ...(p.reference.points ?? [])];
    for (let k = 0; k < count; k++) {
      const pt = pts[k % pts.length]!;
      bases.push({ t: pt.t, y: Float64Array.from(pt.y) });
    }
  }
  return bases.map(({ t, y }) => ({
    t,
    y: y.map((v) => v * (1 + 0.2 * (rand() - 0.5)) + 0.05 * (rand() - 0.5) * (Math.abs(v) > 1e-3 ? 1 : 1e-3)),
  }));
}

describe('catalogue shape', () => {
  it('holds problems with distinct kebab-case ids, each found by its id', () => {
    expect(catalogue.length).toBeGreaterThan(0);
    expect(new Set(catalogue.map((p) => p.id)).size).toBe(catalogue.length);
    for (const p of catalogue) expect(p.id).toMatch(/^[a-z0-9]+(-[a-z0-9]+)*$/);
    for (const p of catalogue) expect(findProblem(p.id)).toBe(p);
    expect(findProblem('no-such-problem')).toBeUndefined();
  });

  it.each(catalogue.map((p) => [p.id, p] as const))('%s: consistent dimensions, times and references', (_id, p) => {
    expect(p.y0.length).toBe(p.dimension);
    if (p.stateNames) expect(p.stateNames.length).toBe(p.dimension);
    expect(p.tEnd).toBeGreaterThan(p.t0);
    for (let i = 0; i < p.checkTimes.length; i++) {
      expect(p.checkTimes[i]!).toBeGreaterThan(i === 0 ? p.t0 : p.checkTimes[i - 1]!);
      expect(p.checkTimes[i]!).toBeLessThanOrEqual(p.tEnd);
    }
    // Every problem has an analytic Jacobian except the banded one, whose Jacobian is 5 grouped
    // differences (test/banded-jacobians.test.ts checks them against one worked out by hand).
    if (p.jacobianBand) expect(p.jacobian).toBeUndefined();
    else expect(typeof p.jacobian).toBe('function');
    expect(p.description).toBeTruthy();
    if (p.reference.kind === 'exact') expect(typeof p.reference.exact).toBe('function');
    else if (p.reference.kind === 'certified' && (p.reference.points ?? []).length === 0) expect(p.reference.digits).toBeUndefined(); // certified by the sweep
    else {
      const pts = p.reference.points!;
      expect(pts.length).toBeGreaterThan(0);
      expect(pts[pts.length - 1]!.t).toBe(p.tEnd); // the end is always checked, so it needs a value
      for (const pt of pts) expect(pt.y.length).toBe(p.dimension);
      for (const t of p.checkTimes) expect(pts.some((pt) => pt.t === t)).toBe(true);
      // Arenstorf's periodic orbit is trusted to 8 digits (problems/arenstorf-orbit.ts), the rest to 10 or more.
      expect(p.reference.digits).toBeGreaterThanOrEqual(8);
    }
    if (p.errorScale.kind === 'relative' && typeof p.errorScale.floor !== 'number') expect(p.errorScale.floor.length).toBe(p.dimension);
    if (p.atolScale !== undefined && typeof p.atolScale !== 'number') expect(p.atolScale.length).toBe(p.dimension);
  });

  it('gives every problem a distinct definition hash, identical on re-import', async () => {
    const hashes = catalogue.map((p) => sha256(p.definition));
    expect(new Set(hashes).size).toBe(catalogue.length);
    const again = await import('../problems/index.js');
    expect(again.catalogue.map((p) => sha256(p.definition))).toEqual(hashes);
  });
});

describe('analytic solutions', () => {
  it.each(analytic.map((p) => [p.id, p] as const))('%s: y0 equals exact(t0)', (_id, p) => {
    const e = exactAt(p, p.t0);
    for (let i = 0; i < p.dimension; i++) expect(Math.abs(e[i]! - p.y0[i]!)).toBeLessThan(1e-15);
  });

  it.each(analytic.map((p) => [p.id, p] as const))('%s: exact solution satisfies the ODE', (_id, p) => {
    // Fourth-order centred difference (y(t-2h) - 8y(t-h) + 8y(t+h) - y(t+2h)) / 12h with
    // h = 1e-3: truncation ~h^4 |y^(5)| / 30 and rounding ~eps/h, both below 1e-9 relative to
    // the derivative's size here (common practice, no source).
    const rand = lcg(2024);
    const h = 1e-3;
    for (let k = 0; k < 25; k++) {
      const t = p.t0 + 2 * h + rand() * (p.tEnd - p.t0 - 4 * h);
      const m2 = exactAt(p, t - 2 * h);
      const m1 = exactAt(p, t - h);
      const p1 = exactAt(p, t + h);
      const p2 = exactAt(p, t + 2 * h);
      const f = rhs(p, t, exactAt(p, t));
      const size = Math.max(1, ...Array.from(f, Math.abs));
      for (let i = 0; i < p.dimension; i++) {
        const fd = (m2[i]! - 8 * m1[i]! + 8 * p1[i]! - p2[i]!) / (12 * h);
        expect(Math.abs(fd - f[i]!) / size, `${p.id} t=${t} i=${i}`).toBeLessThan(1e-8);
      }
    }
  });

  it.each(analytic.map((p) => [p.id, p] as const))('%s: odex from y0 reaches exact(tEnd)', (_id, p) => {
    // odex (registry library, Hairer's GBS extrapolation code) at rtol = atol = 1e-12 as an
    // integration that shares nothing with the closed form.
    const solver = new odex.Solver(p.dimension);
    solver.relativeTolerance = solver.absoluteTolerance = 1e-12;
    solver.maxSteps = 1e6;
    const res = solver.solve((t: number, y: number[]) => Array.from(rhs(p, t, Float64Array.from(y))), p.t0, [...p.y0], p.tEnd);
    expect(res.outcome).toBe(0);
    const e = exactAt(p, p.tEnd);
    // Relative to the state's size (metres on the orbit problems; O(1) on the others).
    const size = Math.max(1, ...Array.from(e, Math.abs));
    for (let i = 0; i < p.dimension; i++) expect(Math.abs(res.y[i]! - e[i]!) / size, `${p.id} i=${i}`).toBeLessThan(1e-8);
  });

  it('harmonic oscillator and circular Kepler match their closed forms at chosen times', () => {
    // Analytic: q = cos(2 pi t), p = -2 pi sin(2 pi t); circular orbit position (cos t, sin t cos 30, sin t sin 30).
    const ho = exactAt(findProblem('harmonic-oscillator')!, 0.125);
    expect(ho[0]).toBeCloseTo(Math.SQRT1_2, 15);
    expect(ho[1]).toBeCloseTo(-2 * Math.PI * Math.SQRT1_2, 14);
    const kc = exactAt(findProblem('kepler-circular')!, Math.PI / 2);
    expect(Array.from(kc).map((v) => Math.round(v * 1e12) / 1e12)).toEqual([0, Math.round(Math.sqrt(3) / 2 * 1e12) / 1e12, 0.5, -1, 0, 0]);
  });
});

describe('invariants', () => {
  // Closed-form values: oscillator energy w^2/2 = 2 pi^2; Kepler energy -mu/(2a) = -1/2;
  // angular momentum sqrt(mu a (1 - e^2)) = 1 (circular) and 0.8 (e = 0.6) (e.g. Danby, ch. 6).
  const expected: Record<string, Record<string, number>> = {
    'harmonic-oscillator': { energy: 2 * Math.PI * Math.PI },
    'kepler-circular': { energy: -0.5, 'angular-momentum': 1 },
    'kepler-eccentric': { energy: -0.5, 'angular-momentum': 0.8 },
    // Circular orbit of radius R = 6378137 + 700e3 m: energy -GM/(2R), angular momentum sqrt(GM R).
    'eclipse-circular-orbit': { energy: -3.986004418e14 / (2 * 7078137), 'angular-momentum': Math.sqrt(3.986004418e14 * 7078137) },
  };

  it.each(analytic.map((p) => [p.id, p] as const))('%s: invariants are constant along the exact solution', (id, p) => {
    const rand = lcg(99);
    for (const inv of p.invariants) {
      const value = expected[id]![inv.name]!;
      expect(value).toBeDefined();
      for (let k = 0; k < 200; k++) {
        const t = p.t0 + rand() * (p.tEnd - p.t0);
        expect(Math.abs(inv.fn(t, exactAt(p, t)) - value), `${inv.name} t=${t}`).toBeLessThan(1e-14 * Math.max(1, Math.abs(value)));
      }
    }
  });

  it.each(catalogue.map((p) => [p.id, p] as const))('%s: invariants have distinct kebab-case names', (_id, p) => {
    const names = p.invariants.map((i) => i.name);
    expect(new Set(names).size).toBe(names.length);
    for (const name of names) expect(name).toMatch(/^[a-z0-9]+(-[a-z0-9]+)*$/);
  });

  it('robertson: the right-hand sides sum to zero, so mass is conserved exactly by the ODE', () => {
    const p = findProblem('robertson')!;
    for (const { t, y } of sampleStates(p, lcg(5), 30)) {
      const f = rhs(p, t, y);
      const size = Math.max(...Array.from(f, Math.abs));
      expect(Math.abs(f[0]! + f[1]! + f[2]!)).toBeLessThanOrEqual(4 * Number.EPSILON * size);
    }
  });
});

/**
 * Size below which a component's difference step stops shrinking. decaying-orbit-drag starts with
 * y = 0 in metres beside |x| = 6.6e6 m: a step of 1e-10 m there loses every digit of the
 * difference to round-off (common practice, no source).
 */
const STEP_FLOOR: Record<string, number> = { 'decaying-orbit-drag': 1e3 };

describe('Jacobians', () => {
  const analytic = catalogue.filter((p) => p.jacobian);
  it.each(analytic.map((p) => [p.id, p] as const))('%s: analytic Jacobian matches centred differences of f', (_id, p) => {
    // Centred differences with h_j = 1e-6 max(|y_j|, 1e-4): error ~h^2 |f'''| + eps |f| / h,
    // below 1e-6 of the row's largest entry for these right-hand sides (common practice, no source).
    const n = p.dimension;
    const jac = new Float64Array(n * n);
    for (const { t, y } of sampleStates(p, lcg(31337), 12)) {
      p.jacobian!(t, y, jac);
      for (let j = 0; j < n; j++) {
        const h = 1e-6 * Math.max(Math.abs(y[j]!), STEP_FLOOR[p.id] ?? 1e-4);
        const yp = Float64Array.from(y);
        const ym = Float64Array.from(y);
        yp[j]! += h;
        ym[j]! -= h;
        const fp = rhs(p, t, yp);
        const fm = rhs(p, t, ym);
        for (let i = 0; i < n; i++) {
          let rowSize = 1;
          for (let k = 0; k < n; k++) rowSize = Math.max(rowSize, Math.abs(jac[i * n + k]!));
          const fd = (fp[i]! - fm[i]!) / (yp[j]! - ym[j]!);
          expect(Math.abs(fd - jac[i * n + j]!) / rowSize, `${p.id} J[${i}][${j}]`).toBeLessThan(1e-6);
        }
      }
    }
  });

  it('the Jacobian writes every entry (a dirty buffer gives the same result)', () => {
    for (const p of analytic) {
      const n = p.dimension;
      const y = Float64Array.from(p.y0, (v) => v + 0.1);
      const clean = new Float64Array(n * n);
      const dirty = new Float64Array(n * n).fill(12345);
      p.jacobian!(0.3, y, clean);
      p.jacobian!(0.3, y, dirty);
      expect(Array.from(dirty), p.id).toEqual(Array.from(clean));
    }
  });
});

describe('separable splits', () => {
  const separable = catalogue.filter((p) => p.separable);

  it.each(separable.map((p) => [p.id, p] as const))('%s: positions move with velocities only and vice versa', (_id, p) => {
    // The Jacobian blocks d(q')/dq and d(p')/dp must vanish at every state.
    const { positions, velocities } = p.separable!;
    expect([...positions, ...velocities].sort((a, b) => a - b)).toEqual(Array.from({ length: p.dimension }, (_, i) => i));
    const n = p.dimension;
    const jac = new Float64Array(n * n);
    for (const { t, y } of sampleStates(p, lcg(8), 10)) {
      p.jacobian!(t, y, jac);
      for (const i of positions) for (const j of positions) expect(jac[i * n + j]).toBe(0);
      for (const i of velocities) for (const j of velocities) expect(jac[i * n + j]).toBe(0);
    }
  });
});
