// `stepgauge choose`: the recommendation meets the target on a confirmed run, and for a fixed-step
// method the reported step count is the fewest that meets it (one fewer does not).
import { describe, expect, it } from 'vitest';
import { runCli } from './helpers/cli.js';
import { measureRun } from '../src/measure/run-one.js';
import { findMethod } from '../src/methods/registry.js';
import { keplerEccentric } from '../problems/kepler-eccentric.js';
import type { Choice } from '../src/sweep/choose.js';

describe('choose on kepler-eccentric, target 1e-8', () => {
  it('recommends a confirmed method and finds rk4\'s fewest equal steps', async () => {
    const r = await runCli(['choose', '-p', 'kepler-eccentric', '--target', '1e-8', '-m', 'dormand-prince-853,dormand-prince-54,rk4,euler', '--cost', 'nfev', '--safety', '1', '--json']);
    expect(r.code, r.stderr).toBe(0);
    const choice = JSON.parse(r.stdout) as Choice;
    const rec = choice.recommended!;
    expect(rec.met).toBe(true);
    expect(rec.achieved).toBeLessThanOrEqual(1e-8);
    // Cheapest by function evaluations among those that met it.
    const met = choice.candidates.filter((c) => c.met);
    expect(Math.min(...met.map((c) => c.cost!))).toBe(rec.cost);

    const rk4 = choice.candidates.find((c) => c.method === 'rk4')!;
    expect(rk4.met).toBe(true);
    const steps = (rk4.run!.setting as { steps: number }).steps;
    const opts = { maxSteps: 1_000_000 };
    const atN = measureRun(keplerEccentric, findMethod('rk4')!, { steps }, opts);
    const below = measureRun(keplerEccentric, findMethod('rk4')!, { steps: steps - 1 }, opts);
    expect(atN.error.final).toBeLessThanOrEqual(1e-8);
    expect(below.error.final).toBeGreaterThan(1e-8);
    // Euler (order 1) cannot reach 1e-8 within the step limit: reported, not recommended.
    const euler = choice.candidates.find((c) => c.method === 'euler')!;
    expect(euler.met).toBe(false);
    expect(euler.note).toMatch(/step limit: the largest step count allowed \(--max-steps 100000\)/);
  });

  it('rejects a missing or non-positive target with exit 2', async () => {
    expect((await runCli(['choose', '-p', 'kepler-eccentric', '--target', '0'])).code).toBe(2);
    expect((await runCli(['choose', '-p', 'kepler-eccentric', '--target', 'x'])).stderr).toMatch(/--target/);
  });
});

describe('choose for a target that needs a tolerance near round-off', () => {
  // kepler-eccentric's reference is the analytic two-body orbit (checked against an independent
  // Kepler-equation solver in catalogue-kepler.test.ts). A final error of 1e-10 over 10 periods
  // needs rtol below 1e-13 with dormand-prince-853 (round-off grows with the step count), so the
  // search has to go past 1e-13; its grid ends at 1e-15, about 4.5 times the unit round-off.
  it('finds dormand-prince-853 below rtol 1e-13 and confirms it against the exact orbit', async () => {
    const r = await runCli(['choose', '-p', 'kepler-eccentric', '--target', '1e-10', '-m', 'dormand-prince-853', '--cost', 'nfev', '--safety', '1', '--max-steps', '1000000', '--json']);
    expect(r.code, r.stderr).toBe(0);
    const choice = JSON.parse(r.stdout) as Choice;
    const dp853 = choice.candidates[0]!;
    expect(dp853.met).toBe(true);
    const rtol = (dp853.run!.setting as { rtol: number }).rtol;
    expect(rtol).toBeLessThan(1e-13);
    expect(rtol).toBeGreaterThanOrEqual(1e-15);
    const again = measureRun(keplerEccentric, findMethod('dormand-prince-853')!, dp853.run!.setting as { rtol: number; atol: number }, { maxSteps: 1_000_000 });
    expect(again.error.final).toBeLessThanOrEqual(1e-10);
  });
});
