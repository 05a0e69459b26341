// The `stepgauge/vitest` helper used the way a team would: gate runs inside a test.
// SYNTHETIC results (test/fixtures/gate).
import { describe, expect, it } from 'vitest';
import { AssertionError } from 'node:assert';
import { mkdtempSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { compareToBaseline, expectWithinBaseline } from '../src/gate/vitest.js';
import { makeBaseline, serializeBaseline } from '../src/gate/baseline.js';
import { syntheticResults, syntheticRun } from './fixtures/gate/synthetic.js';

const results = syntheticResults([syntheticRun(), syntheticRun({ method: 'synthetic-two' })]);
const baseline = makeBaseline(results);

describe('stepgauge/vitest', () => {
  it('passes a run within the baseline and returns the comparison', () => {
    const c = expectWithinBaseline(syntheticRun(), baseline);
    expect(c.ok).toBe(true);
    expect(c.summary.compared).toBe(1); // only the run given is checked
  });

  it('throws an AssertionError listing each regression', () => {
    const worse = syntheticRun({ counts: { nfev: 1500, njev: 0, nlu: 0, accepted: 160, rejected: 6 } });
    let thrown: unknown;
    try {
      expectWithinBaseline(worse, baseline);
    } catch (e) {
      thrown = e;
    }
    expect(thrown).toBeInstanceOf(AssertionError);
    expect((thrown as Error).message).toContain('1 regression(s) against the baseline');
    expect((thrown as Error).message).toContain('counts.nfev: 1000 -> 1500 (+50%, limit +10%)');
    expect(() => expectWithinBaseline(worse, baseline, { workFraction: 0.6 })).not.toThrow();
  });

  it('fails a run that has no baseline rather than passing it silently', () => {
    const c = compareToBaseline(syntheticRun({ method: 'never-seen' }), baseline);
    expect(c.ok).toBe(false);
    expect(c.regressions[0]!.text).toContain('no baseline run');
  });

  it('checks a whole results file, missing runs included, and reads a baseline path', () => {
    const dir = mkdtempSync(join(tmpdir(), 'stepgauge-vitest-'));
    const path = join(dir, 'baseline.json');
    writeFileSync(path, serializeBaseline(baseline));
    expect(expectWithinBaseline(results, path).summary.compared).toBe(2);
    const partial = syntheticResults([syntheticRun()]);
    expect(compareToBaseline(partial, path).regressions.map((f) => f.kind)).toEqual(['missing']);
    expect(compareToBaseline(partial, path, { allowMissing: true }).ok).toBe(true);
  });
});
