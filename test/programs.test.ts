// External programs as methods (issue 25): the Node example and a deliberately faulty program,
// which run wherever the suite runs. Errors are checked against a recomputation from the program's
// own output and the analytic circular orbit, outside stepgauge's measurement code.
import { spawnSync } from 'node:child_process';
import { mkdtempSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join, resolve } from 'node:path';
import { afterAll, describe, expect, it } from 'vitest';
import { runSweep } from '../src/sweep/run.js';
import { loadProgramFile } from '../src/methods/program/file.js';
import { InputError } from '../src/core/errors.js';
import { summaryText } from '../src/cli/summary.js';
import { resultsCsv } from '../src/results/csv.js';
import { summarize } from '../src/report/summary.js';

const EXAMPLES = resolve('examples/programs');
const LEO = join(EXAMPLES, 'leo-orbit.yaml');
const FAULTY = resolve('test/fixtures/programs/faulty.mjs');
const CLI = resolve('bin/stepgauge.js');
const tmp = mkdtempSync(join(tmpdir(), 'sg-programs-'));
afterAll(() => rmSync(tmp, { recursive: true, force: true }));

/** The circular orbit of examples/programs/leo-orbit.yaml, written out again here. */
const MU = 398600.4418; // km^3/s^2, WGS 84
const R = 6778.137; // km
const N = Math.sqrt(MU / R ** 3);
function orbit(t: number): number[] {
  return [R * Math.cos(N * t), R * Math.sin(N * t), -R * N * Math.sin(N * t), R * N * Math.cos(N * t)];
}

function programFile(name: string, body: string): string {
  const path = join(tmp, name);
  writeFileSync(path, body);
  return path;
}

function faulty(mode: string, protocol: 'once' | 'lines' = 'once', timeout = 20): string {
  const lines = protocol === 'lines' ? ', --lines' : '';
  return programFile(
    `faulty-${mode}-${protocol}.yaml`,
    `id: faulty-${mode}\nname: faulty program (${mode})\nprogram: [node, ${FAULTY}, --mode, ${mode}${lines}]\nsettings: tolerance\nprotocol: ${protocol}\ntimeout: ${timeout}\n`,
  );
}

async function sweep(problem: string, method: string, tolerances: number[]) {
  return runSweep({ problem, method, tolerances, jobs: 1, timing: { budgetSeconds: 0.05, minSamples: 1 } });
}

describe('the Node example program', () => {
  it('records, at each setting, the errors a recomputation from its own output gives', async () => {
    const results = await sweep(LEO, join(EXAMPLES, 'node-bogacki-shampine.yaml'), [1e-6, 1e-8]);
    expect(results.runs.map((r) => r.status)).toEqual(['ok', 'ok']);
    for (const run of results.runs) {
      const rtol = (run.setting as { rtol: number }).rtol;
      // The request written independently of stepgauge's request builder.
      const request = {
        protocol: 'stepgauge-program',
        version: 1,
        problem: { id: 'leo-orbit', states: ['x', 'y', 'vx', 'vy'], t0: 0, tEnd: 86400, y0: [R, 0, 0, R * N], parameters: { mu: MU, r: R, n: N } },
        setting: { rtol, atol: rtol },
        outputTimes: [10800, 21600, 32400, 43200, 54000, 64800, 75600, 86400],
      };
      const out = spawnSync('node', [join(EXAMPLES, 'node/propagate.mjs')], { input: JSON.stringify(request), encoding: 'utf8', maxBuffer: 1 << 28 });
      const response = JSON.parse(out.stdout) as { times: number[]; states: number[][]; counts: Record<string, number> };
      const errors = response.times.map((t, k) => Math.max(...orbit(t).map((v, i) => Math.abs(response.states[k]![i]! - v))));
      const final = errors.at(-1)!;
      const max = Math.max(...errors);
      // Same program, same input: the same steps; the error scale of leo-orbit is absolute (km).
      expect(run.error.final!).toBeCloseTo(final, 9);
      expect(Math.abs(run.error.final! - final) / final).toBeLessThan(1e-9);
      expect(Math.abs(run.error.max! - max) / max).toBeLessThan(1e-9);
      expect(run.counts).toEqual({ nfev: response.counts.nfev, njev: 0, nlu: 0, accepted: response.counts.accepted, rejected: response.counts.rejected });
      expect(run.time.basis).toBe('reported');
    }
    // A 3rd-order pair: 100 times tighter tolerance, error about 100x smaller (proportionality,
    // common practice, no source): within a factor 3 of that.
    const [loose, tight] = results.runs.map((r) => r.error.final!);
    expect(loose! / tight!).toBeGreaterThan(100 / 3);
    expect(loose! / tight!).toBeLessThan(300);
    expect(results.methods).toEqual([expect.objectContaining({ id: 'node-bogacki-shampine', family: 'external', order: 3, program: expect.objectContaining({ protocol: 'once' }) })]);
  });

  it('gives the same runs through protocol lines as through once', async () => {
    const once = await sweep(LEO, join(EXAMPLES, 'node-bogacki-shampine.yaml'), [1e-5, 1e-7]);
    const lines = await sweep(LEO, join(EXAMPLES, 'node-bogacki-shampine-lines.yaml'), [1e-5, 1e-7]);
    expect(lines.runs.map((r) => [r.status, r.error, r.counts, r.yFinal])).toEqual(once.runs.map((r) => [r.status, r.error, r.counts, r.yFinal]));
  });
});

describe('models that only the program has', () => {
  it('a self-reference is the program at rtol 1e-12, marked in the runs, the problem record and the report', async () => {
    const model = programFile('oscillator-model.yaml', 'id: oscillator-model\ntitle: oscillator, model in the program\nmodel: program\nstates: [q, p]\ninitial: { q: 1, p: 0 }\nspan: [0, 20]\nerror: { scale: absolute }\nreference: { self: true }\n');
    const results = await sweep(model, faulty('ok'), [1e-4, 1e-6]);
    expect(results.runs.map((r) => r.status)).toEqual(['ok', 'ok']);
    const run = results.runs[0]!;
    expect(run.selfReference).toMatch(/faulty-ok at rtol 1e-12; trust 1\.80e-10 \(its disagreement with rtol 1e-11/);
    expect(run.message).toMatch(/cannot reveal a model error or a bias shared by every setting/);
    expect(results.problems[0]!.reference.kind).toBe('self');
    expect(summarize(results).findings.join(' ')).toMatch(/oscillator-model is measured against a self-reference/);
    // faulty.mjs reports q = cos(wt) + rtol * t: against itself at rtol 1e-12 the error at
    // t = 20 is (rtol - 1e-12) * 20, whatever the model.
    for (const r of results.runs) {
      const rtol = (r.setting as { rtol: number }).rtol;
      expect(Math.abs(r.error.final! - (rtol - 1e-12) * 20) / ((rtol - 1e-12) * 20)).toBeLessThan(1e-9);
    }
    // A built-in method cannot run a model it does not have: the pairing is refused.
    const none = await sweep(model, 'rk4', [1e-6]);
    expect(none.runs).toHaveLength(0);
    expect(JSON.stringify(none.skipped)).toMatch(/oscillator-model has no equations .*only external programs can run it/);
  });

  it('a program-model file without a usable reference is bad input naming the field', async () => {
    const file = programFile('model.yaml', 'id: m\ntitle: m\nmodel: program\nstates: [q]\ninitial: { q: 1 }\nspan: [0, 1]\nreference: { trajectory: none.csv }\n');
    await expect(sweep(file, faulty('ok'), [1e-3])).rejects.toThrow(/reference\.digits.*needs `digits`/);
  });
});

describe('faulty programs', () => {
  const problem = 'harmonic-oscillator';

  it('a correct program is measured against the exact solution at every reported time', async () => {
    const r = await sweep(problem, faulty('ok'), [1e-4]);
    const run = r.runs[0]!;
    expect(run.status).toBe('ok');
    // faulty.mjs adds rtol * t to q: at tEnd the error is 1e-4 * tEnd.
    expect(run.error.final!).toBeCloseTo(1e-4 * run.tFinal, 12);
    expect(run.counts.nfev).toBe(40);
  });

  it.each([
    ['exit1', 'error', /exited with code 1; stderr \(last 4 lines\): faulty: line 3 .*line 6 of the error output$/],
    ['garbage', 'error', /malformed output: not a JSON response, and the first line is not the CSV header t,q,p/],
    ['wrong-y0', 'error', /the state at t0 is not the requested y0: q = 2, expected 1/],
    ['nan', 'diverged', /non-finite value reported at t = /],
    ['crash', 'error', /the program crashed \(SIGSEGV\)/],
    ['short', 'error', /incomplete output: the last reported time is/],
  ])('%s gives status %s with a message saying why', async (mode, status, message) => {
    const r = await sweep(problem, faulty(mode), [1e-4]);
    expect(r.runs[0]!.status).toBe(status);
    expect(r.runs[0]!.message).toMatch(message);
    expect(r.runs[0]!.error).toEqual({ final: null, max: null });
  });

  it('a program that hangs is stopped at its timeout with its process group, and the sweep goes on', async () => {
    const r = await sweep(problem, faulty('grandchild', 'once', 1), [1e-3, 1e-4]);
    expect(r.runs.map((x) => x.status)).toEqual(['timeout', 'timeout']);
    expect(r.runs[0]!.message).toMatch(/no answer within 1 s; the program's process group was killed/);
    // The `sleep 1000` it started went with it.
    const left = spawnSync('pgrep', ['-f', 'sleep 1000'], { encoding: 'utf8' });
    if (left.error === undefined) expect(left.stdout.trim()).toBe('');
  });

  it('a kept process (protocol lines) that hangs is replaced for the next run', async () => {
    const r = await sweep(problem, faulty('hang-tight', 'lines', 1), [1e-4, 1e-8, 1e-6]);
    const byTol = new Map(r.runs.map((x) => [(x.setting as { rtol: number }).rtol, x]));
    expect(byTol.get(1e-8)!.status).toBe('timeout');
    expect(byTol.get(1e-4)!.status).toBe('ok');
    expect(byTol.get(1e-6)!.status).toBe('ok');
    expect(byTol.get(1e-6)!.error.final!).toBeCloseTo(1e-6 * byTol.get(1e-6)!.tFinal, 12);
  });

  it('CSV output is read, and its counts are "not reported"', async () => {
    const r = await sweep(problem, faulty('csv'), [1e-4]);
    const run = r.runs[0]!;
    expect(run.status).toBe('ok');
    expect(run.error.final!).toBeCloseTo(1e-4 * run.tFinal, 12);
    expect(run.countsReported).toBe(false);
    expect(resultsCsv(r).split('\n')[1]).toMatch(/,ok,[^,]*,[^,]*,[^,]*,,,,,,/);
  });

  it('a setting that changes nothing is a finding in the runs, the summary and the report', async () => {
    const r = await sweep(problem, faulty('ignore'), [1e-3, 1e-5]);
    expect(r.runs.map((x) => x.settingIgnored)).toEqual([true, true]);
    expect(r.runs[0]!.message).toMatch(/reported exactly the same trajectory at rtol 0.001, rtol 0.00001: changing the setting changed nothing/);
    expect(summaryText(r)).toMatch(/finding: faulty-ignore reported the same trajectory at 2 settings/);
    expect(summarize(r).findings).toHaveLength(1);
    // A program that does follow its setting is not flagged.
    const fine = await sweep(problem, faulty('ok'), [1e-3, 1e-5]);
    expect(fine.runs.map((x) => x.settingIgnored)).toEqual([undefined, undefined]);
  });
});

describe('program files', () => {
  const bad = (body: string) => () => loadProgramFile(programFile('bad.yaml', body));

  it('name the file and the field of every mistake', () => {
    expect(bad('id: x\nname: y\nprogram: "./prop --steps 4"\nsettings: steps\n')).toThrow(/bad\.yaml: program: expected a list of arguments/);
    expect(bad('id: My Prop\nname: y\nprogram: [node]\nsettings: steps\n')).toThrow(/bad\.yaml: id: must be kebab-case/);
    expect(bad('id: p\nname: y\nprogram: [node, "{rtol}"]\nsettings: steps\n')).toThrow(/program\[1\]: \{rtol\} is given only to programs with settings: tolerance/);
    expect(bad('id: p\nname: y\nprogram: [node, "{dt}"]\nsettings: steps\n')).toThrow(/program\[1\]: unknown placeholder \{dt\}/);
    expect(bad('id: p\nname: y\nprogram: [node]\nsettings: sometimes\n')).toThrow(/settings: /);
    expect(bad('id: p\nname: y\nprogram: [node]\nsettings: steps\nshell: true\n')).toThrow(/unknown field 'shell'/);
    expect(bad('id: p\nname: y\nprogram: [./no-such-program]\nsettings: steps\n')).toThrow(InputError);
  });

  it('a program that cannot be started is bad input: exit 2 and one line', () => {
    const file = programFile('missing.yaml', 'id: missing\nname: missing\nprogram: [./build/none, --steps, "{steps}"]\nsettings: steps\n');
    const out = spawnSync('node', [CLI, 'run', '-q', '--problem', 'harmonic-oscillator', '--method', file, '--out', join(tmp, 'never')], { encoding: 'utf8' });
    expect(out.status).toBe(2);
    expect(out.stderr.trim().split('\n')).toHaveLength(1);
    expect(out.stderr).toMatch(/program\[0\]: cannot start the program: '\.\/build\/none' does not exist/);
  });

  it('substitute placeholders argument by argument and resolve relative paths against the file', () => {
    const spec = loadProgramFile(join(EXAMPLES, 'c-leo-rk4.yaml').replace('c-leo-rk4', 'node-bogacki-shampine'));
    expect(spec.argv).toEqual(['node', './node/propagate.mjs']);
    expect(spec.cwd).toBe(EXAMPLES);
  });
});
