// The flight-style C propagator (examples/programs/c/leo_rk4.c), compiled here with the system
// compiler: its observed order, `choose` on it, and the CI gate (`baseline` + `check`) catching a
// degraded build. Skipped, with the reason, where there is no C compiler.
import { spawnSync } from 'node:child_process';
import { mkdirSync, mkdtempSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { dirname, join, resolve } from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { runSweep } from '../src/sweep/run.js';
import { resolveMethods, resolveProblems } from '../src/sweep/resolve.js';
import { chooseMethod } from '../src/sweep/choose.js';
import { measureRun } from '../src/measure/run-one.js';
import { findMethod } from '../src/methods/registry.js';
import { fitLogLog } from '../src/report/plots/fit.js';

const SOURCE = resolve('examples/programs/c/leo_rk4.c');
const LEO = resolve('examples/programs/leo-orbit.yaml');
const CLI = resolve('bin/stepgauge.js');
const compiler = spawnSync('gcc', ['--version']).status === 0 ? 'gcc' : spawnSync('cc', ['--version']).status === 0 ? 'cc' : null;
if (!compiler) console.warn('programs-c: skipped, no C compiler (gcc or cc) on this machine');

const tmp = mkdtempSync(join(tmpdir(), 'sg-programs-c-'));
afterAll(() => rmSync(tmp, { recursive: true, force: true }));

/** A build of leo_rk4.c and a program file for it, both in the temp folder. */
function build(name: string, defines: string[] = []): string {
  const dir = join(tmp, name);
  mkdirSync(join(dir, 'build'), { recursive: true });
  const out = spawnSync(compiler!, ['-O2', ...defines, '-o', join(dir, 'build', 'leo-rk4'), SOURCE, '-lm'], { encoding: 'utf8' });
  if (out.status !== 0) throw new Error(`compiling leo_rk4.c failed: ${out.stderr}`);
  const file = join(dir, 'c-leo-rk4.yaml');
  writeFileSync(file, 'id: c-leo-rk4\nname: Flight propagator, fixed-step RK4 (C)\nprogram: [./build/leo-rk4, --steps, "{steps}"]\nsettings: steps\nprotocol: once\norder: 4\ntimeout: 60\n');
  return file;
}

describe.skipIf(!compiler)('the C fixed-step RK4 program', () => {
  let good = '';
  let degraded = '';
  beforeAll(() => {
    good = build('good');
    degraded = build('degraded', ['-DSINGLE_PRECISION_GRAVITY']);
  });

  it('shows observed order 4 on its convergence points and matches stepgauge rk4 step for step', async () => {
    // Steps of 10 s down to 1.25 s: on this orbit the successive slopes are 4.42, 4.29, 4.07 (a
    // higher-order term still shows at 10 s), so the fit is taken where it has settled.
    const steps = [8640, 17280, 34560, 69120];
    const results = await runSweep({ problem: LEO, method: `${good},rk4`, steps, jobs: 1 });
    const c = results.runs.filter((r) => r.method === 'c-leo-rk4');
    const ts = results.runs.filter((r) => r.method === 'rk4');
    expect(c.map((r) => r.status)).toEqual(['ok', 'ok', 'ok', 'ok']);
    expect(ts.map((r) => r.status)).toEqual(['ok', 'ok', 'ok', 'ok']);
    // The fit the convergence plot draws: (h, error.final) on log-log axes.
    // A least-squares slope through the three finest (h, error.final) points, as the convergence
    // plot fits; its stricter 'observed order' (local orders agreeing within 0.1) is not reached
    // on this orbit in this range (4.29 then 4.07).
    const fit = fitLogLog(c.slice(1).map((r) => ({ x: (r.setting as { h: number }).h, y: r.error.final! })));
    // Classic RK4 is of order 4 (Kutta 1901); the fitted slope within 0.3 of it.
    expect(Math.abs(fit!.slope - 4)).toBeLessThan(0.3);
    // The same method in TypeScript: the same error to 3 digits at 10 s and 5 s steps. Finer, the
    // round-off of a different order of operations, amplified along-track over a day, shows (3%
    // apart at 1.25 s, where the error is 7e-8 km).
    for (const k of [0, 1]) expect(Math.abs(c[k]!.error.final! - ts[k]!.error.final!) / ts[k]!.error.final!).toBeLessThan(1e-3);
    expect(c.every((r) => r.countsReported === false)).toBe(true);
  });

  it('choose finds its largest step meeting a 100 m target', async () => {
    const problem = (await resolveProblems(LEO)).items[0]!;
    const method = (await resolveMethods(good)).items[0]!;
    const target = 0.1; // km: 100 m after a day
    const options = { target, measure: 'final' as const, cost: 'nfev' as const, maxSteps: 100_000, timing: { budgetSeconds: 0.05, minSamples: 1 } };
    const choice = await chooseMethod(problem, [method], options);
    expect(choice.recommended?.method).toBe('c-leo-rk4');
    const steps = (choice.recommended!.run!.setting as { steps: number }).steps;
    // Independently, with stepgauge's own rk4 (the same method): `steps` meets the target and
    // one step fewer (a larger step) does not.
    const rk4 = findMethod('rk4')!;
    const at = (n: number) => measureRun(problem, rk4, { steps: n }, { maxSteps: 1e6 }).error.final!;
    expect(at(steps)).toBeLessThanOrEqual(target);
    expect(at(steps - 1)).toBeGreaterThan(target);
  });

  it('is checked against a reference trajectory at every reported time the trajectory has', async () => {
    const results = await runSweep({ problem: resolve('examples/programs/leo-trajectory-reference.yaml'), method: good, steps: [8640], jobs: 1 });
    const run = results.runs[0]!;
    expect(run.status).toBe('ok');
    // 10 s steps land on every 600 s row of leo-reference.csv: 144 times after t0.
    expect(run.message).toMatch(/error checked at 144 of 8641 reported times/);
    expect(results.problems[0]!.reference).toMatchObject({ kind: 'trajectory', digits: 15 });
    // Recomputed from the program's own CSV and the circular-orbit formula at those times.
    const csv = spawnSync(join(dirname(good), 'build', 'leo-rk4'), ['--steps', '8640'], { encoding: 'utf8', maxBuffer: 1 << 28 }).stdout.trim().split('\n').slice(1);
    const mu = 398600.4418;
    const r = 6778.137;
    const n = Math.sqrt(mu / r ** 3);
    let max = 0;
    for (const line of csv) {
      const [t, ...y] = line.split(',').map(Number);
      if (t! <= 0 || Math.abs(t! / 600 - Math.round(t! / 600)) > 1e-9) continue;
      const exact = [r * Math.cos(n * t!), r * Math.sin(n * t!), -r * n * Math.sin(n * t!), r * n * Math.cos(n * t!)];
      max = Math.max(max, ...exact.map((v, i) => Math.abs(y[i]! - v)));
    }
    // The table carries 17 digits of positions near 6778 km: agreement to 1e-9 relative.
    expect(Math.abs(run.error.max! - max) / max).toBeLessThan(1e-9);
  });

  it('check fails on a degraded build and passes on the unchanged one', () => {
    const steps = '2160,4320,8640';
    const run = (name: string, method: string) => {
      const out = spawnSync('node', [CLI, 'run', '-q', '--no-report', '--jobs', '1', '--problem', LEO, '--method', method, '--steps', steps, '--out', join(tmp, name)], { encoding: 'utf8' });
      expect(out.status, out.stderr).toBe(0);
      return join(tmp, name, 'results.json');
    };
    const baselineFile = join(tmp, 'baseline.json');
    const base = spawnSync('node', [CLI, 'baseline', run('first', good), '--out', baselineFile], { encoding: 'utf8' });
    expect(base.status, base.stderr).toBe(0);
    const same = spawnSync('node', [CLI, 'check', run('again', good), '--baseline', baselineFile], { encoding: 'utf8' });
    expect(same.status, same.stdout + same.stderr).toBe(0);
    const worse = spawnSync('node', [CLI, 'check', run('worse', degraded), '--baseline', baselineFile], { encoding: 'utf8' });
    expect(worse.status, worse.stdout + worse.stderr).toBe(1);
    expect(worse.stdout).toMatch(/c-leo-rk4/);
    expect(worse.stdout).toMatch(/error\.final/);
  });
});
