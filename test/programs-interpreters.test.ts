// External programs in interpreters kept running for a sweep (protocol lines): SciPy's solve_ivp
// (DOP853 and Radau) and GNU Octave's ode45 on a MATLAB-style model. Each part is skipped, with
// the reason, where its interpreter is absent.
import { spawnSync } from 'node:child_process';
import { resolve } from 'node:path';
import { describe, expect, it } from 'vitest';
import { runSweep } from '../src/sweep/run.js';

const EX = resolve('examples/programs');
const LEO = `${EX}/leo-orbit.yaml`;

const scipy = spawnSync('python3', ['-c', 'import scipy.integrate'], { encoding: 'utf8' }).status === 0;
if (!scipy) console.warn('programs-interpreters: SciPy tests skipped, python3 with scipy is not available');
const octave = spawnSync('octave-cli', ['--version'], { encoding: 'utf8' }).status === 0;
if (!octave) console.warn('programs-interpreters: Octave test skipped, octave-cli is not installed (Debian package octave)');

describe.skipIf(!scipy)('SciPy solve_ivp through the protocol', () => {
  it('DOP853 reaches the same error as stepgauge dormand-prince-853 within a factor 2 at the same rtol', async () => {
    const tolerances = [1e-6, 1e-9];
    const results = await runSweep({ problem: LEO, method: `${EX}/scipy-dop853.yaml,dormand-prince-853`, tolerances, jobs: 1 });
    for (const rtol of tolerances) {
      const at = (m: string) => results.runs.find((r) => r.method === m && (r.setting as { rtol: number }).rtol === rtol)!;
      const theirs = at('scipy-dop853');
      const ours = at('dormand-prince-853');
      expect(theirs.status).toBe('ok');
      // Both are the Dormand-Prince 8(5,3) pair (Hairer, Norsett and Wanner, sec. II.10) with
      // their own step control; the criterion: the same error within a factor of 2.
      const ratio = theirs.error.final! / ours.error.final!;
      expect(ratio).toBeGreaterThan(0.5);
      expect(ratio).toBeLessThan(2);
      expect(theirs.counts.nfev).toBeGreaterThan(0);
      expect(theirs.counts.accepted).toBe(0); // solve_ivp reports no step counts; the program leaves them out
    }
  });

  it('Radau solves the stiff Van der Pol oscillator to its published reference', async () => {
    const results = await runSweep({ problem: 'van-der-pol-stiff', method: `${EX}/scipy-radau.yaml`, tolerances: [1e-6], jobs: 1 });
    const run = results.runs[0]!;
    expect(run.status).toBe('ok');
    // The reference is published at tEnd only (Mazzia and Magherini, Test Set for IVP Solvers,
    // VDPOL): the run says how many of its reported times could be checked.
    expect(run.message).toMatch(/error checked at 1 of \d+ reported times/);
    // Radau IIA at rtol 1e-6 on VDPOL: error of the order of the tolerance (common practice,
    // no source): below 1e-4.
    expect(run.error.final!).toBeLessThan(1e-4);
    expect(run.counts.nlu).toBeGreaterThan(0);
  });
});

describe.skipIf(!octave)('GNU Octave ode45 on a MATLAB-style model', () => {
  it('is measured at its own steps and its error falls with its tolerance', async () => {
    const results = await runSweep({ problem: LEO, method: `${EX}/octave-ode45.yaml,dormand-prince-54`, tolerances: [1e-6, 1e-8], jobs: 1 });
    const runs = results.runs.filter((r) => r.method === 'octave-ode45');
    expect(runs.map((r) => r.status)).toEqual(['ok', 'ok']);
    expect(runs.every((r) => r.time.basis === undefined || r.time.basis === 'reported')).toBe(true);
    // A 5(4) pair: 100x tighter rtol, error 100^(5/6) ~ 46x smaller in the ideal model
    // (per-step control of an order-5 method; common practice, no source): at least 10x here.
    expect(runs[0]!.error.final! / runs[1]!.error.final!).toBeGreaterThan(10);
    // Same family as stepgauge's dormand-prince-54: within a factor 10 at the same rtol (different
    // error norms and step controllers; common practice, no source).
    for (const r of runs) {
      const ours = results.runs.find((x) => x.method === 'dormand-prince-54' && (x.setting as { rtol: number }).rtol === (r.setting as { rtol: number }).rtol)!;
      const ratio = r.error.final! / ours.error.final!;
      expect(ratio).toBeGreaterThan(0.1);
      expect(ratio).toBeLessThan(10);
    }
  });
});
