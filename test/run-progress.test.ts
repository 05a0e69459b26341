// `run` outside a terminal: a progress line every few seconds (done/total, failures, time left),
// certification said and timed, and exit 0 for a finished sweep whatever its runs' statuses.
import { mkdtempSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { describe, expect, it } from 'vitest';
import { plainLines, PLAIN_PROGRESS_SECONDS } from '../src/cli/progress.js';
import type { RunResult } from '../src/results/contract.js';
import { runCli } from './helpers/cli.js';

describe('progress lines outside a terminal', () => {
  it('writes one line per interval with done/total, failures and the time left at the pace so far', () => {
    const lines: string[] = [];
    let now = 0;
    const p = plainLines(100, { isTTY: false, write: (t) => lines.push(t), now: () => now });
    const last = {} as RunResult;
    now = 1000;
    p.update({ done: 1, total: 100, failed: 0, last });
    expect(lines).toEqual([]); // within the first interval: quiet
    now = PLAIN_PROGRESS_SECONDS * 1000;
    p.update({ done: 25, total: 100, failed: 2, last });
    // 25 runs in 5 s: 75 more take 15 s at that pace (arithmetic).
    expect(lines).toEqual(['stepgauge: 25/100 runs, 2 failed, 5 s elapsed, about 15 s left\n']);
    now += 1000;
    p.update({ done: 30, total: 100, failed: 2, last });
    expect(lines).toHaveLength(1);
  });
});

describe('run exit codes and notes', () => {
  it('exits 0 when runs failed but the sweep was written; 3 with --fail-on-failed-runs', async () => {
    const dir = mkdtempSync(join(tmpdir(), 'sg-exit-'));
    // rk4 with --max-steps 50 cannot do 100 steps: step-limit (a result, not a failure of the sweep).
    const args = ['run', '-p', 'harmonic-oscillator', '-m', 'rk4', '-s', '10,100', '--max-steps', '50', '--no-timing', '--no-report', '-q'];
    expect((await runCli([...args, '--out', join(dir, 'a')])).code).toBe(0);
    expect((await runCli([...args, '--out', join(dir, 'b'), '--fail-on-failed-runs'])).code).toBe(3);
  });

  it('says that it certifies a reference, with which methods, and how long it took', async () => {
    const dir = mkdtempSync(join(tmpdir(), 'sg-cert-'));
    const cache = join(dir, 'cache');
    const problem = join(dir, 'decay.yaml');
    writeFileSync(problem, 'id: decay2\ntitle: decay\nstates: [x]\nequations: { x: -2 * x }\ninitial: { x: 1 }\nspan: [0, 1]\nerror: { measure: states, scale: absolute }\n');
    const before = process.env.STEPGAUGE_CACHE;
    process.env.STEPGAUGE_CACHE = cache;
    try {
      const r = await runCli(['run', '-p', problem, '-m', 'rk4', '-s', '10', '--no-timing', '--no-report', '--out', join(dir, 'o')]);
      expect(r.code, r.stderr).toBe(0);
      expect(r.stderr).toContain(`${problem}: no reference given; certifying one (dormand-prince-853 and odex at rtol 1e-13, and dormand-prince-853 again with steps at most 1/2000 of the span`);
      expect(r.stderr).toMatch(/certified in \d+\.\d s: certified by stepgauge: dormand-prince-853 at rtol 1e-13 with steps at most 0\.000500; dormand-prince-853 at rtol 1e-13; odex at rtol 1e-13 agree/);
      // From the cache the second time: nothing to say.
      const again = await runCli(['run', '-p', problem, '-m', 'rk4', '-s', '10', '--no-timing', '--no-report', '--out', join(dir, 'o2')]);
      expect(again.stderr).not.toContain('certifying');
    } finally {
      if (before === undefined) delete process.env.STEPGAUGE_CACHE;
      else process.env.STEPGAUGE_CACHE = before;
    }
  });
});
