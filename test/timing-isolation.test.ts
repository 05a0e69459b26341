// A timed sweep times each (problem, method) pair's runs in a fresh process that has run nothing
// else (src/sweep/clocks.ts), so the time recorded for a run does not depend on what else the
// sweep ran. The fixture method logs "<pid> <problem>" on every solve; the runs are measured once
// each (two solves: forward and the round trip back; in this process with --jobs 1, on lanes with
// --jobs 2) and timed with a warm-up of 20 solves plus samples, so the processes with more solves
// than the measuring takes in all are the clocks.
// Workers load the compiled dist/ build (npm test builds first).
import { mkdtempSync, readFileSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterAll, describe, expect, it } from 'vitest';
import { runCli } from './helpers/cli.js';
import type { ResultsFile } from '../src/results/contract.js';

const scratch: string[] = [];
afterAll(() => {
  for (const d of scratch) rmSync(d, { recursive: true, force: true });
});

async function timedSweep(jobs: number) {
  const dir = mkdtempSync(join(tmpdir(), 'sg-clocks-'));
  scratch.push(dir);
  const log = join(dir, 'solves.log');
  process.env.STEPGAUGE_TEST_PROCESS_LOG = log;
  try {
    const args = ['run', '-p', 'harmonic-oscillator,kepler-circular', '-m', 'test/fixtures/modules/records-process.ts', '-s', '10,20'];
    const r = await runCli([...args, '--time-budget', '0.01', '--jobs', String(jobs), '-q', '--no-report', '--out', join(dir, 'out')]);
    expect(r.code, r.stderr).toBe(0);
    const results = JSON.parse(readFileSync(join(dir, 'out', 'results.json'), 'utf8')) as ResultsFile;
    const byPid = new Map<string, string[]>();
    for (const line of readFileSync(log, 'utf8').trim().split('\n')) {
      const [pid, problem] = line.split(' ') as [string, string];
      byPid.set(pid, [...(byPid.get(pid) ?? []), problem]);
    }
    return { results, byPid };
  } finally {
    delete process.env.STEPGAUGE_TEST_PROCESS_LOG;
  }
}

describe('timing isolation', () => {
  it.each([1, 2])('--jobs %i: each pair is timed in its own process, which solves nothing else', async (jobs) => {
    const { results, byPid } = await timedSweep(jobs);
    expect(results.runs).toHaveLength(4);
    for (const run of results.runs) expect(run.time?.medianSeconds).toBeGreaterThan(0);
    const measured = 2 * results.runs.length;
    const clocks = [...byPid.values()].filter((solves) => solves.length > measured);
    const measuring = [...byPid.values()].filter((solves) => solves.length <= measured);
    expect(clocks).toHaveLength(2);
    expect(clocks.map((solves) => new Set(solves).size)).toEqual([1, 1]);
    expect(new Set(clocks.map((solves) => solves[0])).size).toBe(2);
    // Each run measured exactly once (two solves), outside the clocks.
    expect(measuring.reduce((n, solves) => n + solves.length, 0)).toBe(measured);
  });
});
