// Parallel sweeps, reproducibility and interruption: what changes between runs of the same sweep
// must be wall time and creation time only.
import { describe, expect, it } from 'vitest';
import { mkdtempSync, readFileSync, writeFileSync, existsSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { runCli } from './helpers/cli.js';
import type { ResultsFile } from '../src/results/contract.js';

function tmp(): string {
  return mkdtempSync(join(tmpdir(), 'stepgauge-par-'));
}

function read(dir: string): ResultsFile {
  return JSON.parse(readFileSync(join(dir, 'results.json'), 'utf8')) as ResultsFile;
}

/**
 * The results without what legitimately differs between two runs of one sweep: the time, and the
 * state of the working folder's git checkout, which an edit between the two runs changes.
 */
function comparable(r: ResultsFile): unknown {
  return {
    ...r,
    createdAt: undefined,
    // The command line says how this file was made (its --out, --jobs), like createdAt.
    command: undefined,
    environment: { ...r.environment, calibrationSeconds: undefined, commit: undefined, commitDirty: undefined },
    runs: r.runs.map((x) => ({ ...x, time: undefined })),
  };
}

const SWEEP = ['-p', 'harmonic-oscillator,van-der-pol,kepler-circular', '-m', 'rk4,dormand-prince-54,stormer-verlet,tsitouras-54', '-t', '1e-4..1e-7', '-s', '100,400', '--no-report', '-q'];

describe('parallel and repeated sweeps', () => {
  it('gives identical results with --jobs 1 and --jobs 2 (apart from time)', async () => {
    const a = join(tmp(), 'a');
    const b = join(tmp(), 'b');
    expect((await runCli(['run', ...SWEEP, '--no-timing', '--jobs', '1', '--out', a])).code).toBe(0);
    expect((await runCli(['run', ...SWEEP, '--no-timing', '--jobs', '2', '--out', b])).code).toBe(0);
    expect(read(a).runs.length).toBe(3 * (4 + 4 + 2 + 2) - 2);
    expect(comparable(read(b))).toEqual(comparable(read(a)));
  });

  it('is reproducible: two timed runs differ only in time and createdAt', async () => {
    const a = join(tmp(), 'a');
    const b = join(tmp(), 'b');
    const args = ['run', '-p', 'harmonic-oscillator', '-m', 'rk4,bogacki-shampine-32', '-t', '1e-4,1e-6', '-s', '100', '--time-budget', '0.01', '--no-report', '-q', '--jobs', '1'];
    expect((await runCli([...args, '--out', a])).code).toBe(0);
    expect((await runCli([...args, '--out', b])).code).toBe(0);
    const ra = read(a);
    expect(ra.runs.every((r) => r.time.medianSeconds !== null && r.time.medianSeconds > 0)).toBe(true);
    expect(ra.environment.calibrationSeconds).toBeGreaterThan(0);
    expect(comparable(read(b))).toEqual(comparable(ra));
  });

  it('resumes an interrupted sweep without repeating finished runs', async () => {
    const full = join(tmp(), 'full');
    expect((await runCli(['run', ...SWEEP, '--no-timing', '--jobs', '1', '--out', full])).code).toBe(0);
    // An interrupted sweep as the run command leaves it: the first runs finished, flagged interrupted.
    const whole = read(full);
    const partialDir = join(tmp(), 'partial');
    const { mkdirSync } = await import('node:fs');
    mkdirSync(partialDir);
    const partial = { ...whole, interrupted: true, runs: whole.runs.slice(0, 7) };
    writeFileSync(join(partialDir, 'results.json'), JSON.stringify(partial));
    const r = await runCli(['run', '--resume', partialDir, '--no-report', '-q', '--jobs', '1']);
    expect(r.code, r.stderr).toBe(0);
    const resumed = read(partialDir);
    expect(resumed.interrupted).toBeUndefined();
    expect(comparable(resumed)).toEqual(comparable(whole));
    expect(existsSync(join(partialDir, 'results.csv'))).toBe(true);
  });

  it('refuses to resume a finished sweep', async () => {
    const dir = join(tmp(), 'done');
    expect((await runCli(['run', '-p', 'harmonic-oscillator', '-m', 'rk4', '-s', '100', '--no-timing', '--no-report', '-q', '--out', dir])).code).toBe(0);
    const r = await runCli(['run', '--resume', dir, '-q']);
    expect(r.code).toBe(2);
    expect(r.stderr).toMatch(/nothing to resume/);
  });
});
