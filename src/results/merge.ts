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

/** What the merge needs of a run to check and order it (the run itself may stay on disk). */
export interface RunSlot {
  key: string;
  planIndex: number | undefined;
  problem: string;
}

/** A file to merge without its runs: its fields, its problems taken in as read (ProblemMerger), its run slots. */
export interface MergeSource {
  path: string;
  /** The file's fields; `runs` and `problems` are not read. */
  header: ResultsFile;
  slots: RunSlot[];
}

export function runSlot(r: RunResult): RunSlot {
  return { key: runKey(r), planIndex: r.planIndex, problem: r.problem };
}

export function mergeResults(files: MergeInput[], onWarning: (message: string) => void = () => {}): ResultsFile {
  if (files.length === 0) throw new InputError('nothing to merge: give at least one results file');
  for (const f of files) checkFormat(f.results, f.path);
  const problems = new ProblemMerger();
  for (const f of files) problems.add(f.path, f.results.problems);
  const sources = files.map((f) => ({ path: f.path, header: f.results, slots: f.results.runs.map(runSlot) }));
  const { merged, order } = mergeSources(sources, problems, onWarning);
  merged.runs = order.map(([file, at]) => withCalibrationRatio(files[file]!.results.runs[at]!, calibrationOf(files[file]!.results)));
  return merged;
}

/** A file's calibration time when it is a shard (each run then gets its own ratio), else undefined. */
export function calibrationOf(results: ResultsFile): number | undefined {
  return results.shard ? results.environment.calibrationSeconds : undefined;
}

export function checkFormat(results: ResultsFile, path: string): void {
  if (results.format !== RESULTS_FORMAT || results.version !== RESULTS_VERSION) {
    throw new InputError(`is ${String(results.format)} version ${String(results.version)}; merge joins ${RESULTS_FORMAT} version ${RESULTS_VERSION} only`, path);
  }
}

/**
 * The merged file without its runs (`runs` is empty) and the order of the runs: [source, run]
 * pairs, each run once. `problems` has taken in every source's problem records, in source order.
 */
export function mergeSources(files: MergeSource[], problems: ProblemMerger, onWarning: (message: string) => void = () => {}): { merged: ResultsFile; order: [number, number][] } {
  if (files.length === 0) throw new InputError('nothing to merge: give at least one results file');
  const ordered = checkShards(files);
  const order = mergeRuns(ordered, onWarning).map(([k, at]) => [files.indexOf(ordered[k]!), at] as [number, number]);
  const first = ordered[0]!.header;
  const environment = { ...first.environment };
  const sharded = first.shard !== undefined;
  if (sharded) {
    // Shards may run on different machines: keep each one's calibration, and give every run its
    // own ratio so a later time check does not divide by another machine's calibration.
    environment.shards = ordered.map((f) => ({
      index: f.header.shard!.index,
      node: f.header.environment.node,
      cpu: f.header.environment.cpu,
      calibrationSeconds: f.header.environment.calibrationSeconds ?? null,
    }));
  }
  const distinctEnv = new Set(ordered.map((f) => `${f.header.environment.node}|${f.header.environment.platform}|${f.header.environment.arch}|${f.header.environment.cpu}`));
  if (distinctEnv.size > 1) onWarning(`the merged files come from ${distinctEnv.size} different environments; the merged environment is that of ${ordered[0]!.path}`);

  const createdAt = ordered.map((f) => f.header.createdAt).reduce((a, b) => (b > a ? b : a));
  const problemOrder = problems.sameLists() ? null : order.map(([file, at]) => files[file]!.slots[at]!.problem);
  const merged: ResultsFile = { format: RESULTS_FORMAT, version: RESULTS_VERSION, createdAt, environment, runs: [], problems: problems.merged(problemOrder), ...mergeExtras(ordered, onWarning) };
  const interrupted = ordered.filter((f) => f.header.interrupted);
  if (interrupted.length > 0) {
    merged.interrupted = true;
    onWarning(`interrupted sweep(s) merged: ${interrupted.map((f) => f.path).join(', ')}; the merged file is marked interrupted`);
  }
  return { merged, order };
}

const CONTRACT_KEYS = new Set(['format', 'version', 'createdAt', 'environment', 'runs', 'problems', 'interrupted', 'shard']);

/**
 * Top-level fields beyond the contract (plan, request, method list, ...). Equal everywhere: kept.
 * A nested `shard` entry is a shard's own identity and is dropped before comparing. Arrays are
 * joined (by `id` where elements have one). Anything else keeps the first file's value, with a
 * warning, rather than inventing a combination.
 */
function mergeExtras(files: MergeSource[], onWarning: (m: string) => void): Record<string, unknown> {
  const keys: string[] = [];
  for (const f of files) for (const k of Object.keys(f.header)) if (!CONTRACT_KEYS.has(k) && !keys.includes(k)) keys.push(k);
  const out: Record<string, unknown> = {};
  for (const k of keys) {
    const present = files.filter((f) => f.header[k] !== undefined);
    const values = present.map((f) => withoutShard(f.header[k]));
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
function checkShards(files: MergeSource[]): MergeSource[] {
  const withShard = files.filter((f) => f.header.shard !== undefined);
  if (withShard.length === 0) return files;
  if (withShard.length !== files.length) {
    const plain = files.filter((f) => f.header.shard === undefined).map((f) => f.path);
    throw new InputError(`cannot merge shards with files that are not shards (${plain.join(', ')}); merge the shards first`);
  }
  const ref = files[0]!;
  const refShard = ref.header.shard!;
  for (const f of files) {
    const s = f.header.shard!;
    if (s.planSha256 !== refShard.planSha256) {
      throw new InputError(`${f.path} is a shard of a different plan than ${ref.path} (shard.planSha256 ${s.planSha256.slice(0, 12)} vs ${refShard.planSha256.slice(0, 12)}); all shards must come from the same sweep command`);
    }
    if (s.count !== refShard.count) {
      throw new InputError(`${f.path} is shard ${s.index}/${s.count} but ${ref.path} is ${refShard.index}/${refShard.count}; all shards must use the same count`);
    }
  }
  const byIndex = new Map<number, MergeSource>();
  for (const f of files) {
    const i = f.header.shard!.index;
    const prev = byIndex.get(i);
    if (prev) throw new InputError(`shard ${i}/${refShard.count} given twice: ${prev.path} and ${f.path}`);
    byIndex.set(i, f);
  }
  const missing: number[] = [];
  for (let i = 1; i <= refShard.count; i++) if (!byIndex.has(i)) missing.push(i);
  if (missing.length > 0) {
    throw new InputError(`shard(s) ${missing.map((i) => `${i}/${refShard.count}`).join(', ')} missing; got ${files.map((f) => `${f.path} (${f.header.shard!.index})`).join(', ')}`);
  }
  return [...byIndex.entries()].sort((a, b) => a[0] - b[0]).map((e) => e[1]);
}

/** The runs' order as [index in `files`, run] pairs, each run checked to appear once. */
function mergeRuns(files: MergeSource[], onWarning: (m: string) => void): [number, number][] {
  const seen = new Map<string, string>();
  const order: [number, number][] = [];
  files.forEach((f, k) => {
    f.slots.forEach((r, at) => {
      const prev = seen.get(r.key);
      if (prev !== undefined) throw new InputError(`run ${r.key} is in both ${prev} and ${f.path}; each run may be merged once`);
      seen.set(r.key, f.path);
      order.push([k, at]);
    });
  });
  if (files[0]!.header.shard === undefined) return order;
  const slot = ([k, at]: [number, number]) => files[k]!.slots[at]!;
  if (order.every((o) => slot(o).planIndex !== undefined)) {
    const at = new Map<number, string>();
    for (const o of order) {
      const r = slot(o);
      const other = at.get(r.planIndex!);
      if (other !== undefined) throw new InputError(`runs ${other} and ${r.key} share planIndex ${r.planIndex}; the shards do not come from one plan`);
      at.set(r.planIndex!, r.key);
    }
    return order.sort((a, b) => slot(a).planIndex! - slot(b).planIndex!);
  }
  onWarning('some runs carry no planIndex; merged runs are ordered by run key instead of plan order');
  return order.sort((a, b) => {
    const ka = slot(a).key;
    const kb = slot(b).key;
    return ka < kb ? -1 : ka > kb ? 1 : 0;
  });
}

export function withCalibrationRatio(r: RunResult, calibration: number | undefined): RunResult {
  if (calibration === undefined || r.time.calibrationRatio !== undefined) return r;
  const m = r.time.medianSeconds;
  return { ...r, time: { ...r.time, calibrationRatio: m === null ? null : m / calibration } };
}

/**
 * The problem records of the merged files, taken in file by file so no file's list is held after
 * it is read: each id once (the first record), the same sha256 everywhere.
 */
export class ProblemMerger {
  private readonly byId = new Map<string, { record: ProblemRecord; path: string }>();
  private readonly firstSeen: string[] = [];
  private firstList: string | undefined;
  private same = true;
  add(path: string, problems: readonly ProblemRecord[]): void {
    for (const p of problems) {
      const prev = this.byId.get(p.id);
      if (prev === undefined) {
        this.byId.set(p.id, { record: p, path });
        this.firstSeen.push(p.id);
      } else if (prev.record.sha256 !== p.sha256) {
        throw new InputError(
          `problem ${p.id} has different definitions in ${prev.path} (sha256 ${prev.record.sha256.slice(0, 12)}) and ${path} (sha256 ${p.sha256.slice(0, 12)}); results of different problems cannot be merged`,
        );
      }
    }
    const list = problems.map((p) => p.id).join('\n');
    if (this.firstList === undefined) this.firstList = list;
    else if (list !== this.firstList) this.same = false;
  }
  /** True when every file listed the same problems in the same order. */
  sameLists(): boolean {
    return this.same;
  }
  /**
   * Shards of one sweep usually list the same problems in the same order: kept. Otherwise, order by
   * first use in the merged run order (`runProblems`, the problem of each merged run), then
   * problems no run used, as first seen.
   */
  merged(runProblems: readonly string[] | null): ProblemRecord[] {
    if (runProblems === null) return this.firstSeen.map((id) => this.byId.get(id)!.record);
    const used: string[] = [];
    const usedSet = new Set<string>();
    for (const id of runProblems) {
      if (this.byId.has(id) && !usedSet.has(id)) {
        usedSet.add(id);
        used.push(id);
      }
    }
    return [...used, ...this.firstSeen.filter((id) => !usedSet.has(id))].map((id) => this.byId.get(id)!.record);
  }
}
