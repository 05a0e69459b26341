// Run-by-run comparison of a current results set against a baseline. Pure: no I/O, no clock.
//
// Rules (also in docs/ci.md):
// - Runs are matched by runKey (problem, method, setting).
// - status: ok -> anything else is a regression; the run's numbers are then not compared.
//   not ok -> ok is an improvement.
// - error.final, error.max and each drift: with v' = max(v, floor), the growth factor is
//   new' / old'. Above the factor it is a regression, below 1/factor an improvement. The floor
//   (default 64 ulp of 1, about 1.4e-14) keeps changes that happen entirely at roundoff level
//   (0 -> 1e-300, 1e-16 -> 3e-15) from failing a build. An error figure the current run marks
//   unresolved (its `unresolved` list; errorBelowReference for error.final) never regresses: it
//   is within reach of what the reference resolves.
//   A value measured in the baseline and missing now (null, or a non-finite drift) is a regression.
// - counts nfev, njev, nlu: exact and deterministic, so new > old * (1 + fraction) is a
//   regression (0 -> 1 included) and new < old * (1 - fraction) an improvement.
// - time, only when asked: each run's time as a multiple of the calibration workload timed in
//   the same process, so a uniformly slower machine compares equal.
// - A baseline run absent now is a regression unless allowMissing; new runs are listed only.
import { diffConfigurations, resultsConfiguration, type Configuration } from './configuration.js';
import { InputError } from '../core/errors.js';
import { isUnresolved, runKey, type ResultsFile, type RunSetting } from '../results/contract.js';
import type { Counts } from '../core/types.js';
import type { Baseline, BaselineRun } from './baseline.js';
import { num3 } from './format.js';

/** Values below this are roundoff for scaled errors and relative drifts. */
export const ROUNDOFF_FLOOR = 64 * Number.EPSILON;

export interface CompareOptions {
  /** Error growth factor that fails (default 2). */
  errorFactor?: number;
  /** Drift growth factor that fails (default 2). */
  driftFactor?: number;
  /** Relative growth of nfev, njev or nlu that fails (default 0.1). */
  workFraction?: number;
  /** Values are raised to this floor before taking ratios (default ROUNDOFF_FLOOR). */
  floor?: number;
  /** Baseline runs absent now are warnings, not regressions. */
  allowMissing?: boolean;
  /** Compare calibrated wall time with this factor; off when absent or null. */
  timeFactor?: number | null;
  /** Names for messages (usually the file paths). */
  labels?: { baseline?: string; current?: string };
}

export interface ResolvedOptions {
  errorFactor: number;
  driftFactor: number;
  workFraction: number;
  floor: number;
  allowMissing: boolean;
  timeFactor: number | null;
}

export type FindingKind = 'status' | 'error' | 'drift' | 'work' | 'time' | 'missing';

export interface Finding {
  key: string;
  problem: string;
  method: string;
  setting: RunSetting;
  kind: FindingKind;
  /** e.g. "status", "error.final", "drift.energy", "counts.nfev", "time", "run". */
  metric: string;
  old: number | string | null;
  new: number | string | null;
  /** new / old (after the floor) where a ratio means something, else null. */
  factor: number | null;
  /** The threshold in words, e.g. "x2" or "+10%". */
  limit: string;
  /** One line: metric, old -> new, factor and limit. */
  text: string;
}

export interface RunComparison {
  key: string;
  problem: string;
  method: string;
  setting: RunSetting;
  /** not-comparable: in both, but the configurations differ in a way that touches this run. */
  state: 'compared' | 'missing' | 'new' | 'not-comparable';
  regressions: Finding[];
  improvements: Finding[];
  notes: string[];
}

export interface Comparison {
  ok: boolean;
  options: ResolvedOptions;
  summary: { baselineRuns: number; currentRuns: number; compared: number; missing: number; added: number; regressions: number; improvements: number; notComparable: number };
  /** How the configurations differ (controller, step limit, --atol, version, method code); empty when they agree. */
  configuration: string[];
  /** Baseline runs and new runs: by problem, method, then loose to tight setting. */
  runs: RunComparison[];
  regressions: Finding[];
  improvements: Finding[];
  warnings: string[];
}

/** What the comparison reads from either a baseline or a results file. */
interface GateSet {
  runs: BaselineRun[];
  problems: { id: string; sha256: string }[];
  calibrationSeconds: number | undefined;
  interrupted: boolean;
  label: string;
}

function toGateSet(x: Baseline | ResultsFile, label: string): GateSet {
  if ('environment' in x) {
    return { runs: x.runs, problems: x.problems, calibrationSeconds: x.environment.calibrationSeconds, interrupted: x.interrupted === true, label };
  }
  return { runs: x.runs, problems: x.problems, calibrationSeconds: x.calibrationSeconds, interrupted: false, label };
}

function configurationOf(x: Baseline | ResultsFile): Configuration | null {
  return 'environment' in x ? resultsConfiguration(x) : (x.configuration ?? null);
}

export function resolveOptions(o: CompareOptions = {}): ResolvedOptions {
  const r: ResolvedOptions = {
    errorFactor: o.errorFactor ?? 2,
    driftFactor: o.driftFactor ?? 2,
    workFraction: o.workFraction ?? 0.1,
    floor: o.floor ?? ROUNDOFF_FLOOR,
    allowMissing: o.allowMissing ?? false,
    timeFactor: o.timeFactor ?? null,
  };
  const atLeastOne = (v: number, flag: string) => {
    if (!Number.isFinite(v) || v < 1) throw new InputError(`must be a number >= 1, got ${v}`, flag);
  };
  atLeastOne(r.errorFactor, '--error-factor');
  atLeastOne(r.driftFactor, '--drift-factor');
  if (r.timeFactor !== null) atLeastOne(r.timeFactor, '--time');
  if (!Number.isFinite(r.workFraction) || r.workFraction < 0) throw new InputError(`must be a number >= 0, got ${r.workFraction}`, '--work-fraction');
  if (!Number.isFinite(r.floor) || r.floor <= 0) throw new InputError(`must be a positive number, got ${r.floor}`, '--floor');
  return r;
}

export function compareResults(baseline: Baseline | ResultsFile, current: Baseline | ResultsFile, options: CompareOptions = {}): Comparison {
  const opt = resolveOptions(options);
  const base = toGateSet(baseline, options.labels?.baseline ?? 'baseline');
  const cur = toGateSet(current, options.labels?.current ?? 'current results');
  const warnings: string[] = [];
  const baseRuns = indexRuns(base);
  const curRuns = indexRuns(cur);
  if (opt.timeFactor !== null) requireCalibration(base, baseRuns, 'baseline');
  if (opt.timeFactor !== null) requireCalibration(cur, curRuns, 'current');
  if ('environment' in current && current.shard) {
    warnings.push(`${cur.label} is shard ${current.shard.index}/${current.shard.count}; runs of the other shards count as missing (merge the shards first)`);
  }
  if (cur.interrupted) warnings.push(`${cur.label} is from an interrupted sweep; runs it did not reach count as missing`);

  const changedProblems = new Set<string>();
  const curSha = new Map(cur.problems.map((p) => [p.id, p.sha256]));
  for (const p of base.problems) {
    const now = curSha.get(p.id);
    if (now !== undefined && now !== p.sha256) {
      changedProblems.add(p.id);
      warnings.push(
        `problem ${p.id}: definition changed since the baseline (sha256 ${p.sha256.slice(0, 12)} -> ${now.slice(0, 12)}); differences may come from the problem, not the method; update the baseline if the change is intended`,
      );
    }
  }

  const config = diffConfigurations(configurationOf(baseline), configurationOf(current));
  const runs: RunComparison[] = [];
  for (const [key, b] of baseRuns) {
    const c = curRuns.get(key);
    const unlike = c ? config.comparable(b, c) : null;
    if (c && unlike) {
      const rc = emptyRun(key, b, 'not-comparable');
      rc.notes.push(`not compared: ${unlike}`);
      runs.push(rc);
      continue;
    }
    const rc = emptyRun(key, b, c ? 'compared' : 'missing');
    if (!c) {
      if (opt.allowMissing) {
        rc.notes.push('not in the current results (allowed by --allow-missing)');
      } else {
        rc.regressions.push(finding(key, b, { kind: 'missing', metric: 'run', old: 'present', new: 'missing', factor: null, limit: 'present', text: 'run: in the baseline, missing from the current results' }));
      }
    } else {
      compareRun(rc, b, c, opt, base, cur);
      if (changedProblems.has(b.problem)) rc.notes.push('problem definition changed since the baseline');
    }
    runs.push(rc);
  }
  for (const [key, c] of curRuns) {
    if (baseRuns.has(key)) continue;
    const rc = emptyRun(key, c, 'new');
    rc.notes.push('not in the baseline (new run; not checked)');
    runs.push(rc);
  }
  runs.sort(readingOrder);
  const missingAllowed = runs.filter((r) => r.state === 'missing').length;
  if (opt.allowMissing && missingAllowed > 0) warnings.push(`${missingAllowed} baseline run(s) missing from ${cur.label} (allowed)`);
  const regressions = runs.flatMap((r) => r.regressions);
  const improvements = runs.flatMap((r) => r.improvements);
  const notComparable = runs.filter((r) => r.state === 'not-comparable').length;
  // Runs the gate could not check like for like fail it, as missing runs do, unless allowed.
  return {
    configuration: config.differences,
    ok: regressions.length === 0 && (notComparable === 0 || opt.allowMissing),
    options: opt,
    summary: {
      baselineRuns: baseRuns.size,
      currentRuns: curRuns.size,
      compared: runs.filter((r) => r.state === 'compared').length,
      missing: runs.filter((r) => r.state === 'missing').length,
      added: runs.filter((r) => r.state === 'new').length,
      regressions: regressions.length,
      improvements: improvements.length,
      notComparable,
    },
    runs,
    regressions,
    improvements,
    warnings,
  };
}

const text = (a: string, b: string) => (a < b ? -1 : a > b ? 1 : 0);

/** Reading order for reports: loose to tight tolerance, few to many steps, as a sweep goes. */
function readingOrder(x: RunComparison, y: RunComparison): number {
  const byName = text(x.problem, y.problem) || text(x.method, y.method);
  if (byName !== 0) return byName;
  const sx = x.setting;
  const sy = y.setting;
  if ('rtol' in sx && 'rtol' in sy && sx.rtol !== sy.rtol) return sy.rtol - sx.rtol;
  if ('steps' in sx && 'steps' in sy && sx.steps !== sy.steps) return sx.steps - sy.steps;
  return text(x.key, y.key);
}

function indexRuns(set: GateSet): Map<string, BaselineRun> {
  const m = new Map<string, BaselineRun>();
  set.runs.forEach((r, i) => {
    const key = runKey(r);
    if (m.has(key)) throw new InputError(`field "runs[${i}]" repeats run ${key}; each run may appear once`, set.label);
    m.set(key, r);
  });
  return m;
}

function requireCalibration(set: GateSet, runs: Map<string, BaselineRun>, which: string): void {
  if (set.calibrationSeconds !== undefined) return;
  const allRatios = runs.size > 0 && [...runs.values()].every((r) => typeof r.time?.calibrationRatio === 'number' || r.status !== 'ok');
  if (allRatios) return;
  const hint = which === 'baseline' ? ' (make the baseline with --keep-time)' : '';
  throw new InputError(`no calibration timing (calibrationSeconds) in the ${which} file${hint}; --time compares times only relative to it`, set.label);
}

function emptyRun(key: string, r: BaselineRun, state: RunComparison['state']): RunComparison {
  return { key, problem: r.problem, method: r.method, setting: r.setting, state, regressions: [], improvements: [], notes: [] };
}

/** What a comparison found about one run (the run itself comes from the baseline record). */
type FindingFacts = Omit<Finding, 'key' | 'problem' | 'method' | 'setting'>;

function finding(key: string, r: BaselineRun, facts: FindingFacts): Finding {
  return { key, problem: r.problem, method: r.method, setting: r.setting, ...facts };
}

function compareRun(rc: RunComparison, b: BaselineRun, c: BaselineRun, opt: ResolvedOptions, base: GateSet, cur: GateSet): void {
  const key = rc.key;
  if (b.status !== c.status) {
    const text = `status: ${b.status} -> ${c.status}`;
    if (b.status === 'ok') rc.regressions.push(finding(key, b, { kind: 'status', metric: 'status', old: b.status, new: c.status, factor: null, limit: 'ok', text }));
    else if (c.status === 'ok') rc.improvements.push(finding(key, b, { kind: 'status', metric: 'status', old: b.status, new: c.status, factor: null, limit: 'ok', text }));
    else rc.notes.push(text);
  }
  // Numbers of a failed run (or a baseline that failed) describe a different computation.
  if (b.status !== 'ok' || c.status !== 'ok') return;

  const ratioCheck = (kind: 'error' | 'drift', metric: string, oldV: number | null, newV: number | null, factor: number, canRegress: boolean) => {
    const oldOk = oldV !== null && Number.isFinite(oldV);
    const newOk = newV !== null && Number.isFinite(newV);
    if (!oldOk && !newOk) return;
    if (!newOk) {
      rc.regressions.push(finding(key, b, { kind, metric, old: oldV, new: newV, factor: null, limit: `x${factor}`, text: `${metric}: ${num3(oldV)} -> ${num3(newV)} (measured in the baseline, not now)` }));
      return;
    }
    if (!oldOk) {
      rc.notes.push(`${metric}: ${num3(oldV)} -> ${num3(newV)} (not measured in the baseline)`);
      return;
    }
    const r = Math.max(Math.abs(newV), opt.floor) / Math.max(Math.abs(oldV), opt.floor);
    const text = `${metric}: ${num3(oldV)} -> ${num3(newV)} (x${num3(r)}, limit x${factor})`;
    if (r > factor) {
      if (canRegress) rc.regressions.push(finding(key, b, { kind, metric, old: oldV, new: newV, factor: r, limit: `x${factor}`, text }));
      else rc.notes.push(`${text}; not a regression: the error is below what the reference resolves`);
    } else if (r < 1 / factor) {
      rc.improvements.push(finding(key, b, { kind, metric, old: oldV, new: newV, factor: r, limit: `x${factor}`, text }));
    }
  };
  ratioCheck('error', 'error.final', b.error.final, c.error.final, opt.errorFactor, !isUnresolved(c, 'final'));
  ratioCheck('error', 'error.max', b.error.max, c.error.max, opt.errorFactor, !isUnresolved(c, 'max'));
  for (const name of Object.keys(b.drift).sort()) {
    ratioCheck('drift', `drift.${name}`, b.drift[name]!, name in c.drift ? c.drift[name]! : null, opt.driftFactor, true);
  }

  const pct = `+${num3(opt.workFraction * 100)}%`;
  for (const k of ['nfev', 'njev', 'nlu'] as const satisfies readonly (keyof Counts)[]) {
    const o = b.counts[k];
    const n = c.counts[k];
    const factor = o > 0 ? n / o : null;
    const change = o > 0 ? `${n >= o ? '+' : ''}${num3(((n - o) / o) * 100)}%` : `from 0`;
    const text = `counts.${k}: ${o} -> ${n} (${change}, limit ${pct})`;
    if (n > o * (1 + opt.workFraction)) rc.regressions.push(finding(key, b, { kind: 'work', metric: `counts.${k}`, old: o, new: n, factor, limit: pct, text }));
    else if (n < o * (1 - opt.workFraction)) rc.improvements.push(finding(key, b, { kind: 'work', metric: `counts.${k}`, old: o, new: n, factor, limit: pct, text }));
  }

  if (opt.timeFactor !== null) {
    const rb = timeRatio(b, base.calibrationSeconds);
    const rcur = timeRatio(c, cur.calibrationSeconds);
    if (rb === null || rcur === null) {
      rc.notes.push('time: not measured in one of the files; not compared');
    } else {
      const r = rcur / rb;
      const text = `time: ${num3(rb)} -> ${num3(rcur)} calibration units (x${num3(r)}, limit x${opt.timeFactor})`;
      if (r > opt.timeFactor) rc.regressions.push(finding(key, b, { kind: 'time', metric: 'time', old: rb, new: rcur, factor: r, limit: `x${opt.timeFactor}`, text }));
      else if (r < 1 / opt.timeFactor) rc.improvements.push(finding(key, b, { kind: 'time', metric: 'time', old: rb, new: rcur, factor: r, limit: `x${opt.timeFactor}`, text }));
    }
  }
}

/** A run's median time in units of the calibration workload (null when not measured). */
export function timeRatio(r: Pick<BaselineRun, 'time'>, calibrationSeconds: number | undefined): number | null {
  if (typeof r.time?.calibrationRatio === 'number') return r.time.calibrationRatio;
  const m = r.time?.medianSeconds;
  if (m === null || m === undefined || !calibrationSeconds) return null;
  return m / calibrationSeconds;
}

