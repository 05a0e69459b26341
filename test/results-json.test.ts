// results.json text: one run per line inside an indented file, and the same value as the plain
// JSON.stringify of the results (the JSON specification, RFC 8259, is the reference: any
// conforming parser must read both texts to equal values).
import { describe, expect, it } from 'vitest';
import { resultsJson } from '../src/report/json.js';
import { runSweep } from '../src/sweep/run.js';
import type { ResultsFile } from '../src/core/results.js';

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
});
