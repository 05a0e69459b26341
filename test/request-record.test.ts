// --resume reads the saved request back under the rules a fresh request obeys (core/setting.ts):
// a damaged record fails with its field named, a sound one comes back as it was saved.
import { describe, expect, it } from 'vitest';
import { InputError } from '../src/core/errors.js';
import { requestFromRecord } from '../src/sweep/request-record.js';
import { sweepRequestRecord, type SweepRequest } from '../src/sweep/run.js';

describe('a saved sweep request', () => {
  it('comes back as it was saved', () => {
    const req: SweepRequest = { problem: 'van-der-pol', tolerances: [1e-4, 1e-7], steps: [100, 200], maxSteps: 5000, timing: { budgetSeconds: 0.1, minSamples: 3 }, controller: 'pi', runTimeoutSeconds: 2, shard: { index: 2, count: 3 } };
    expect(requestFromRecord(JSON.parse(JSON.stringify(sweepRequestRecord(req))), 'results.json')).toEqual(req);
  });

  it('keeps "no timing" as it was saved (null)', () => {
    expect(requestFromRecord({ timing: null, maxSteps: 10 }, 'results.json')).toEqual({ timing: null, maxSteps: 10 });
  });

  it.each([
    [{ tolerances: [5] }, /request\.tolerances\[0\].*must be below 1/],
    [{ tolerances: [1e-20] }, /request\.tolerances\[0\].*below double precision/],
    [{ tolerances: ['1e-4'] }, /request\.tolerances\[0\]/],
    [{ steps: [10.5] }, /request\.steps\[0\].*positive whole number/],
    [{ maxSteps: 0 }, /request\.maxSteps/],
    [{ controller: 'fuzzy' }, /request\.controller.*standard, pi, deadband/],
    [{ shard: { index: 4, count: 3 } }, /request\.shard\.index/],
    [[], /request/],
  ])('refuses %j with the field named', (record, message) => {
    expect(() => requestFromRecord(record, 'results.json')).toThrow(InputError);
    expect(() => requestFromRecord(record, 'results.json')).toThrow(message);
  });
});
