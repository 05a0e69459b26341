// Splitting a planned sweep over N CI jobs. Every job plans the same sweep and keeps its own
// share, so the split must be a pure function of the plan: no clock, no randomness, no
// dependence on which job computes it.
import { InputError } from '../core/errors.js';
import { runKey, type RunSetting } from '../core/results.js';

export interface ShardSpec {
  /** 1-based shard number K of "K/N". */
  index: number;
  count: number;
}

/** Parses "K/N" with 1 <= K <= N. */
export function parseShardSpec(spec: string, where = '--shard'): ShardSpec {
  const m = /^\s*(\d+)\s*\/\s*(\d+)\s*$/.exec(spec);
  if (!m) throw new InputError(`expected K/N (e.g. 2/4), got ${JSON.stringify(spec)}`, where);
  const index = Number(m[1]);
  const count = Number(m[2]);
  if (count < 1) throw new InputError(`shard count must be at least 1, got ${JSON.stringify(spec)}`, where);
  if (index < 1 || index > count) throw new InputError(`shard number must be between 1 and ${count}, got ${JSON.stringify(spec)}`, where);
  return { index, count };
}

type Keyed = { expectedCost?: number; planIndex?: number; problem?: string; method?: string; setting?: unknown };

/** A run's expected cost for balancing; unknown or nonsensical costs count as one unit, so they still spread evenly. */
export function costOf(r: { expectedCost?: number }): number {
  const c = r.expectedCost;
  return c !== undefined && Number.isFinite(c) && c >= 0 ? c : 1;
}

function tieKey(r: Keyed): string | null {
  if (typeof r.problem === 'string' && typeof r.method === 'string' && typeof r.setting === 'object' && r.setting !== null) {
    return runKey({ problem: r.problem, method: r.method, setting: r.setting as RunSetting });
  }
  return null;
}

/**
 * Shard number of every run (1-based), by greedy longest-processing-time assignment: runs in
 * order of decreasing expected cost (ties: planIndex, then runKey, then input position) each go
 * to the currently lightest shard (ties: lowest number). The heaviest and lightest shard then
 * differ by at most the largest single cost.
 */
export function assignShards<T extends { expectedCost?: number }>(runs: readonly T[], count: number): number[] {
  if (!Number.isInteger(count) || count < 1) throw new InputError(`shard count must be a positive integer, got ${count}`, '--shard');
  const order = runs.map((r, i) => ({ i, cost: costOf(r), plan: (r as Keyed).planIndex, key: tieKey(r as Keyed) }));
  order.sort((a, b) => {
    if (a.cost !== b.cost) return b.cost - a.cost;
    if (a.plan !== undefined && b.plan !== undefined && a.plan !== b.plan) return a.plan - b.plan;
    if (a.key !== null && b.key !== null && a.key !== b.key) return a.key < b.key ? -1 : 1;
    return a.i - b.i;
  });
  const load = new Array<number>(count).fill(0);
  const shardOf = new Array<number>(runs.length).fill(0);
  for (const r of order) {
    let best = 0;
    for (let s = 1; s < count; s++) if (load[s]! < load[best]!) best = s;
    load[best]! += r.cost;
    shardOf[r.i] = best + 1;
  }
  return shardOf;
}

/** The runs of shard `index` (1-based) of `count`, in their input (plan) order. */
export function selectShard<T extends { expectedCost?: number }>(runs: T[], index: number, count: number): T[] {
  if (!Number.isInteger(index) || index < 1 || index > count) {
    throw new InputError(`shard number must be between 1 and ${count}, got ${index}`, '--shard');
  }
  const shardOf = assignShards(runs, count);
  return runs.filter((_, i) => shardOf[i] === index);
}
