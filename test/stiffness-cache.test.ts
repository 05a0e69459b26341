// The stiffness ratio of a large problem is computed once and then read from stepgauge's cache,
// keyed by the problem's definition and the states it is taken at.
import { mkdtempSync, readdirSync, readFileSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterEach, beforeEach, describe, expect, it } from 'vitest';
import { heatProblem } from '../problems/heat-2d.js';
import { STIFFNESS_CACHE_FROM, problemStiffnessRatio } from '../src/measure/problem-stiffness.js';

describe('cached stiffness ratios', () => {
  let dir: string;
  let before: string | undefined;
  beforeEach(() => {
    dir = mkdtempSync(join(tmpdir(), 'stepgauge-stiffness-cache-'));
    before = process.env.STEPGAUGE_CACHE;
    process.env.STEPGAUGE_CACHE = dir;
  });
  afterEach(() => {
    if (before === undefined) delete process.env.STEPGAUGE_CACHE;
    else process.env.STEPGAUGE_CACHE = before;
    rmSync(dir, { recursive: true, force: true });
  });

  it('computes the 5-point Laplacian ratio once, then reads it back', () => {
    const m = 15;
    const p = heatProblem(m);
    expect(p.dimension).toBeGreaterThanOrEqual(STIFFNESS_CACHE_FROM);
    // The Jacobian is constant; its eigenvalues are -(4 kappa/h^2)(sin^2(p pi h/2) + sin^2(q pi h/2)),
    // p, q = 1..m (LeVeque, Finite Difference Methods for ODEs and PDEs, SIAM 2007, sec. 3.4, from
    // memory; problems/heat-2d.ts checks the relation on the grid), so the ratio of the largest to
    // the smallest is sin^2(m pi h/2) / sin^2(pi h/2).
    const h = 1 / (m + 1);
    const analytic = Math.sin((m * Math.PI * h) / 2) ** 2 / Math.sin((Math.PI * h) / 2) ** 2;
    const first = problemStiffnessRatio(p);
    expect(first).not.toBeNull();
    // The problem has no analytic Jacobian: forward differences, about sqrt(eps) per entry
    // (measured 6e-8 here).
    expect(Math.abs(first! - analytic) / analytic).toBeLessThan(1e-6);
    const files = readdirSync(dir).filter((f) => f.startsWith('stiffness-'));
    expect(files).toHaveLength(1);
    const file = join(dir, files[0]!);
    expect(JSON.parse(readFileSync(file, 'utf8')).ratio).toBe(first);
    // Read back, not recomputed: an entry altered by hand is what comes back.
    writeFileSync(file, JSON.stringify({ recipe: 1, ratio: 42 }));
    expect(problemStiffnessRatio(heatProblem(m))).toBe(42);
    // A damaged entry is computed again and rewritten.
    writeFileSync(file, '{ not json');
    expect(problemStiffnessRatio(p)).toBe(first);
    expect(JSON.parse(readFileSync(file, 'utf8')).ratio).toBe(first);
  });

  it('keys the entry by the states the ratio is taken at', () => {
    const p = heatProblem(15);
    problemStiffnessRatio(p);
    // Another check time, another state: another entry.
    problemStiffnessRatio({ ...p, checkTimes: [1.5] });
    expect(readdirSync(dir).filter((f) => f.startsWith('stiffness-'))).toHaveLength(2);
  });

  it('leaves dispersion samples out of the cache', () => {
    const p = heatProblem(15);
    const sample = { ...p, id: 'heat-2d-m15-s1', dispersion: { of: p.id, seed: 1, sample: 1, explicitCase: false, values: {} } };
    expect(problemStiffnessRatio(sample)).toBe(problemStiffnessRatio(p));
    // Only the plain problem's entry.
    expect(readdirSync(dir).filter((f) => f.startsWith('stiffness-'))).toHaveLength(1);
  });

  it('leaves small problems out of the cache', () => {
    const p = heatProblem(6);
    expect(p.dimension).toBeLessThan(STIFFNESS_CACHE_FROM);
    expect(problemStiffnessRatio(p)).not.toBeNull();
    expect(readdirSync(dir)).toHaveLength(0);
  });
});
