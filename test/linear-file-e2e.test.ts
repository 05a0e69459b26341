// The catalogue's linear-oscillator-chain given as a state-space file reproduces the catalogue's
// errors to the last printed digit (3 significant digits), run through the whole CLI.
import { describe, expect, it } from 'vitest';
import { mkdtempSync, readFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { runCli } from './helpers/cli.js';
import type { ResultsFile } from '../src/results/contract.js';
import { sig3 } from '../src/report/format.js';

const file = join(import.meta.dirname, '..', 'examples', 'linear-chain.yaml');

describe('linear model from a file', () => {
  it('matches the catalogue chain run for run', async () => {
    const dir = mkdtempSync(join(tmpdir(), 'stepgauge-lin-'));
    const common = ['-m', 'dormand-prince-54,rk4,radau-iia-5', '-t', '1e-4..1e-8', '-s', '200,800', '--no-timing', '--no-report', '-q', '--jobs', '1'];
    expect((await runCli(['run', '-p', 'linear-oscillator-chain', ...common, '--out', join(dir, 'cat')])).code).toBe(0);
    expect((await runCli(['run', '-p', file, ...common, '--out', join(dir, 'file')])).code).toBe(0);
    const a = JSON.parse(readFileSync(join(dir, 'cat', 'results.json'), 'utf8')) as ResultsFile;
    const b = JSON.parse(readFileSync(join(dir, 'file', 'results.json'), 'utf8')) as ResultsFile;
    expect(b.problems[0]!.reference.kind).toBe('exact');
    expect(b.runs).toHaveLength(a.runs.length);
    a.runs.forEach((r, i) => {
      const s = b.runs[i]!;
      expect(s.method).toBe(r.method);
      expect(sig3(s.error.final)).toBe(sig3(r.error.final));
      expect(sig3(s.error.max)).toBe(sig3(r.error.max));
      expect(s.counts).toEqual(r.counts);
    });
  });
});
