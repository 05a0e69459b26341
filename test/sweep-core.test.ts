// End-to-end checks of `stepgauge run` on the catalogue: reported numbers against independent
// recomputation, bad input, statuses and the results contract.
import { describe, expect, it } from 'vitest';
import { mkdtempSync, readFileSync, existsSync, readdirSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { runCli } from './helpers/cli.js';
import type { ResultsFile } from '../src/results/contract.js';

function tmp(): string {
  return mkdtempSync(join(tmpdir(), 'stepgauge-sweep-'));
}

/** Kepler's equation E - e sin E = M by bisection: independent of the catalogue's Newton solver. */
function keplerBisection(M: number, e: number): number {
  let lo = M - 1.5;
  let hi = M + 1.5;
  for (let k = 0; k < 200; k++) {
    const mid = (lo + hi) / 2;
    if (mid - e * Math.sin(mid) - M > 0) hi = mid;
    else lo = mid;
  }
  return (lo + hi) / 2;
}

describe('run on kepler-eccentric', () => {
  it('reports an error.final that anyone recomputing it from yFinal and the exact orbit gets', async () => {
    const out = join(tmp(), 'r');
    const r = await runCli(['run', '-p', 'kepler-eccentric', '-m', 'dormand-prince-54', '-t', '1e-10', '--no-timing', '--no-report', '-q', '--out', out]);
    expect(r.code, r.stderr).toBe(0);
    const results = JSON.parse(readFileSync(join(out, 'results.json'), 'utf8')) as ResultsFile;
    const run = results.runs[0]!;
    expect(run.status).toBe('ok');
    // Exact two-body solution (a = 1, mu = 1, e = 0.6, periapsis on +x at t = 0): standard
    // ellipse formulas, e.g. Danby, Fundamentals of Celestial Mechanics, sec. 6.3.
    const e = 0.6;
    const t = 20 * Math.PI;
    const E = keplerBisection(t % (2 * Math.PI), e);
    const b = Math.sqrt(1 - e * e);
    const rr = 1 - e * Math.cos(E);
    const exact = [Math.cos(E) - e, b * Math.sin(E), -Math.sin(E) / rr, (b * Math.cos(E)) / rr];
    const recomputed = Math.max(...run.yFinal.map((v, i) => Math.abs(v - exact[i]!)));
    expect(run.tFinal).toBe(t);
    expect(run.error.final).toBeGreaterThan(0);
    expect(Math.abs(run.error.final! - recomputed) / recomputed).toBeLessThan(1e-6);
    expect(run.error.max).toBeGreaterThanOrEqual(run.error.final!);
    expect(run.counts.accepted).toBeGreaterThan(0);
    // A tolerance of 1e-10 over ten orbits: global error well below 1e-4 (common practice, no source).
    expect(run.error.final).toBeLessThan(1e-4);
  });
});

describe('results contract', () => {
  it('writes results.json and results.csv with the contract fields', async () => {
    const out = join(tmp(), 'c');
    const r = await runCli(['run', '-p', 'harmonic-oscillator', '-m', 'rk4,bogacki-shampine-32', '-t', '1e-4,1e-6', '-s', '200,400', '--no-timing', '--no-report', '-q', '--out', out]);
    expect(r.code, r.stderr).toBe(0);
    const results = JSON.parse(readFileSync(join(out, 'results.json'), 'utf8')) as ResultsFile;
    expect(results.format).toBe('stepgauge-results');
    expect(results.version).toBe(1);
    expect(results.runs).toHaveLength(4);
    for (const key of ['node', 'platform', 'arch', 'cpu', 'stepgauge']) expect(results.environment).toHaveProperty(key);
    const fixed = results.runs.find((x) => x.method === 'rk4' && 'steps' in x.setting && x.setting.steps === 200)!;
    expect(fixed.setting).toEqual({ steps: 200, h: 0.1 });
    // rk4 is four evaluations per step (Kutta 1901).
    expect(fixed.counts.nfev).toBe(800);
    expect(results.problems[0]!.sha256).toMatch(/^[0-9a-f]{64}$/);
    const csv = readFileSync(join(out, 'results.csv'), 'utf8').split('\n');
    expect(csv[0]!.startsWith('problem,method,rtol,atol,steps,h,status,error_final,error_max,drift_max,nfev,njev,nlu,accepted,rejected,time_median_s')).toBe(true);
    expect(csv.filter((l) => l.length > 0)).toHaveLength(5);
  });

  it('records an explicit method asked for on a stiff problem as step-limit, with a stiffness hint', async () => {
    const out = join(tmp(), 's');
    const r = await runCli(['run', '-p', 'robertson', '-m', 'dormand-prince-54', '-t', '1e-6', '--max-steps', '2000', '--no-timing', '--no-report', '-q', '--out', out]);
    expect(r.code).toBe(0); // completed and written; the failed run is a result
    const results = JSON.parse(readFileSync(join(out, 'results.json'), 'utf8')) as ResultsFile;
    expect(results.runs[0]!.status).toBe('step-limit');
    expect(results.runs[0]!.message).toMatch(/stiff/);
    expect(results.runs[0]!.error.final).toBeNull();
  });
});

describe('bad input', () => {
  const cases: [string[], RegExp][] = [
    [['-p', 'no-such-problem'], /--problem: unknown problem 'no-such-problem'/],
    [['-m', 'no-such-method'], /--method: unknown method 'no-such-method'/],
    [['-t', ''], /--tolerances: no tolerance given; expected a list/],
    [['-t', '1e-4,,1e-6'], /--tolerances: empty entry/],
    [['-t', 'abc'], /--tolerances: 'abc' is not a number/],
    [['-t', '-1e-3'], /--tolerances: .* must be positive/],
    [['-t', '1e-3..'], /--tolerances/],
    [['-s', '0'], /--steps: '0' must be positive/],
    [['-s', '10.5'], /--steps: .* whole number/],
    [['--max-steps', '-4'], /--max-steps/],
    [['--controller', 'fuzzy'], /--controller/],
    [['--jobs', '0'], /--jobs/],
  ];
  for (const [args, message] of cases) {
    it(`rejects ${args.join(' ')} with exit 2 and writes nothing`, async () => {
      const dir = tmp();
      const r = await runCli(['run', ...args, '--no-timing', '-q', '--out', join(dir, 'out')]);
      expect(r.code).toBe(2);
      expect(r.stderr).toMatch(message);
      expect(r.stderr.split('\n').filter(Boolean)).toHaveLength(1);
      expect(readdirSync(dir)).toEqual([]);
    });
  }

  it('rejects an output folder that cannot be written', async () => {
    const dir = tmp();
    const file = join(dir, 'plain-file');
    (await import('node:fs')).writeFileSync(file, 'x');
    const r = await runCli(['run', '-p', 'harmonic-oscillator', '-m', 'rk4', '--no-timing', '-q', '--out', join(file, 'sub')]);
    expect(r.code).toBe(2);
    expect(r.stderr).toMatch(/--out/);
    expect(existsSync(join(file, 'sub'))).toBe(false);
  });
});
