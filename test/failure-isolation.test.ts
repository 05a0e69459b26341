// One bad run must not spoil a sweep: a right-hand side that turns NaN ends its run `diverged`, a
// method that throws ends its runs `error` with the message, a right-hand side that never returns
// ends `timeout` (its worker is terminated), a step limit ends `step-limit`; every other run
// finishes normally, results.json lists every planned run, the summary counts the failures and
// the exit code is 3.
// The timeout case runs on worker threads, which load the compiled dist/ build (npm test builds
// first; run `npm run build` before running this file alone after changing src/).
import { mkdtempSync, readFileSync, readdirSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterAll, describe, expect, it } from 'vitest';
import { runCli } from './helpers/cli.js';
import type { ResultsFile, RunResult } from '../src/results/contract.js';

const MODULES = 'test/fixtures/modules';
const scratch: string[] = [];
afterAll(() => {
  for (const d of scratch) rmSync(d, { recursive: true, force: true });
});

async function sweep(args: string[]) {
  const dir = mkdtempSync(join(tmpdir(), 'sg-isolation-'));
  scratch.push(dir);
  const out = join(dir, 'out');
  const r = await runCli(['run', ...args, '--no-timing', '-q', '--no-report', '--out', out]);
  const results = JSON.parse(readFileSync(join(out, 'results.json'), 'utf8')) as ResultsFile;
  // The journal beside the folder is removed once the folder is in place.
  expect(readdirSync(dir)).toEqual(['out']);
  return { r, results };
}

const key = (run: RunResult) => `${run.problem} x ${run.method} @ ${'steps' in run.setting ? run.setting.steps : run.setting.rtol}`;
const byKey = (runs: RunResult[]) => new Map(runs.map((run) => [key(run), run]));

describe('failure isolation in one sweep', () => {
  it('NaN right-hand side -> diverged; throwing method -> error with its message; the rest ok; exit 3 with --fail-on-failed-runs', async () => {
    const { r, results } = await sweep([
      '--problem', `${MODULES}/nan-after-half.ts,harmonic-oscillator`,
      '-m', `rk4,${MODULES}/throwing-method.ts`,
      '-s', '10,20',
      '--fail-on-failed-runs',
    ]);
    expect(r.code, r.stderr).toBe(3);
    // 2 problems x 2 methods x 2 step counts, all listed, in plan order.
    expect(results.runs).toHaveLength(8);
    expect(results.runs.map((x) => x.planIndex)).toEqual([0, 1, 2, 3, 4, 5, 6, 7]);
    const runs = byKey(results.runs);
    for (const steps of [10, 20]) {
      const nan = runs.get(`nan-after-half x rk4 @ ${steps}`)!;
      expect(nan.status).toBe('diverged');
      // It stops on the first step past t = 0.5 (h = 1/steps), having done that step's 4 stages.
      expect(nan.tFinal).toBeGreaterThan(0.5);
      expect(nan.tFinal).toBeLessThanOrEqual(0.5 + 1 / steps + 1e-12);
      expect(nan.error).toEqual({ final: null, max: null });
      const thrown = runs.get(`nan-after-half x throwing-method @ ${steps}`)!;
      expect(thrown.status).toBe('error');
      expect(thrown.message).toContain('stage buffer not allocated');
      const thrown2 = runs.get(`harmonic-oscillator x throwing-method @ ${steps}`)!;
      expect(thrown2.status).toBe('error');
      expect(thrown2.message).toContain('stage buffer not allocated');
      const ok = runs.get(`harmonic-oscillator x rk4 @ ${steps}`)!;
      expect(ok.status).toBe('ok');
      expect(ok.counts).toEqual({ nfev: 4 * steps, njev: 0, nlu: 0, accepted: steps, rejected: 0 });
      expect(ok.error.final).toBeGreaterThan(0);
    }
    expect(r.stdout).toContain('8 runs, 6 not ok (2 diverged, 4 error).');
  });

  // BUG (src/measure/certify.ts, called from src/sweep/resolve.ts; not fixed here): a problem
  // without a reference is certified when it is resolved, and a failed certification (here
  // dormand-prince-853 at rtol 1e-13 ends 'diverged' at t = 0.5) is thrown as a plain Error, so
  // the CLI reports "internal error" and exits 70, running nothing, not even the healthy
  // harmonic-oscillator runs. It should be bad input (exit 2, naming the problem file and the
  // certification failure) or fail only that problem's runs (exit 3).
  it('an f that turns NaN in a problem the sweep must certify: the other problem still runs (exit 0 or 2, not 70)', async () => {
    const dir = mkdtempSync(join(tmpdir(), 'sg-isolation-'));
    scratch.push(dir);
    const r = await runCli(['run', '--problem', `${MODULES}/nan-after-half-certified.ts,harmonic-oscillator`, '-m', 'rk4', '-s', '10', '--no-timing', '-q', '--no-report', '--out', join(dir, 'out')]);
    expect(r.stderr).not.toContain('internal error');
    expect([0, 2]).toContain(r.code);
    expect(r.stderr).toContain('nan-after-half-certified');
  });

  it('step limit: --max-steps 50 stops the 100-step run at step 50 (step-limit); the 10-step run is ok', async () => {
    const { r, results } = await sweep(['--problem', 'harmonic-oscillator', '-m', 'rk4', '-s', '10,100', '--max-steps', '50']);
    // A finished, written sweep exits 0 whatever its runs' statuses.
    expect(r.code, r.stderr).toBe(0);
    expect(results.runs).toHaveLength(2);
    const runs = byKey(results.runs);
    const limited = runs.get('harmonic-oscillator x rk4 @ 100')!;
    expect(limited.status).toBe('step-limit');
    expect(limited.counts.accepted).toBe(50);
    expect(limited.counts.nfev).toBe(200);
    expect(runs.get('harmonic-oscillator x rk4 @ 10')!.status).toBe('ok');
    expect(r.stdout).toContain('2 runs, 1 not ok (1 step-limit).');
  });

  // An f that never returns at tEnd: the run times out in its worker, and the problem's stiffness
  // ratio (which calls f at tEnd) is computed on a worker under the same limit, so the sweep
  // still completes and writes its results.
  it('an f that never returns at tEnd: the sweep still writes results (stiffness ratio under the run timeout)', async () => {
    const { r, results } = await sweep(['--problem', `${MODULES}/hangs-after-third.ts,harmonic-oscillator`, '-m', 'rk4', '-s', '10', '--run-timeout', '1', '--jobs', '1']);
    // A finished, written sweep exits 0 whatever its runs' statuses.
    expect(r.code, r.stderr).toBe(0);
    expect(results.runs.map((x) => x.status).sort()).toEqual(['ok', 'timeout']);
    const hung = results.problems.find((p) => p.id === 'hangs-after-third')!;
    expect(hung.stiffnessRatio).toBeNull();
  });

  // A model the sweep must certify whose f never returns: with --run-timeout the certification
  // runs on a worker under 4 run timeouts, the problem is left without a reference (its runs
  // `error`, as when certification fails) and the other problem's runs finish.
  it('certification that never returns: stopped under --run-timeout, the sweep goes on', async () => {
    const cache = mkdtempSync(join(tmpdir(), 'sg-cache-'));
    scratch.push(cache);
    const before = process.env.STEPGAUGE_CACHE;
    process.env.STEPGAUGE_CACHE = cache;
    try {
      const started = Date.now();
      const { r, results } = await sweep(['--problem', `${MODULES}/hangs-uncertified.ts,harmonic-oscillator`, '-m', 'rk4', '-s', '10', '--run-timeout', '1', '--jobs', '1']);
      // A finished, written sweep exits 0 whatever its runs' statuses.
    expect(r.code, r.stderr).toBe(0);
      expect(r.stderr).toContain('certifying a reference took longer than 4 s');
      const runs = byKey(results.runs);
      const hung = runs.get('hangs-uncertified x rk4 @ 10')!;
      expect(['error', 'timeout']).toContain(hung.status);
      expect(runs.get('harmonic-oscillator x rk4 @ 10')!.status).toBe('ok');
      // 4 s for the certification, 1 s (plus grace) for the run and the stiffness ratio each.
      expect(Date.now() - started).toBeLessThan(30_000);
    } finally {
      if (before === undefined) delete process.env.STEPGAUGE_CACHE;
      else process.env.STEPGAUGE_CACHE = before;
    }
  });

  // Without a run timeout a worker holds two runs at once; one that ends the worker's process
  // must not fail the other. A method's runs go to one worker problem by problem, costliest
  // first, so the 10-step harmonic-oscillator run is queued on the worker behind the 20-step one,
  // which ends it.
  it('a method that exits its worker: that run fails, every other run (even one queued behind it) is ok', async () => {
    const { r, results } = await sweep([
      '--problem', 'harmonic-oscillator,kepler-circular',
      '-m', `${MODULES}/exits-mid-sweep.ts`,
      '-s', '10,20,40',
      '--jobs', '2',
    ]);
    // A finished, written sweep exits 0 whatever its runs' statuses.
    expect(r.code, r.stderr).toBe(0);
    expect(results.runs).toHaveLength(6);
    const runs = byKey(results.runs);
    for (const run of results.runs) {
      if (run.problem === 'harmonic-oscillator' && 'steps' in run.setting && run.setting.steps === 20) {
        expect(run.status).toBe('error');
        expect(run.message).toContain('exited');
        continue;
      }
      expect(run.status, `${key(run)}: ${run.message}`).toBe('ok');
      const steps = 'steps' in run.setting ? run.setting.steps : NaN;
      // Classical Runge-Kutta: 4 evaluations per step (Kutta 1901), exactly.
      expect(run.counts).toEqual({ nfev: 4 * steps, njev: 0, nlu: 0, accepted: steps, rejected: 0 });
    }
    expect(runs.size).toBe(6);
    expect(r.stdout).toContain('6 runs, 1 not ok (1 error).');
  }, 60_000);

  it('a right-hand side that never returns: --run-timeout 2 --jobs 1 ends that run with timeout, the others finish', async () => {
    const { r, results } = await sweep([
      '--problem', `${MODULES}/hangs-mid-span.ts,harmonic-oscillator`,
      '-m', 'rk4,midpoint',
      '-s', '10',
      '--run-timeout', '2',
      '--jobs', '1',
    ]);
    // A finished, written sweep exits 0 whatever its runs' statuses.
    expect(r.code, r.stderr).toBe(0);
    expect(results.runs).toHaveLength(4);
    const runs = byKey(results.runs);
    for (const m of ['rk4', 'midpoint']) {
      const hung = runs.get(`hangs-mid-span x ${m} @ 10`)!;
      expect(hung.status).toBe('timeout');
      expect(hung.message).toBe('run exceeded --run-timeout 2 s and its worker was terminated');
      expect(hung.error).toEqual({ final: null, max: null });
      expect(runs.get(`harmonic-oscillator x ${m} @ 10`)!.status).toBe('ok');
    }
    // Midpoint: 2 evaluations per step; the harmonic run's counts are exact.
    expect(runs.get('harmonic-oscillator x midpoint @ 10')!.counts).toEqual({ nfev: 20, njev: 0, nlu: 0, accepted: 10, rejected: 0 });
    expect(r.stdout).toContain('4 runs, 2 not ok (2 timeout).');
  }, 60_000);
});
