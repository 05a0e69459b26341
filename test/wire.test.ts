// Runs crossing from a worker: pack, Node's structured clone (v8.serialize, the serializer the
// worker channel uses with serialization 'advanced'), unpack. IEEE 754 doubles must come back
// bit for bit: Object.is tells NaN, -0 and the infinities apart.
import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import { deserialize, serialize } from 'node:v8';
import { packRun, unpackRun } from '../src/sweep/wire.js';
import type { RunResult } from '../src/core/results.js';

const doubles = fc.array(fc.double(), { maxLength: 40 });

function runWith(yFinal: number[], t: number[], energy: number[]): RunResult {
  return {
    problem: 'p', method: 'm', setting: { rtol: 1e-6, atol: 1e-9 }, status: 'ok',
    error: { final: 1e-7, max: 2e-7 }, drift: { energy: 3e-9 },
    counts: { nfev: 1, njev: 0, nlu: 0, accepted: 1, rejected: 0 },
    time: { medianSeconds: null, samples: 0 }, tFinal: 1, yFinal, trace: { t, drift: { energy } },
  } as RunResult;
}

describe('runs across the worker channel', () => {
  it('keep every double of the final state and the drift traces, bit for bit', () => {
    fc.assert(
      fc.property(doubles, doubles, doubles, (y, t, e) => {
        const arrived = unpackRun(deserialize(serialize(packRun(runWith([...y], [...t], [...e])))) as RunResult);
        const same = (a: number[], b: number[]) => a.length === b.length && a.every((v, i) => Object.is(v, b[i]));
        return Array.isArray(arrived.yFinal) && same(arrived.yFinal, y) && same(arrived.trace!.t, t) && same(arrived.trace!.drift.energy!, e);
      }),
      { numRuns: 300 },
    );
  });

  it('cross as Float64Array and arrive as plain arrays, a run without a trace included', () => {
    const packed = packRun(runWith([1, Number.NaN, -0], [0, 1], [0, Number.POSITIVE_INFINITY]));
    expect(packed.yFinal).toBeInstanceOf(Float64Array);
    expect(packed.trace!.drift.energy).toBeInstanceOf(Float64Array);
    const bare = runWith([2], [], []);
    delete bare.trace;
    const back = unpackRun(deserialize(serialize(packRun(bare))) as RunResult);
    expect(back.yFinal).toEqual([2]);
    expect(back.trace).toBeUndefined();
  });
});
