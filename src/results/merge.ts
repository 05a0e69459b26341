// Joining results files, above all the shards of one sharded sweep, into one file that equals
// the unsharded sweep in everything but timing and environment.
//
// Policy (also in docs/ci.md): a merge refuses rather than guesses.
// - Format versions must agree.
// - A run (runKey) may appear in one file only.
// - A problem id must carry the same sha256 everywhere.
// - Shards: either every file is a shard or none is. Shards must share shard.count and
//   shard.planSha256, and the indices must be exactly 1..count: a duplicate or missing shard is
//   refused, since a silently partial merge would let a later check pass on fewer runs (a check
//   reports missing runs anyway, but only against a baseline that lists them).
// Order: shards are merged by planIndex (the position in the full plan); files that are not
// shards of one plan keep the order given, file by file. Problems keep the shards' common order,
// or else follow their first use.
import { InputError } from '../core/errors.js';
import { RESULTS_FORMAT, RESULTS_VERSION, runKey, type ProblemRecord, type ResultsFile, type RunResult } from './contract.js';

export interface MergeInput {
  path: string;
  results: ResultsFile;
}

export function mergeResults(files: MergeInput[], onWarning: (message: string) => void = () => {}): ResultsFile {
  if (files.length === 0) throw new InputError('nothing to merge: give at least one results file');
  for (const f of files) {
    if (f.results.format !== RESULTS_FORMAT || f.results.version !== RESULTS_VERSION) {
      throw new InputError(`is ${String(f.results.format)} version ${String(f.results.version)}; merge joins ${RESULTS_FORMAT} version ${RESULTS_VERSION} only`, f.path);
    }
  }
  const ordered = checkShards(files);
  const problems = mergeProblems(ordered);
  const runs = mergeRuns(ordered, onWarning);

  const first = ordered[0]!.results;
  const environment = { ...first.environment };
  const sharded = first.shard !== undefined;
  if (sharded) {
    // Shards may run on different machines: keep each one's calibration, and give every run its
    // own ratio so a later time check does not divide by another machine's calibration.
    environment.shards = ordered.map((f) => ({
      index: f.results.shard!.index,
      node: f.results.environment.node,
      cpu: f.results.environment.cpu,
      calibrationSeconds: f.results.environment.calibrationSeconds ?? null,
    }));
  }
  const distinctEnv = new Set(ordered.map((f) => `${f.results.environment.node}|${f.results.environment.platform}|${f.results.environment.arch}|${f.results.environment.cpu}`));
  if (distinctEnv.size > 1) onWarning(`the merged files come from ${distinctEnv.size} different environments; the merged environment is that of ${ordered[0]!.path}`);

  const createdAt = ordered.map((f) => f.results.createdAt).reduce((a, b) => (b > a ? b : a));
  const out: ResultsFile = { format: RESULTS_FORMAT, version: RESULTS_VERSION, createdAt, environment, runs, problems, ...mergeExtras(ordered, onWarning) };
  const interrupted = ordered.filter((f) => f.results.interrupted);
  if (interrupted.length > 0) {
    out.interrupted = true;
    onWarning(`interrupted sweep(s) merged: ${interrupted.map((f) => f.path).join(', ')}; the merged file is marked interrupted`);
  }
  return out;
}

const CONTRACT_KEYS = new Set(['format', 'version', 'createdAt', 'environment', 'runs', 'problems', 'interrupted', 'shard']);

/**
 * Top-level fields beyond the contract (plan, request, method list, ...). Equal everywhere: kept.
 * A nested `shard` entry is a shard's own identity and is dropped before comparing. Arrays are
 * joined (by `id` where elements have one). Anything else keeps the first file's value, with a
 * warning, rather than inventing a combination.
 */
function mergeExtras(files: MergeInput[], onWarning: (m: string) => void): Record<string, unknown> {
  const keys: string[] = [];
  for (const f of files) for (const k of Object.keys(f.results)) if (!CONTRACT_KEYS.has(k) && !keys.includes(k)) keys.push(k);
  const out: Record<string, unknown> = {};
  for (const k of keys) {
    const present = files.filter((f) => f.results[k] !== undefined);
    const values = present.map((f) => withoutShard(f.results[k]));
    const texts = values.map((v) => JSON.stringify(v));
    if (k === 'command' && values.every((v) => typeof v === 'string')) {
      // Each shard's own command line, one per line, in file order: how the merged file was made.
      out[k] = [...new Set(values as string[])].join('\n');
      continue;
    }
    if (present.length === files.length && texts.every((t) => t === texts[0])) {
      out[k] = values[0];
    } else if (values.every(Array.isArray)) {
      const seen = new Set<string>();
      const joined: unknown[] = [];
      for (const item of (values as unknown[][]).flat()) {
        const id = (item as { id?: unknown } | null)?.id;
        const key = typeof id === 'string' ? `id:${id}` : JSON.stringify(item);
        if (!seen.has(key)) {
          seen.add(key);
          joined.push(item);
        }
      }
      out[k] = joined;
    } else {
      out[k] = values[0];
      onWarning(`field "${k}" differs between the merged files; kept the value from ${present[0]!.path}`);
    }
  }
  return out;
}

function withoutShard(v: unknown): unknown {
  if (typeof v !== 'object' || v === null || Array.isArray(v) || !('shard' in v)) return v;
  const { shard: _shard, ...rest } = v as Record<string, unknown>;
  return rest;
}

/** Validates the shard set and returns the files in shard order (or as given when unsharded). */
function checkShards(files: MergeInput[]): MergeInput[] {
  const withShard = files.filter((f) => f.results.shard !== undefined);
  if (withShard.length === 0) return files;
  if (withShard.length !== files.length) {
    const plain = files.filter((f) => f.results.shard === undefined).map((f) => f.path);
    throw new InputError(`cannot merge shards with files that are not shards (${plain.join(', ')}); merge the shards first`);
  }
  const ref = files[0]!;
  const refShard = ref.results.shard!;
  for (const f of files) {
    const s = f.results.shard!;
    if (s.planSha256 !== refShard.planSha256) {
      throw new InputError(`${f.path} is a shard of a different plan than ${ref.path} (shard.planSha256 ${s.planSha256.slice(0, 12)} vs ${refShard.planSha256.slice(0, 12)}); all shards must come from the same sweep command`);
    }
    if (s.count !== refShard.count) {
      throw new InputError(`${f.path} is shard ${s.index}/${s.count} but ${ref.path} is ${refShard.index}/${refShard.count}; all shards must use the same count`);
    }
  }
  const byIndex = new Map<number, MergeInput>();
  for (const f of files) {
    const i = f.results.shard!.index;
    const prev = byIndex.get(i);
    if (prev) throw new InputError(`shard ${i}/${refShard.count} given twice: ${prev.path} and ${f.path}`);
    byIndex.set(i, f);
  }
  const missing: number[] = [];
  for (let i = 1; i <= refShard.count; i++) if (!byIndex.has(i)) missing.push(i);
  if (missing.length > 0) {
    throw new InputError(`shard(s) ${missing.map((i) => `${i}/${refShard.count}`).join(', ')} missing; got ${files.map((f) => `${f.path} (${f.results.shard!.index})`).join(', ')}`);
  }
  return [...byIndex.entries()].sort((a, b) => a[0] - b[0]).map((e) => e[1]);
}

function mergeRuns(files: MergeInput[], onWarning: (m: string) => void): RunResult[] {
  const seen = new Map<string, string>();
  const runs: RunResult[] = [];
  for (const f of files) {
    const calibration = f.results.environment.calibrationSeconds;
    for (const r of f.results.runs) {
      const key = runKey(r);
      const prev = seen.get(key);
      if (prev !== undefined) throw new InputError(`run ${key} is in both ${prev} and ${f.path}; each run may be merged once`);
      seen.set(key, f.path);
      runs.push(withCalibrationRatio(r, f.results.shard ? calibration : undefined));
    }
  }
  if (files[0]!.results.shard === undefined) return runs;
  if (runs.every((r) => r.planIndex !== undefined)) {
    const at = new Map<number, string>();
    for (const r of runs) {
      const other = at.get(r.planIndex!);
      if (other !== undefined) throw new InputError(`runs ${other} and ${runKey(r)} share planIndex ${r.planIndex}; the shards do not come from one plan`);
      at.set(r.planIndex!, runKey(r));
    }
    return runs.sort((a, b) => a.planIndex! - b.planIndex!);
  }
  onWarning('some runs carry no planIndex; merged runs are ordered by run key instead of plan order');
  return runs.sort((a, b) => {
    const ka = runKey(a);
    const kb = runKey(b);
    return ka < kb ? -1 : ka > kb ? 1 : 0;
  });
}

function withCalibrationRatio(r: RunResult, calibration: number | undefined): RunResult {
  if (calibration === undefined || r.time.calibrationRatio !== undefined) return r;
  const m = r.time.medianSeconds;
  return { ...r, time: { ...r.time, calibrationRatio: m === null ? null : m / calibration } };
}

function mergeProblems(files: MergeInput[]): ProblemRecord[] {
  const byId = new Map<string, { record: ProblemRecord; path: string }>();
  const firstSeen: string[] = [];
  for (const f of files) {
    for (const p of f.results.problems) {
      const prev = byId.get(p.id);
      if (prev === undefined) {
        byId.set(p.id, { record: p, path: f.path });
        firstSeen.push(p.id);
      } else if (prev.record.sha256 !== p.sha256) {
        throw new InputError(
          `problem ${p.id} has different definitions in ${prev.path} (sha256 ${prev.record.sha256.slice(0, 12)}) and ${f.path} (sha256 ${p.sha256.slice(0, 12)}); results of different problems cannot be merged`,
        );
      }
    }
  }
  // Shards of one sweep usually list the same problems in the same order: keep it. Otherwise
  // order by first use in the merged run order, then problems no run used, as first seen.
  const lists = files.map((f) => f.results.problems.map((p) => p.id).join('\n'));
  if (lists.every((l) => l === lists[0])) return firstSeen.map((id) => byId.get(id)!.record);
  const used: string[] = [];
  const usedSet = new Set<string>();
  const runsInOrder = files.flatMap((f) => f.results.runs);
  const sortedRuns = runsInOrder.every((r) => r.planIndex !== undefined) && files[0]!.results.shard ? [...runsInOrder].sort((a, b) => a.planIndex! - b.planIndex!) : runsInOrder;
  for (const r of sortedRuns) {
    if (byId.has(r.problem) && !usedSet.has(r.problem)) {
      usedSet.add(r.problem);
      used.push(r.problem);
    }
  }
  const order = [...used, ...firstSeen.filter((id) => !usedSet.has(id))];
  return order.map((id) => byId.get(id)!.record);
}
