// Comparison rules on SYNTHETIC results (test/fixtures/gate/synthetic.ts): each regression kind,
// improvements, floors, missing and new runs, and calibrated time.
import { describe, expect, it } from 'vitest';
import { compareResults, ROUNDOFF_FLOOR } from '../src/gate/compare.js';
import { makeBaseline } from '../src/gate/baseline.js';
import { InputError } from '../src/core/errors.js';
import { syntheticResults, syntheticRun } from './fixtures/gate/synthetic.js';

const base = syntheticResults([syntheticRun()]);
const withRun = (over: Parameters<typeof syntheticRun>[0]) => syntheticResults([syntheticRun(over)]);

describe('compareResults', () => {
  it('passes an identical run with no findings', () => {
    const c = compareResults(base, base);
    expect(c.ok).toBe(true);
    expect(c.summary).toMatchObject({ compared: 1, missing: 0, added: 0, regressions: 0, improvements: 0 });
  });

  it('fails when status goes from ok to something else and skips the numbers', () => {
    const c = compareResults(base, withRun({ status: 'step-limit', error: { final: null, max: null }, counts: { nfev: 99999, njev: 0, nlu: 0, accepted: 0, rejected: 0 } }));
    expect(c.ok).toBe(false);
    expect(c.regressions.map((f) => [f.metric, f.old, f.new])).toEqual([['status', 'ok', 'step-limit']]);
  });

  it('reports a status that became ok as an improvement', () => {
    const c = compareResults(withRun({ status: 'diverged' }), base);
    expect(c.ok).toBe(true);
    expect(c.improvements.map((f) => f.metric)).toEqual(['status']);
  });

  it('fails on error growth above the factor, with old, new and factor', () => {
    const c = compareResults(base, withRun({ error: { final: 2.5e-7, max: 4e-7 } }));
    // final: 2.5e-7 / 1e-7 = 2.5 > 2; max: 4e-7 / 2e-7 = 2, not above the factor.
    expect(c.regressions).toHaveLength(1);
    const f = c.regressions[0]!;
    expect(f.metric).toBe('error.final');
    expect(f.old).toBe(1e-7);
    expect(f.new).toBe(2.5e-7);
    expect(f.factor).toBeCloseTo(2.5, 12);
    expect(f.text).toContain('x2.5');
  });

  it('honours a custom error factor', () => {
    const c = compareResults(base, withRun({ error: { final: 2.5e-7, max: 2e-7 } }), { errorFactor: 3 });
    expect(c.ok).toBe(true);
  });

  it('reports error shrinkage beyond the factor as an improvement, never a failure', () => {
    const c = compareResults(base, withRun({ error: { final: 1e-9, max: 2e-7 } }));
    expect(c.ok).toBe(true);
    expect(c.improvements[0]!.factor).toBeCloseTo(0.01, 12);
  });

  it('does not fail on changes entirely below the roundoff floor', () => {
    const zero = withRun({ error: { final: 0, max: 0 }, drift: { energy: 0 } });
    const tiny = withRun({ error: { final: 1e-300, max: 3e-15 }, drift: { energy: 1e-15 } });
    const c = compareResults(zero, tiny);
    expect(c.ok).toBe(true);
    expect(ROUNDOFF_FLOOR).toBeCloseTo(1.42e-14, 15);
    // From the floor (1.42e-14) to 1e-12 is x70: a real regression.
    const c2 = compareResults(zero, withRun({ error: { final: 1e-12, max: 0 }, drift: { energy: 0 } }));
    expect(c2.regressions.map((f) => f.metric)).toEqual(['error.final']);
    expect(c2.regressions[0]!.factor).toBeCloseTo(1e-12 / ROUNDOFF_FLOOR, 6);
  });

  it('fails when an error measured in the baseline is null now', () => {
    const c = compareResults(base, withRun({ error: { final: null, max: 2e-7 } }));
    expect(c.regressions.map((f) => [f.metric, f.new])).toEqual([['error.final', null]]);
  });

  it('does not fail error growth when the current error is below the reference resolution', () => {
    const c = compareResults(base, withRun({ error: { final: 5e-7, max: 2e-7 }, errorBelowReference: true }));
    expect(c.ok).toBe(true);
    expect(c.runs[0]!.notes.join(' ')).toContain('below what the reference resolves');
  });

  it('reads each error figure\'s own unresolved mark: an unresolved error.max never regresses, a resolved one does', () => {
    // max 2e-7 -> 8e-7 (x4) and final 1e-7 -> 5e-7 (x5), both above the factor 2.
    const grown = { error: { final: 5e-7, max: 8e-7 } };
    const maxOnly = compareResults(base, withRun({ ...grown, unresolved: ['max'] }));
    expect(maxOnly.regressions.map((f) => f.metric)).toEqual(['error.final']);
    expect(maxOnly.runs[0]!.notes.join(' ')).toMatch(/error\.max: .*not a regression: the error is below what the reference resolves/);
    const both = compareResults(base, withRun({ ...grown, unresolved: ['final', 'max'], errorBelowReference: true }));
    expect(both.ok).toBe(true);
    // errorBelowReference speaks of error.final only: a resolved error.max still regresses.
    const finalOnly = compareResults(base, withRun({ ...grown, unresolved: ['final'], errorBelowReference: true }));
    expect(finalOnly.regressions.map((f) => f.metric)).toEqual(['error.max']);
    // The same verdicts when the current side is a baseline file, which keeps the marks.
    const asBaseline = compareResults(base, makeBaseline(withRun({ ...grown, unresolved: ['max', 'outputs'] })));
    expect(asBaseline.regressions.map((f) => f.metric)).toEqual(['error.final']);
  });

  it('fails on drift growth, on a vanished invariant and on a non-finite drift', () => {
    const grown = compareResults(base, withRun({ drift: { energy: 3e-8 } }));
    expect(grown.regressions.map((f) => [f.metric, f.factor])).toEqual([['drift.energy', 3e-8 / 1e-8]]);
    const gone = compareResults(base, withRun({ drift: {} }));
    expect(gone.regressions.map((f) => f.metric)).toEqual(['drift.energy']);
    const nan = compareResults(base, withRun({ drift: { energy: Number.NaN } }));
    expect(nan.regressions.map((f) => f.metric)).toEqual(['drift.energy']);
    const ok = compareResults(base, withRun({ drift: { energy: 3e-8 } }), { driftFactor: 4 });
    expect(ok.ok).toBe(true);
  });

  it('fails when nfev, njev or nlu grow by more than the fraction', () => {
    const c = compareResults(
      syntheticResults([syntheticRun({ counts: { nfev: 1000, njev: 10, nlu: 0, accepted: 1, rejected: 0 } })]),
      syntheticResults([syntheticRun({ counts: { nfev: 1100, njev: 12, nlu: 1, accepted: 500, rejected: 9 } })]),
    );
    // nfev +10% is at the limit (not above); njev +20% fails; nlu 0 -> 1 fails; accepted/rejected are not gated.
    expect(c.regressions.map((f) => [f.metric, f.old, f.new])).toEqual([
      ['counts.njev', 10, 12],
      ['counts.nlu', 0, 1],
    ]);
    expect(c.regressions[0]!.factor).toBeCloseTo(1.2, 12);
    expect(c.regressions[1]!.factor).toBeNull();
    const tight = compareResults(base, withRun({ counts: { nfev: 1011, njev: 0, nlu: 0, accepted: 160, rejected: 6 } }), { workFraction: 0.01 });
    expect(tight.regressions.map((f) => f.metric)).toEqual(['counts.nfev']);
  });

  it('reports fewer evaluations as an improvement', () => {
    const c = compareResults(base, withRun({ counts: { nfev: 800, njev: 0, nlu: 0, accepted: 160, rejected: 6 } }));
    expect(c.ok).toBe(true);
    expect(c.improvements.map((f) => [f.metric, f.factor])).toEqual([['counts.nfev', 0.8]]);
  });

  it('fails on a missing run unless allowMissing, and lists new runs without failing', () => {
    const other = syntheticRun({ method: 'synthetic-other' });
    const c = compareResults(syntheticResults([syntheticRun(), other]), base);
    expect(c.ok).toBe(false);
    expect(c.regressions.map((f) => [f.kind, f.method])).toEqual([['missing', 'synthetic-other']]);
    const allowed = compareResults(syntheticResults([syntheticRun(), other]), base, { allowMissing: true });
    expect(allowed.ok).toBe(true);
    expect(allowed.summary.missing).toBe(1);
    const added = compareResults(base, syntheticResults([syntheticRun(), other]));
    expect(added.ok).toBe(true);
    expect(added.summary.added).toBe(1);
  });

  it('matches fixed-step runs by steps and adaptive runs by rtol and atol', () => {
    const a = syntheticResults([syntheticRun({ setting: { steps: 100, h: 0.1 } }), syntheticRun({ setting: { rtol: 1e-6, atol: 1e-9 } })]);
    const b = syntheticResults([syntheticRun({ setting: { steps: 100, h: 0.1 } }), syntheticRun({ setting: { rtol: 1e-6, atol: 1e-8 } })]);
    const c = compareResults(a, b);
    expect(c.summary).toMatchObject({ compared: 1, missing: 1, added: 1 });
  });

  it('warns when the current file is a single shard or an interrupted sweep', () => {
    const shard = syntheticResults([syntheticRun()], { shard: { index: 2, count: 3, planSha256: 'p' }, interrupted: true });
    const c = compareResults(base, shard, { labels: { current: 's2.json' } });
    expect(c.warnings).toEqual([
      's2.json is shard 2/3; runs of the other shards count as missing (merge the shards first)',
      "s2.json is from an interrupted sweep; runs it did not reach count as missing",
    ]);
  });

  it('warns when a problem definition changed', () => {
    const changed = syntheticResults([syntheticRun()]);
    changed.problems[0]!.sha256 = 'sha-other';
    const c = compareResults(base, changed);
    expect(c.ok).toBe(true);
    expect(c.warnings.join('\n')).toMatch(/synthetic-osc: definition changed/);
  });

  it('compares time only with a factor, in units of each file\'s calibration', () => {
    const b = makeBaseline(base, { keepTime: true }); // 0.002 s / 0.01 s = 0.2 units
    // A machine 3x slower overall (calibration 0.03 s, run 0.006 s): same 0.2 units, passes.
    const slowMachine = syntheticResults([syntheticRun({ time: { medianSeconds: 0.006, samples: 5 } })], {
      environment: { ...base.environment, calibrationSeconds: 0.03 },
    });
    expect(compareResults(b, slowMachine).ok).toBe(true);
    expect(compareResults(b, slowMachine, { timeFactor: 1.5 }).ok).toBe(true);
    // The run alone got 3x slower on the same machine: 0.6 units, x3 > 1.5.
    const slowRun = withRun({ time: { medianSeconds: 0.006, samples: 5 } });
    expect(compareResults(b, slowRun).ok).toBe(true);
    const c = compareResults(b, slowRun, { timeFactor: 1.5 });
    expect(c.regressions.map((f) => f.metric)).toEqual(['time']);
    expect(c.regressions[0]!.factor).toBeCloseTo(3, 12);
  });

  it('refuses --time when calibration is missing in either file', () => {
    const noCal = syntheticResults([syntheticRun()], { environment: { ...base.environment, calibrationSeconds: undefined } });
    delete noCal.environment.calibrationSeconds;
    expect(() => compareResults(base, noCal, { timeFactor: 2, labels: { current: 'now.json' } })).toThrow(/now\.json: no calibration timing/);
    expect(() => compareResults(makeBaseline(base), base, { timeFactor: 2 })).toThrow(/--keep-time/);
    expect(() => compareResults(makeBaseline(base), base, { timeFactor: 2 })).toThrow(InputError);
  });

  it('rejects bad thresholds and duplicate runs as input errors', () => {
    expect(() => compareResults(base, base, { errorFactor: 0.5 })).toThrow(/--error-factor/);
    expect(() => compareResults(base, base, { workFraction: -1 })).toThrow(/--work-fraction/);
    const dup = syntheticResults([syntheticRun(), syntheticRun()]);
    expect(() => compareResults(base, dup, { labels: { current: 'dup.json' } })).toThrow(/dup\.json: field "runs\[1\]" repeats run/);
  });
});
