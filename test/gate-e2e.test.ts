// The gate end to end on real sweeps: a baseline re-run unchanged passes; a worsened step
// controller fails with a JUnit failure; shards merged equal the unsharded sweep.
import { describe, expect, it } from 'vitest';
import { mkdtempSync, readFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { runCli } from './helpers/cli.js';
import type { ResultsFile } from '../src/results/contract.js';

const here = join(import.meta.dirname, 'fixtures', 'gate-e2e');
function tmp(): string {
  return mkdtempSync(join(tmpdir(), 'stepgauge-gate-'));
}
function read(path: string): ResultsFile {
  return JSON.parse(readFileSync(path, 'utf8')) as ResultsFile;
}
const SWEEP = ['-p', 'kepler-eccentric,harmonic-oscillator', '-t', '1e-5..1e-9', '--no-timing', '--no-report', '-q', '--jobs', '1'];

describe('check on real sweeps', () => {
  it('passes an unchanged re-run and fails a worsened controller, with JUnit failures', async () => {
    const dir = tmp();
    const before = join(dir, 'before');
    expect((await runCli(['run', ...SWEEP, '-m', join(here, 'dp54-wrapped.ts'), '--out', before])).code).toBe(0);
    const baseline = join(dir, 'baseline.json');
    expect((await runCli(['baseline', join(before, 'results.json'), '--out', baseline])).code).toBe(0);

    const same = join(dir, 'same');
    expect((await runCli(['run', ...SWEEP, '-m', join(here, 'dp54-wrapped.ts'), '--out', same])).code).toBe(0);
    const ok = await runCli(['check', '--baseline', baseline, join(same, 'results.json')]);
    expect(ok.code, ok.stdout + ok.stderr).toBe(0);

    const worse = join(dir, 'worse');
    expect((await runCli(['run', ...SWEEP, '-m', join(here, 'dp54-worse.ts'), '--out', worse])).code).toBe(0);
    const junit = join(dir, 'gate.xml');
    const bad = await runCli(['check', '--baseline', baseline, join(worse, 'results.json'), '--junit', junit]);
    expect(bad.code).toBe(1);
    expect(bad.stdout).toMatch(/team-dp54/);
    const xml = readFileSync(junit, 'utf8');
    // One test case per run (2 problems x 5 tolerances) and at least one failure among them.
    expect(xml.match(/<testcase /g)?.length).toBe(10);
    expect((xml.match(/<failure /g)?.length ?? 0)).toBeGreaterThan(0);
    expect(xml).toMatch(/error/);
  });
});

describe('shards', () => {
  it('three shards merged equal the unsharded sweep in everything but time', async () => {
    const dir = tmp();
    const args = ['run', '-p', 'harmonic-oscillator,van-der-pol,robertson', '-m', 'rk4,dormand-prince-54,radau-iia-5,bdf-variable', '-t', '1e-4..1e-7', '-s', '100,200', '--no-timing', '--no-report', '-q', '--jobs', '1'];
    const whole = join(dir, 'whole');
    // Exit 0: rk4 with 100 equal steps over Robertson's 1e11 span fails, and that failure is a result.
    expect((await runCli([...args, '--out', whole])).code).toBe(0);
    const parts: string[] = [];
    for (const k of [1, 2, 3]) {
      const out = join(dir, `shard-${k}`);
      expect((await runCli([...args, '--shard', `${k}/3`, '--out', out])).code).toBe(0);
      parts.push(join(out, 'results.json'));
    }
    const sizes = parts.map((p) => read(p).runs.length);
    expect(sizes.reduce((a, b) => a + b, 0)).toBe(read(join(whole, 'results.json')).runs.length);
    expect(Math.min(...sizes)).toBeGreaterThan(0);
    const merged = join(dir, 'all.json');
    const m = await runCli(['merge', ...parts, '--out', merged]);
    expect(m.code, m.stderr).toBe(0);
    const strip = (r: ResultsFile) => r.runs.map((x) => ({ ...x, time: undefined }));
    expect(strip(read(merged))).toEqual(strip(read(join(whole, 'results.json'))));
    expect(read(merged).problems).toEqual(read(join(whole, 'results.json')).problems);
    // Overlapping shards are refused.
    const overlap = await runCli(['merge', parts[0]!, parts[0]!, '--out', join(dir, 'bad.json')]);
    expect(overlap.code).toBe(2);
  });
});
