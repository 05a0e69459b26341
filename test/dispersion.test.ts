// Dispersions: reproducible draws with the stated distributions, a two-body closed form from any
// bound state, samples as ordinary problems, distributions over samples, and a sharded dispersion
// sweep (index from the batch engine's variable) that merges into the unsharded one run for run.
import { mkdtempSync, readdirSync, readFileSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterAll, describe, expect, it } from 'vitest';
import { erf } from 'mathjs';
import { normalDraw, uniformDraw } from '../src/problems/dispersion/sample.js';
import { ellipticState, twoBodyFromState } from '../problems/physics/kepler.js';
import { quantileOf } from '../src/core/quantile.js';
import { resolveMethods, resolveProblems } from '../src/sweep/resolve.js';
import { chooseOverSamples } from '../src/sweep/choose-envelope.js';
import { measureRun } from '../src/measure/run-one.js';
import { odexMethod } from '../src/methods/external/odex.js';
import type { Problem } from '../src/core/types.js';
import { runCli } from './helpers/cli.js';
import type { ResultsFile } from '../src/results/contract.js';

const scratch: string[] = [];
afterAll(() => scratch.forEach((d) => rmSync(d, { recursive: true, force: true })));
function freshDir(): string {
  const d = mkdtempSync(join(tmpdir(), 'sg-dispersion-'));
  scratch.push(d);
  return d;
}

/**
 * Kolmogorov-Smirnov distance between the sample and a continuous CDF. The 1% critical value for
 * large n is 1.63 / sqrt(n) (Massey, J. Am. Stat. Assoc. 46 (1951), table 1, asymptotic row).
 */
function ksDistance(values: number[], cdf: (x: number) => number): number {
  const s = [...values].sort((a, b) => a - b);
  let d = 0;
  s.forEach((x, i) => {
    const F = cdf(x);
    d = Math.max(d, Math.abs(F - i / s.length), Math.abs((i + 1) / s.length - F));
  });
  return d;
}

describe('dispersion draws', () => {
  const N = 20000;
  it('are uniform on (0, 1) and normal with mean 0, sd 1 (Kolmogorov-Smirnov at 1%)', () => {
    const u = Array.from({ length: N }, (_, k) => uniformDraw(12345, k + 1, 0, 0));
    expect(u.every((x) => x > 0 && x < 1)).toBe(true);
    expect(ksDistance(u, (x) => x)).toBeLessThan(1.63 / Math.sqrt(N));
    const z = Array.from({ length: N }, (_, k) => normalDraw(12345, k + 1, 3));
    // Standard normal CDF: (1 + erf(x / sqrt 2)) / 2, erf from mathjs.
    expect(ksDistance(z, (x) => (1 + (erf(x / Math.SQRT2) as number)) / 2)).toBeLessThan(1.63 / Math.sqrt(N));
  });
  it('depend only on (seed, sample, quantity): the same bits in any order, and other seeds differ', () => {
    const forward = Array.from({ length: 50 }, (_, k) => normalDraw(9, k + 1, 2));
    const backward = Array.from({ length: 50 }, (_, k) => normalDraw(9, 50 - k, 2)).reverse();
    expect(backward).toEqual(forward);
    expect(normalDraw(10, 1, 2)).not.toBe(forward[0]);
    expect(normalDraw(9, 1, 3)).not.toBe(forward[0]);
  });
});

describe('two-body motion from any bound state (f and g functions)', () => {
  it("agrees with Kepler's equation from periapsis (Danby sec. 6.3) over ten periods", () => {
    const e = 0.6;
    const y0 = new Float64Array(4);
    ellipticState(0, 1, e, 1, y0);
    const fg = twoBodyFromState([...y0], 2, 1, 0)!;
    const a = new Float64Array(4);
    const b = new Float64Array(4);
    for (let k = 0; k <= 400; k++) {
      const t = (k * 20 * Math.PI) / 400 + 0.013 * k;
      ellipticState(t, 1, e, 1, a);
      fg(t, b);
      for (let i = 0; i < 4; i++) expect(Math.abs(a[i]! - b[i]!)).toBeLessThan(2e-12);
    }
  });
  it('matches odex at tight tolerance from a dispersed state, and keeps energy and angular momentum', () => {
    const y0 = [0.41, -0.02, 0.05, 1.93];
    const fg = twoBodyFromState(y0, 2, 1, 0)!;
    const problem: Problem = {
      id: 'tb', title: 'tb', source: 'test', dimension: 4, t0: 0, tEnd: 12, y0,
      f: (_t, y, dy) => { const r3 = Math.hypot(y[0]!, y[1]!) ** 3; dy[0] = y[2]!; dy[1] = y[3]!; dy[2] = -y[0]! / r3; dy[3] = -y[1]! / r3; },
      stiff: false, invariants: [], errorScale: { kind: 'absolute' }, reference: { kind: 'certified' }, checkTimes: [], definition: 'tb',
    };
    // odex (Gragg-Bulirsch-Stoer, the registry package) as the outside integrator.
    const r = odexMethod.solve(problem, { rtol: 1e-13, atol: 1e-13 }, { maxSteps: 100000 });
    const out = new Float64Array(4);
    fg(12, out);
    for (let i = 0; i < 4; i++) expect(Math.abs(out[i]! - r.yFinal[i]!)).toBeLessThan(1e-9);
    const energy = (y: ArrayLike<number>) => (y[2]! ** 2 + y[3]! ** 2) / 2 - 1 / Math.hypot(y[0]!, y[1]!);
    const h = (y: ArrayLike<number>) => y[0]! * y[3]! - y[1]! * y[2]!;
    for (const t of [0.5, 3, 7.7, 40, 400]) {
      fg(t, out);
      expect(Math.abs(energy(out) - energy(y0))).toBeLessThan(1e-13);
      expect(Math.abs(h(out) - h(y0))).toBeLessThan(1e-13);
    }
    expect(twoBodyFromState([1, 0, 0, 1.5], 2, 1, 0)).toBeUndefined(); // unbound: no ellipse
  });
});

describe('nearest-rank quantile', () => {
  // Definition 1 of Hyndman and Fan (1996): the ceil(q n)-th smallest value.
  it('is the ceil(q n)-th smallest value', () => {
    const v = Array.from({ length: 20 }, (_, i) => i + 1);
    expect(quantileOf(v, 0.95)).toBe(19);
    expect(quantileOf(v, 0.5)).toBe(10);
    expect(quantileOf(v, 1)).toBe(20);
    expect(quantileOf(v, 0.01)).toBe(1);
  });
});

function writeDispersion(dir: string, name: string, text: string): string {
  const path = join(dir, name);
  writeFileSync(path, text);
  return path;
}

describe('samples are problems', () => {
  it('disperse a built-in orbit with exact references from each sample state', async () => {
    const dir = freshDir();
    const file = writeDispersion(dir, 'd.yaml', 'base: kepler-eccentric\ndispersion:\n  samples: 4\n  seed: 1\n  initial:\n    vy: { normal: 0.01 }\n  cases:\n    - { x: 0.39 }\n');
    const { items } = await resolveProblems(file);
    expect(items.map((p) => p.id)).toEqual(['kepler-eccentric-s1', 'kepler-eccentric-s2', 'kepler-eccentric-s3', 'kepler-eccentric-s4', 'kepler-eccentric-s5']);
    expect(new Set(items.map((p) => p.definition)).size).toBe(5);
    for (const p of items) {
      expect(p.reference.kind).toBe('exact');
      expect(p.y0[0]).toBe(p.dispersion!.explicitCase ? 0.39 : 0.4);
      const at0 = new Float64Array(4);
      p.reference.exact!(0, at0);
      [...at0].forEach((v, i) => expect(v).toBeCloseTo(p.y0[i]!, 14));
    }
    expect(items[4]!.y0[3]).toBe(2); // the explicit case moves x only
  });

  it('are built one at a time when asked for: sample 999,999 of a million alone, and the runs of one sample share its build', async () => {
    const dir = freshDir();
    const file = writeDispersion(dir, 'big.yaml', 'base: kepler-circular\ndispersion:\n  samples: 1000000\n  seed: 7\n  initial:\n    x: { normal: 0.001 }\n');
    const { problemSources } = await import('../src/sweep/resolve.js');
    const sources = await problemSources(file);
    const p = sources.get('kepler-circular-s999999');
    // Box-Muller (Box and Muller, Ann. Math. Stat. 29, 1958) on the sample's own uniform draws:
    // x = 1 + 0.001 sqrt(-2 ln u1) cos(2 pi u2), the nominal x of kepler-circular being 1.
    const u1 = uniformDraw(7, 999999, 0, 0);
    const u2 = uniformDraw(7, 999999, 0, 1);
    expect(p.y0[0]).toBe(1 + 0.001 * Math.sqrt(-2 * Math.log(u1)) * Math.cos(2 * Math.PI * u2));
    expect(p.dispersion!.sample).toBe(999999);
    expect(sources.get('kepler-circular-s999999')).toBe(p);
    expect(() => sources.get('kepler-circular-s1000001')).toThrow(/no problem 'kepler-circular-s1000001'/);
  });

  it('rebuild a file model for each parameter value, with its exact solution', async () => {
    const dir = freshDir();
    const file = writeDispersion(
      dir,
      'osc.yaml',
      [
        'id: spring', 'title: spring', 'states: [x, v]', 'parameters: { w: 2 }', 'span: [0, 3]',
        'equations: { x: v, v: -w^2 * x }', 'initial: { x: 1, v: 0 }', 'reference: { exact: { x: cos(w*t), v: -w*sin(w*t) } }',
        'dispersion: { samples: 3, seed: 5, parameters: { w: { uniform: [1, 3] } } }',
      ].join('\n'),
    );
    const { items } = await resolveProblems(file);
    expect(items).toHaveLength(3);
    for (const p of items) {
      const w = p.dispersion!.values.w!;
      expect(w).toBeGreaterThanOrEqual(1);
      expect(w).toBeLessThanOrEqual(3);
      const dy = new Float64Array(2);
      p.f(0, Float64Array.from([1, 0]), dy);
      expect(dy[1]).toBeCloseTo(-w * w, 12);
      const out = new Float64Array(2);
      p.reference.exact!(3, out);
      expect(out[0]).toBeCloseTo(Math.cos(3 * w), 14); // x = cos(w t), the analytic solution
    }
  });

  it.each([
    ['initial:\n    z: { normal: 1 }', /dispersion\.initial\.z: no state is called 'z'/],
    ['samples: 0', /no samples and no cases/],
  ])('refuses a bad block (%s)', async (block, says) => {
    const dir = freshDir();
    const body = block.startsWith('samples') ? `  ${block}\n  seed: 1\n` : `  samples: 2\n  seed: 1\n  ${block}\n`;
    const file = writeDispersion(dir, 'bad.yaml', `base: kepler-eccentric\ndispersion:\n${body}`);
    const r = await runCli(['run', '-p', file, '-m', 'rk4', '-s', '10', '--no-timing', '-q', '-o', join(dir, 'out')]);
    expect(r.code).toBe(2);
    expect(r.stderr).toMatch(says);
  });
});

const withoutTime = (f: ResultsFile) => ({ ...f, createdAt: '', environment: {}, runs: f.runs.map((r) => ({ ...r, time: null })) });

describe('a dispersion sweep on a cluster', () => {
  // 1,000 samples, two methods, four settings each: 8,000 runs, once whole and once as four shards
  // whose index comes from JOB_COMPLETION_INDEX (a Kubernetes Indexed Job counts from 0).
  it('merged from four shards equals the unsharded sweep run for run', async () => {
    const dir = freshDir();
    const file = writeDispersion(dir, 'orbit.yaml', 'base: kepler-eccentric\ndispersion:\n  samples: 1000\n  seed: 42\n  initial:\n    x: { normal: 0.002 }\n    vy: { normal: 0.004 }\n');
    const args = ['run', '-p', file, '-m', 'dormand-prince-54,tsitouras-54', '-t', '1e-4..1e-7', '--no-timing', '-q', '--no-report', '--jobs', '1'];
    const whole = await runCli([...args, '-o', join(dir, 'whole')]);
    expect(whole.code, whole.stderr).toBe(0);
    const shards: string[] = [];
    const saved = process.env.JOB_COMPLETION_INDEX;
    try {
      for (let k = 0; k < 4; k++) {
        process.env.JOB_COMPLETION_INDEX = String(k);
        const r = await runCli([...args, '--shard', '4', '-o', join(dir, `shard-${k}`)]);
        expect(r.code, r.stderr).toBe(0);
        shards.push(join(dir, `shard-${k}`, 'results.json'));
      }
    } finally {
      if (saved === undefined) delete process.env.JOB_COMPLETION_INDEX;
      else process.env.JOB_COMPLETION_INDEX = saved;
    }
    const merged = await runCli(['merge', ...shards, '--out', join(dir, 'merged.json')]);
    expect(merged.code, merged.stderr).toBe(0);
    const a = JSON.parse(readFileSync(join(dir, 'whole', 'results.json'), 'utf8')) as ResultsFile;
    const b = JSON.parse(readFileSync(join(dir, 'merged.json'), 'utf8')) as ResultsFile;
    expect(a.runs).toHaveLength(8000);
    expect(withoutTime(b).runs).toEqual(withoutTime(a).runs);
    expect(b.problems).toEqual(a.problems);

    // The envelope of the merged file: its 95% figure per setting recomputed here by sorting each
    // setting's 1,000 final errors and taking the 950th (nearest rank).
    const env = await runCli(['envelope', join(dir, 'merged.json'), '--target', '1e-3', '--json']);
    expect(env.code, env.stderr).toBe(0);
    const { summary, choice } = JSON.parse(env.stdout) as { summary: { rows: { method: string; setting: { rtol: number }; quantile: number; samples: number }[] }; choice: { recommended: { method: string; setting: { rtol: number }; meanNfev: number } | null }[] };
    expect(summary.rows).toHaveLength(8);
    for (const row of summary.rows) {
      const errors = b.runs.filter((r) => r.method === row.method && 'rtol' in r.setting && r.setting.rtol === row.setting.rtol).map((r) => r.error.final!).sort((x, y) => x - y);
      expect(row.samples).toBe(1000);
      expect(row.quantile).toBe(errors[949]);
    }
    const rec = choice[0]!.recommended!;
    const meeting = summary.rows.filter((r) => r.quantile <= 1e-3);
    expect(meeting.length).toBeGreaterThan(0);
    const cheapest = Math.min(...meeting.map((r) => b.runs.filter((x) => x.method === r.method && 'rtol' in x.setting && x.setting.rtol === r.setting.rtol).reduce((s, x) => s + x.counts.nfev, 0) / 1000));
    expect(rec.meanNfev).toBe(cheapest);
  }, 300_000);
});

describe('choose over a dispersion', () => {
  it('recommends a setting that meets the target on at least 95% of the samples, checked against odex', async () => {
    const dir = freshDir();
    const file = writeDispersion(dir, 'orbit.yaml', 'base: kepler-eccentric\ndispersion:\n  samples: 120\n  seed: 3\n  initial:\n    x: { normal: 0.003 }\n    vy: { normal: 0.006 }\n');
    const samples = (await resolveProblems(file)).items;
    const methods = (await resolveMethods('dormand-prince-54,tsitouras-54')).items;
    const target = 1e-5;
    const choice = chooseOverSamples('kepler-eccentric', samples, methods, { target, measure: 'final', quantile: 0.95, maxSteps: 100000 });
    const rec = choice.recommended!;
    expect(rec).not.toBeNull();
    const method = methods.find((m) => m.id === rec.method)!;
    const setting = rec.setting!;
    // Rerun on every sample, and recompute a share of the errors against odex at tight tolerance.
    let meeting = 0;
    samples.forEach((p, i) => {
      const s = 'rtol' in setting ? { rtol: setting.rtol, atol: setting.rtol } : { steps: setting.steps };
      const run = measureRun(p, method, s, { maxSteps: 100000 });
      if (run.status === 'ok' && run.error.final! <= target) meeting++;
      if (i % 12 === 0) {
        const ref = odexMethod.solve(p, { rtol: 1e-13, atol: 1e-13 }, { maxSteps: 200000 }).yFinal;
        const independent = Math.max(...run.yFinal.map((v, k) => Math.abs(v - ref[k]!)));
        expect(Math.abs(independent - run.error.final!)).toBeLessThan(1e-9 + 1e-3 * independent);
      }
    });
    expect(meeting / samples.length).toBeGreaterThanOrEqual(0.95);
    expect(rec.failing.length).toBe(samples.length - meeting);
  }, 300_000);
});

describe('the report of a dispersion', () => {
  it('collapses the samples into one section of 95th-percentile errors against mean work', async () => {
    const dir = freshDir();
    const file = writeDispersion(dir, 'orbit.yaml', 'base: kepler-eccentric\ndispersion:\n  samples: 40\n  seed: 8\n  initial:\n    vy: { normal: 0.005 }\n');
    const r = await runCli(['run', '-p', file, '-m', 'rk4', '-s', '1000,2000', '--no-timing', '-q', '-o', join(dir, 'out')]);
    expect(r.code, r.stderr).toBe(0);
    const results = JSON.parse(readFileSync(join(dir, 'out', 'results.json'), 'utf8')) as ResultsFile;
    const { withDispersionsCollapsed } = await import('../src/report/dispersion-view.js');
    const view = withDispersionsCollapsed(results);
    expect(view.problems.map((p) => p.id)).toEqual(['kepler-eccentric-dispersion']);
    expect(view.runs).toHaveLength(2);
    for (const run of view.runs) {
      const steps = (run.setting as { steps: number }).steps;
      const errors = results.runs.filter((x) => (x.setting as { steps: number }).steps === steps).map((x) => x.error.final!).sort((a, b) => a - b);
      expect(run.error.final).toBe(errors[37]); // ceil(0.95 * 40) = 38th smallest
    }
    const plots = readdirSync(join(dir, 'out', 'plots'));
    expect(plots.every((p) => p.startsWith('kepler-eccentric-dispersion-'))).toBe(true);
  }, 120_000);
});
