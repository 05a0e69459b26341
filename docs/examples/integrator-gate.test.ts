// Example: gate integrator accuracy and work inside your own vitest suite.
// Copy into your test folder. The baseline is made once with
//   npx stepgauge run -p harmonic-oscillator,kepler-eccentric -m dormand-prince-54 \
//     -t 1e-4..1e-8 --no-timing --no-report -o sweep
//   npx stepgauge baseline sweep/results.json --out test/stepgauge-baseline.json
// and committed; re-make it (and review the diff) when a change is meant to move the numbers.
import { describe, expect, it } from 'vitest';
import { runSweep } from 'stepgauge';
import { compareToBaseline, expectWithinBaseline } from 'stepgauge/vitest';

const BASELINE = new URL('./stepgauge-baseline.json', import.meta.url).pathname;

describe('integrator accuracy and work', () => {
  it('stays within the committed baseline', async () => {
    const results = await runSweep({
      problem: 'harmonic-oscillator,kepler-eccentric',
      method: 'dormand-prince-54',
      tolerances: [1e-4, 1e-5, 1e-6, 1e-7, 1e-8],
      jobs: 1,
    });
    // Throws an AssertionError listing each regression (old value, new value, factor).
    expectWithinBaseline(results, BASELINE, { errorFactor: 2, workFraction: 0.05 });
  });

  it('reports improvements too, for a reviewer to refresh the baseline', async () => {
    const results = await runSweep({ problem: 'kepler-eccentric', method: 'dormand-prince-54', tolerances: [1e-6], jobs: 1 });
    // One run against its baseline entry; other baseline runs are not required here.
    const c = compareToBaseline(results.runs[0]!, BASELINE);
    expect(c.regressions).toEqual([]);
    if (c.improvements.length > 0) console.log(c.improvements.map((f) => f.text).join('\n'));
  });
});
