// Shard selection: a deterministic partition balanced by expected cost (property tests).
import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import { assignShards, parseShardSpec, selectShard } from '../src/sweep/shard.js';

const runsArb = fc.array(
  fc.record({ id: fc.nat(), expectedCost: fc.option(fc.double({ min: 0, max: 1000, noNaN: true }), { nil: undefined }) }),
  { maxLength: 60 },
);

describe('selectShard', () => {
  it('puts every run in exactly one shard and keeps input order', () => {
    fc.assert(
      fc.property(runsArb, fc.integer({ min: 1, max: 9 }), (runs, count) => {
        const seen = new Map<object, number>();
        for (let k = 1; k <= count; k++) {
          const shard = selectShard(runs, k, count);
          const positions = shard.map((r) => runs.indexOf(r));
          expect(positions).toEqual([...positions].sort((a, b) => a - b));
          for (const r of shard) seen.set(r, (seen.get(r) ?? 0) + 1);
        }
        expect(seen.size).toBe(runs.length);
        for (const n of seen.values()) expect(n).toBe(1);
      }),
    );
  });

  it('balances: heaviest minus lightest shard is at most the largest single cost', () => {
    fc.assert(
      fc.property(runsArb, fc.integer({ min: 1, max: 9 }), (runs, count) => {
        const cost = (r: { expectedCost?: number }) => r.expectedCost ?? 1;
        const loads = Array.from({ length: count }, (_, k) => selectShard(runs, k + 1, count).reduce((s, r) => s + cost(r), 0));
        const biggest = runs.reduce((m, r) => Math.max(m, cost(r)), 0);
        expect(Math.max(...loads) - Math.min(...loads)).toBeLessThanOrEqual(biggest + 1e-9 * (1 + biggest));
      }),
    );
  });

  it('is deterministic and independent of which shard asks', () => {
    fc.assert(
      fc.property(runsArb, fc.integer({ min: 1, max: 6 }), (runs, count) => {
        expect(assignShards(runs, count)).toEqual(assignShards(runs.map((r) => ({ ...r })), count));
      }),
    );
  });

  it('spreads equal-cost runs round-robin by plan order', () => {
    const runs = Array.from({ length: 7 }, (_, i) => ({ planIndex: i, expectedCost: 1 }));
    expect(assignShards(runs, 3)).toEqual([1, 2, 3, 1, 2, 3, 1]);
  });

  it('puts the single costly run alone (LPT): costs 9,1,1,1,1,1,1,1,1 over 2 shards -> 9 vs 8', () => {
    const runs = [1, 1, 9, 1, 1, 1, 1, 1, 1].map((expectedCost, planIndex) => ({ expectedCost, planIndex }));
    const a = selectShard(runs, 1, 2);
    const b = selectShard(runs, 2, 2);
    expect(a.map((r) => r.expectedCost)).toEqual([9]);
    expect(b.reduce((s, r) => s + r.expectedCost, 0)).toBe(8);
  });

  it('rejects a shard number out of range', () => {
    expect(() => selectShard([], 0, 2)).toThrow(/between 1 and 2/);
    expect(() => selectShard([], 3, 2)).toThrow(/between 1 and 2/);
  });
});

describe('parseShardSpec', () => {
  it('reads K/N', () => {
    expect(parseShardSpec('2/4')).toEqual({ index: 2, count: 4 });
    expect(parseShardSpec(' 1 / 1 ')).toEqual({ index: 1, count: 1 });
  });
  it.each(['0/3', '4/3', '1/0', '2', 'a/b', '1/2/3', '-1/3', ''])('rejects %j naming --shard', (spec) => {
    expect(() => parseShardSpec(spec, '--shard', {})).toThrow(/^--shard: /);
  });
  // Index bases as each engine documents them: Kubernetes JOB_COMPLETION_INDEX and AWS Batch
  // AWS_BATCH_JOB_ARRAY_INDEX count from 0; GitLab CI_NODE_INDEX counts from 1 beside CI_NODE_TOTAL.
  it('takes K from the batch engine when only N is given', () => {
    expect(parseShardSpec('4', '--shard', { JOB_COMPLETION_INDEX: '0' })).toEqual({ index: 1, count: 4 });
    expect(parseShardSpec('4', '--shard', { JOB_COMPLETION_INDEX: '3' })).toEqual({ index: 4, count: 4 });
    expect(parseShardSpec('8', '--shard', { AWS_BATCH_JOB_ARRAY_INDEX: '5' })).toEqual({ index: 6, count: 8 });
    expect(parseShardSpec('3', '--shard', { CI_NODE_INDEX: '3', CI_NODE_TOTAL: '3' })).toEqual({ index: 3, count: 3 });
    expect(parseShardSpec('3', '--shard', { CI_NODE_INDEX: '2', JOB_COMPLETION_INDEX: '1' })).toEqual({ index: 2, count: 3 });
  });
  it.each([
    [{}, /none is set/],
    [{ JOB_COMPLETION_INDEX: '4' }, /JOB_COMPLETION_INDEX=4 .* outside 4 shards/],
    [{ JOB_COMPLETION_INDEX: 'x' }, /expected a whole number/],
    [{ CI_NODE_INDEX: '1', CI_NODE_TOTAL: '5' }, /CI_NODE_TOTAL=5 but --shard gives 4/],
    [{ CI_NODE_INDEX: '1', JOB_COMPLETION_INDEX: '2' }, /name different shards/],
  ] as const)('refuses N alone with %j', (env, says) => {
    expect(() => parseShardSpec('4', '--shard', env)).toThrow(says);
  });
});
