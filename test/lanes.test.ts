// Workers started ahead of a sweep (prestartLanes): a parallel sweep takes them and gives the
// same runs as one in this process; lanes not taken are ended, so a run stopped by bad input
// still exits at once instead of waiting on idle workers.
import { describe, expect, it } from 'vitest';
import { spawnSync } from 'node:child_process';
import { join } from 'node:path';
import { createLane, laneStarted, LaneStartError, prestartLanes } from '../src/sweep/lanes.js';
import { runSweep, type SweepRequest } from '../src/sweep/run.js';
import type { ResultsFile } from '../src/results/contract.js';

const REQUEST: SweepRequest = {
  problem: 'harmonic-oscillator,van-der-pol',
  method: 'dormand-prince-54,rk4',
  tolerances: [1e-4, 1e-6],
  steps: [100, 200],
  timing: null,
};

/** Runs without what two executions of one sweep may differ in (wall time). */
function runsOf(r: ResultsFile): unknown {
  return r.runs.map((x) => ({ ...x, time: undefined }));
}

describe('prestarted lanes', () => {
  it('are taken by a parallel sweep, which matches the in-process sweep run for run', async () => {
    const serial = await runSweep({ ...REQUEST, jobs: 1 });
    const lanes = prestartLanes(3);
    let taken = 0;
    const counted = { take: () => (taken++, lanes.take()), release: () => lanes.release() };
    try {
      const parallel = await runSweep({ ...REQUEST, jobs: 2, lanes: counted });
      // Expected: 2 problems x (2 tolerances for dormand-prince-54 + 2 step counts for rk4) = 8 runs.
      expect(serial.runs.length).toBe(8);
      expect(runsOf(parallel)).toEqual(runsOf(serial));
      expect(taken).toBe(2);
    } finally {
      await lanes.release();
    }
    // The third lane went to release; nothing is left to take.
    expect(lanes.take()).toBeUndefined();
  });

  it('are ended when the input turns out bad, so the CLI exits promptly with code 2', () => {
    const bin = join(import.meta.dirname, '..', 'bin', 'stepgauge.js');
    const started = Date.now();
    const r = spawnSync(process.execPath, [bin, 'run', '--jobs', '2', '-p', 'no-such-problem', '--no-report', '-q', '-o', join(import.meta.dirname, 'never-written')], {
      encoding: 'utf8',
      timeout: 60_000,
    });
    expect(r.status).toBe(2);
    expect(r.stderr).toMatch(/no-such-problem/);
    // Common practice, no source: well under the 60 s kill timeout means no worker held the process open.
    expect(Date.now() - started).toBeLessThan(30_000);
  });

  it('are started and ended by runSweep itself when its caller gave none, bad input included', async () => {
    const script = `
      const { runSweep } = await import(${JSON.stringify(join(import.meta.dirname, '..', 'dist', 'src', 'sweep', 'run.js'))});
      const r = await runSweep({ problem: 'harmonic-oscillator', method: 'rk4', steps: [50, 100], timing: null, jobs: 2 });
      let bad = '';
      try { await runSweep({ problem: 'no-such-problem', timing: null, jobs: 2 }); } catch (e) { bad = String(e); }
      console.log(JSON.stringify({ runs: r.runs.length, bad }));
    `;
    const started = Date.now();
    const r = spawnSync(process.execPath, ['--input-type=module', '-e', script], { encoding: 'utf8', timeout: 60_000 });
    expect(r.status, r.stderr).toBe(0);
    const out = JSON.parse(r.stdout.trim().split('\n').at(-1)!) as { runs: number; bad: string };
    expect(out.runs).toBe(2);
    expect(out.bad).toMatch(/no-such-problem/);
    // Common practice, no source: the process exits on its own, well before the kill timeout, so
    // no worker of either sweep was left running.
    expect(Date.now() - started).toBeLessThan(30_000);
  });

  // Before this, a worker that failed to start left its tasks waiting forever: the CLI ended with
  // Node's exit code 13 and no message, or crashed on tinypool's unhandled 'error' event.
  it.each(['throws-on-load.mjs', 'exits-on-load.mjs'])('report a worker that cannot start (%s) instead of waiting on it', async (fixture) => {
    const lane = createLane(join(import.meta.dirname, 'fixtures', 'workers', fixture));
    try {
      const error = await laneStarted(lane).then(
        () => null,
        (e: unknown) => e,
      );
      expect(error).toBeInstanceOf(LaneStartError);
      expect(String((error as Error).message)).toMatch(/worker process stopped before it could run anything .*--jobs 1/);
      if (fixture === 'throws-on-load.mjs') expect((error as Error).message).toMatch(/failed to load \(fixture\)/);
    } finally {
      await lane.destroy();
    }
  });

  it('answer the start check of a healthy worker', async () => {
    const lane = createLane();
    try {
      await expect(laneStarted(lane)).resolves.toBeUndefined();
    } finally {
      await lane.destroy();
    }
  });
});
