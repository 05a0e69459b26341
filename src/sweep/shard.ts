// Splitting a planned sweep over N CI jobs. Every job plans the same sweep and keeps its own
// share, so the split must be a pure function of the plan: no clock, no randomness, no
// dependence on which job computes it.
import { InputError } from '../core/errors.js';
import { runKey, type RunSetting } from '../results/contract.js';

export interface ShardSpec {
  /** 1-based shard number K of "K/N". */
  index: number;
  count: number;
}

/**
 * Batch engines that run array jobs, and the variable each one sets for a job's own index. The
 * first three count from 0, GitLab from 1 (and it also gives the total). Names from each engine's
 * documentation of indexed/array jobs.
 */
export const SHARD_INDEX_VARIABLES: readonly { name: string; base: 0 | 1; engine: string; total?: string }[] = [
  { name: 'JOB_COMPLETION_INDEX', base: 0, engine: 'Kubernetes Indexed Job' },
  { name: 'AWS_BATCH_JOB_ARRAY_INDEX', base: 0, engine: 'AWS Batch array job' },
  { name: 'CI_NODE_INDEX', base: 1, engine: 'GitLab parallel job', total: 'CI_NODE_TOTAL' },
];

/**
 * Parses "K/N" with 1 <= K <= N, or "N" alone, whose K comes from the batch engine's own index
 * variable in `env` (refused when none is set, or when two disagree).
 */
export function parseShardSpec(spec: string, where = '--shard', env: NodeJS.ProcessEnv = process.env): ShardSpec {
  const total = /^\s*(\d+)\s*$/.exec(spec);
  if (total) return shardFromEnvironment(Number(total[1]), where, env);
  const m = /^\s*(\d+)\s*\/\s*(\d+)\s*$/.exec(spec);
  if (!m) throw new InputError(`expected K/N (e.g. 2/4) or a total N whose K comes from the batch engine, got ${JSON.stringify(spec)}`, where);
  const index = Number(m[1]);
  const count = Number(m[2]);
  if (count < 1) throw new InputError(`shard count must be at least 1, got ${JSON.stringify(spec)}`, where);
  if (index < 1 || index > count) throw new InputError(`shard number must be between 1 and ${count}, got ${JSON.stringify(spec)}`, where);
  return { index, count };
}

function shardFromEnvironment(count: number, where: string, env: NodeJS.ProcessEnv): ShardSpec {
  if (count < 1) throw new InputError(`shard count must be at least 1, got ${count}`, where);
  const found: { name: string; index: number }[] = [];
  for (const v of SHARD_INDEX_VARIABLES) {
    const raw = env[v.name];
    if (raw === undefined || raw.trim() === '') continue;
    if (!/^\s*\d+\s*$/.test(raw)) throw new InputError(`${v.name} is ${JSON.stringify(raw)}; expected a whole number (${v.engine} index)`, where);
    const index = Number(raw) - v.base + 1;
    if (index < 1 || index > count) {
      throw new InputError(`${v.name}=${raw.trim()} (${v.engine}, counted from ${v.base}) is outside ${count} shards; the job's parallelism and --shard ${count} must agree`, where);
    }
    const declared = v.total === undefined ? undefined : env[v.total];
    if (declared !== undefined && declared.trim() !== '' && Number(declared) !== count) {
      throw new InputError(`${v.total}=${declared.trim()} but --shard gives ${count} shards; they must agree`, where);
    }
    found.push({ name: v.name, index });
  }
  if (found.length === 0) {
    throw new InputError(
      `a total without an index needs the batch engine's index variable (${SHARD_INDEX_VARIABLES.map((v) => v.name).join(', ')}); none is set. Give K/N to choose a shard by hand`,
      where,
    );
  }
  const first = found[0]!;
  const other = found.find((f) => f.index !== first.index);
  if (other) throw new InputError(`${first.name} and ${other.name} name different shards (${first.index} and ${other.index}); unset one`, where);
  return { index: first.index, count };
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
