// results.json text: one run per line inside an indented file, and the same value as the plain
// JSON.stringify of the results (the JSON specification, RFC 8259, is the reference: any
// conforming parser must read both texts to equal values).
import { describe, expect, it } from 'vitest';
import { resultsJson } from '../src/results/json.js';
import { resultsCsv } from '../src/results/csv.js';
import { runSweep } from '../src/sweep/run.js';
import type { ResultsFile } from '../src/results/contract.js';
import { mkdtempSync, readFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { runCli } from './helpers/cli.js';

describe('results.json text', () => {
  it('parses to what JSON.stringify gives, with one line per run', async () => {
    const results = await runSweep({ problem: 'harmonic-oscillator,kepler-circular', method: 'dormand-prince-54,stormer-verlet', tolerances: [1e-5, 1e-7], steps: [200], timing: null });
    const text = resultsJson(results);
    expect(JSON.parse(text)).toEqual(JSON.parse(JSON.stringify(results)));
    const runLines = text.split('\n').filter((l) => l.startsWith('    {"problem":'));
    // 2 problems x 2 tolerances for dormand-prince-54, plus stormer-verlet at 200 steps on both
    // (both problems are separable): 6 runs, each on its own line.
    expect(results.runs.length).toBe(6);
    expect(runLines.length).toBe(6);
    expect(text.endsWith('}\n')).toBe(true);
  });

  it('writes non-finite numbers as null and leaves out undefined fields, as JSON.stringify does', () => {
    const file = {
      format: 'stepgauge-results',
      version: 1,
      interrupted: undefined,
      runs: [{ problem: 'p', error: { final: Number.NaN, max: Number.POSITIVE_INFINITY }, message: undefined }],
      problems: [],
    } as unknown as ResultsFile;
    const parsed = JSON.parse(resultsJson(file)) as Record<string, unknown>;
    expect(parsed).toEqual({ format: 'stepgauge-results', version: 1, runs: [{ problem: 'p', error: { final: null, max: null } }], problems: [] });
    expect('interrupted' in parsed).toBe(false);
  });

  it('writes an empty run list as []', () => {
    const text = resultsJson({ format: 'stepgauge-results', version: 1, runs: [] } as unknown as ResultsFile);
    expect(text).toBe('{\n  "format": "stepgauge-results",\n  "version": 1,\n  "runs": []\n}\n');
  });

  // `run` keeps no run: it writes results.json and results.csv from the lines its journal
  // serialised as each run finished, read back in plan order (issue 29). Both must be what the
  // library's in-memory sweep serialises: equal only if no run changed after it finished and the
  // streamed writer lays the file out as resultsJson does. Failed runs (a fixed-step explicit
  // method on a stiff problem, an error of Infinity/NaN) and a parallel sweep are included; --json
  // prints the written file.
  it.each([1, 2])('run --jobs %i writes results.json and results.csv as the in-memory sweep serialises them', async (jobs) => {
    const out = join(mkdtempSync(join(tmpdir(), 'stepgauge-json-lines-')), 'r');
    const r = await runCli(['run', '-p', 'kepler-circular,robertson', '-m', 'dormand-prince-54,rk4,hairer-wanner-rodas4', '-t', '1e-4,1e-6', '-s', '10,100', '--no-timing', '--no-report', '--json', '--jobs', String(jobs), '-o', out]);
    expect(r.code, r.stderr).toBe(0);
    const written = readFileSync(join(out, 'results.json'), 'utf8');
    expect(written).toBe(r.stdout);
    const runs = (JSON.parse(written) as ResultsFile).runs;
    expect(runs.some((x) => x.status !== 'ok')).toBe(true);
    expect(runs.length).toBeGreaterThan(8);
    const fresh = await runSweep({ problem: 'kepler-circular,robertson', method: 'dormand-prince-54,rk4,hairer-wanner-rodas4', tolerances: [1e-4, 1e-6], steps: [10, 100], timing: null });
    const text = resultsJson(fresh);
    // Everything from the runs to the plan, byte for byte (the environment and times differ).
    const from = (t: string) => t.slice(t.indexOf('  "runs": ['), t.indexOf('  "skipped":'));
    expect(from(written)).toBe(from(text));
    expect(readFileSync(join(out, 'results.csv'), 'utf8')).toBe(resultsCsv(fresh));
  });
});
