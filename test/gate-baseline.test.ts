// Baseline files are committed: their bytes must not change under read -> write, nor with the
// order of runs in the results. SYNTHETIC results (test/fixtures/gate).
import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import { makeBaseline, parseBaseline, serializeBaseline } from '../src/gate/baseline.js';
import { syntheticResults, syntheticRun, syntheticSweep } from './fixtures/gate/synthetic.js';

describe('baseline serialisation', () => {
  it('is byte-identical after write -> read -> write, awkward numbers included', () => {
    const runs = [
      syntheticRun({ error: { final: 0.1 + 0.2, max: 5e-324 }, drift: { zeta: 1.7976931348623157e308, alpha: -0, mid: Number.NaN } }),
      syntheticRun({ method: 'other', setting: { rtol: 1e-6, atol: [1e-9, 3.3e-10] }, error: { final: null, max: null }, status: 'timeout' }),
      syntheticRun({ method: 'fixed', setting: { steps: 3, h: 1 / 3 }, errorBelowReference: true, unresolved: ['max', 'outputs', 'final'] }),
    ];
    for (const keepTime of [false, true]) {
      const first = serializeBaseline(makeBaseline(syntheticResults(runs), { keepTime }));
      const second = serializeBaseline(parseBaseline(first, 'b.json'));
      expect(second).toBe(first);
      expect(serializeBaseline(parseBaseline(second, 'b.json'))).toBe(first);
    }
    const b = parseBaseline(serializeBaseline(makeBaseline(syntheticResults(runs))), 'b.json');
    const osc = b.runs.find((r) => r.method === 'synthetic-rk')!;
    expect(Object.keys(osc.drift)).toEqual(['alpha', 'mid', 'zeta']); // sorted
    expect(Number.isNaN(osc.drift.mid)).toBe(true); // written as null, read back as NaN
    expect(osc.error.final).toBe(0.1 + 0.2);
    expect(osc.error.max).toBe(5e-324);
    // The unresolved marks of the two compared figures are kept, in one order; outputs is not compared.
    expect(b.runs.find((r) => r.method === 'fixed')!.unresolved).toEqual(['final', 'max']);
    expect(osc.unresolved).toBeUndefined();
    expect(() => parseBaseline(serializeBaseline(makeBaseline(syntheticResults(runs))).replace('"max"\n', '"maximum"\n'), 'b.json')).toThrow(/b\.json: field "runs\[0\]\.unresolved\[1\]" is "maximum", expected one of final, max/);
  });

  it('does not depend on run order in the results (property)', () => {
    const runs = syntheticSweep();
    const reference = serializeBaseline(makeBaseline(syntheticResults(runs)));
    fc.assert(
      fc.property(fc.shuffledSubarray(runs, { minLength: runs.length, maxLength: runs.length }), (shuffled) => {
        expect(serializeBaseline(makeBaseline(syntheticResults(shuffled, { problems: syntheticResults(runs).problems })))).toBe(reference);
      }),
      { numRuns: 30 },
    );
  });

  it('keeps what a check needs and nothing machine-specific unless asked', () => {
    const b = makeBaseline(syntheticResults([syntheticRun()]));
    expect(b.runs[0]).toEqual({
      problem: 'synthetic-osc',
      method: 'synthetic-rk',
      setting: { rtol: 1e-6, atol: 1e-9 },
      status: 'ok',
      error: { final: 1e-7, max: 2e-7 },
      drift: { energy: 1e-8 },
      counts: { nfev: 1000, njev: 0, nlu: 0, accepted: 160, rejected: 6 },
    });
    expect(b.problems).toEqual([{ id: 'synthetic-osc', sha256: 'sha-synthetic-osc' }]);
    expect(b.calibrationSeconds).toBeUndefined();
    const t = makeBaseline(syntheticResults([syntheticRun()]), { keepTime: true });
    expect(t.calibrationSeconds).toBe(0.01);
    expect(t.runs[0]!.time).toEqual({ medianSeconds: 0.002, calibrationRatio: 0.002 / 0.01 });
  });

  it('names file and field on malformed baselines', () => {
    const good = JSON.parse(serializeBaseline(makeBaseline(syntheticResults([syntheticRun()]))));
    good.runs[0].counts.nlu = 1.5;
    expect(() => parseBaseline(JSON.stringify(good), 'b.json')).toThrow('b.json: field "runs[0].counts.nlu" is 1.5, expected an integer >= 0');
    expect(() => parseBaseline('{"format":"stepgauge-baseline","version":2}', 'b.json')).toThrow(/b\.json: field "version" is 2; this reader reads stepgauge-baseline version 1 only/);
    expect(() => parseBaseline('not json', 'b.json')).toThrow(/b\.json: not valid JSON/);
  });
});
