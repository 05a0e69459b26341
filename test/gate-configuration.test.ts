// A baseline records the configuration its numbers depend on (controller, step limit, --atol,
// stepgauge version, method hashes); `check` against a sweep made differently says so in its
// first line and compares only the runs the difference cannot touch.
import { mkdtempSync, readFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { describe, expect, it } from 'vitest';
import { runCli } from './helpers/cli.js';
import type { Baseline } from '../src/gate/baseline.js';

describe('baseline configuration', () => {
  it('says the controller differs first, and compares only the methods the controller does not touch', async () => {
    const dir = mkdtempSync(join(tmpdir(), 'sg-config-'));
    const sweep = (controller: string, out: string) =>
      runCli(['run', '-p', 'harmonic-oscillator', '-m', 'dormand-prince-54,rk4', '-t', '1e-5,1e-7', '-s', '100,200', '--controller', controller, '--no-timing', '--no-report', '-q', '--out', join(dir, out)]);
    expect((await sweep('standard', 'a')).code).toBe(0);
    expect((await sweep('pi', 'b')).code).toBe(0);
    const base = join(dir, 'base.json');
    expect((await runCli(['baseline', join(dir, 'a', 'results.json'), '--out', base])).code).toBe(0);
    const b = JSON.parse(readFileSync(base, 'utf8')) as Baseline;
    expect(b.configuration).toMatchObject({ controller: 'standard', maxSteps: 100000, atol: null });
    expect(b.configuration!.methods.map((m) => m.id)).toEqual(['dormand-prince-54', 'rk4']);
    expect(b.configuration!.methods.every((m) => /^[0-9a-f]{64}$/.test(m.sha256 ?? ''))).toBe(true);

    const r = await runCli(['check', '--baseline', base, join(dir, 'b', 'results.json')]);
    const first = r.stdout.split('\n')[0]!;
    expect(first).toContain('Configuration differs from the baseline: step-size controller standard (baseline) vs pi (now)');
    // dormand-prince-54's two runs use the controller: not compared; rk4's two are, and agree.
    expect(first).toContain('2 run(s) it touches were not compared');
    expect(r.stdout).toMatch(/Compared 2 of 4 baseline runs/);
    expect(r.stdout).toContain('0 regression(s)');
    expect(r.code).toBe(1);
    expect((await runCli(['check', '--baseline', base, join(dir, 'b', 'results.json'), '--allow-missing'])).code).toBe(0);
    // The same configuration: no such line, everything compared.
    const same = await runCli(['check', '--baseline', base, join(dir, 'a', 'results.json')]);
    expect(same.code).toBe(0);
    expect(same.stdout).not.toContain('Configuration differs');
    expect(same.stdout).toMatch(/Compared 4 of 4 baseline runs/);
  });
});
