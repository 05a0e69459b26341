// The baseline file: the part of a results file that a regression check needs, and nothing that
// changes from machine to machine unless asked for (--keep-time). It is committed to a
// repository, so its bytes must be reproducible: fixed key order, runs sorted by runKey and
// numbers in JavaScript's shortest round-trip form, which re-serialises to the same text.
import { parseJsonText } from '../core/json-text.js';
import { readFileSync } from 'node:fs';
import { InputError } from '../core/errors.js';
import { runKey, type ErrorFigure, type ResultsFile, type RunResult, type RunSetting } from '../results/contract.js';
import { STATUSES, type Counts, type Status } from '../core/types.js';
import { Validator } from '../results/validate.js';
import { READABLE_RESULTS, validateResults } from '../results/read.js';
import { resultsConfiguration, type Configuration } from './configuration.js';

export const BASELINE_FORMAT = 'stepgauge-baseline';
export const BASELINE_VERSION = 1;
export const READABLE_BASELINE = `${BASELINE_FORMAT} version ${BASELINE_VERSION}`;


export interface BaselineRun {
  problem: string;
  method: string;
  setting: RunSetting;
  status: Status;
  error: { final: number | null; max: number | null };
  /** A drift that was not finite is stored as null and read back as NaN. */
  drift: Record<string, number>;
  counts: Counts;
  /** Kept only when true: such errors are below what the reference resolves. */
  errorBelowReference?: boolean;
  /** Kept only when not empty: the error figures within reach of the reference's resolution. */
  unresolved?: ErrorFigure[];
  /** Kept only with --keep-time. calibrationRatio = medianSeconds / calibration seconds. */
  time?: { medianSeconds: number | null; calibrationRatio?: number | null };
}

export interface Baseline {
  format: typeof BASELINE_FORMAT;
  version: typeof BASELINE_VERSION;
  /** Where the numbers came from, for the reader of a diff. */
  source: { createdAt: string; stepgauge: string; commit?: string };
  /** Kept only with --keep-time. */
  calibrationSeconds?: number;
  problems: { id: string; sha256: string }[];
  /** What the numbers depend on besides the code under test (absent in older baselines). */
  configuration?: Configuration;
  runs: BaselineRun[];
}

/**
 * Refuses results a baseline must not be made from (`where` names the file): a partial sweep
 * would silently stop gating the runs it lacks, and kept times need the calibration to compare.
 */
export function assertBaselineSource(results: ResultsFile, where: string, keepTime: boolean): void {
  if (results.interrupted) throw new InputError('is from an interrupted sweep; rerun it to completion before making a baseline', where);
  if (results.shard) {
    throw new InputError(`is shard ${results.shard.index}/${results.shard.count}; merge all shards (stepgauge merge) before making a baseline`, where);
  }
  if (keepTime && results.environment.calibrationSeconds === undefined) {
    throw new InputError('has no environment.calibrationSeconds, so --keep-time would keep times that cannot be compared', where);
  }
}

/** Reduces a results file to a baseline; `keepTime` keeps run times and the calibration. */
export function makeBaseline(results: ResultsFile, options: { keepTime?: boolean } = {}): Baseline {
  const calibration = results.environment.calibrationSeconds;
  const source: Baseline['source'] = { createdAt: results.createdAt, stepgauge: results.environment.stepgauge };
  if (results.environment.commit !== undefined) source.commit = results.environment.commit;
  const b: Baseline = { format: BASELINE_FORMAT, version: BASELINE_VERSION, source, problems: [], runs: [] };
  if (options.keepTime && calibration !== undefined) b.calibrationSeconds = calibration;
  b.problems = results.problems.map((p) => ({ id: p.id, sha256: p.sha256 }));
  b.configuration = resultsConfiguration(results);
  b.runs = results.runs.map((r) => baselineRun(r, options.keepTime ? calibration : undefined, options.keepTime ?? false));
  return normalizeBaseline(b);
}

function baselineRun(r: RunResult, calibration: number | undefined, keepTime: boolean): BaselineRun {
  const out: BaselineRun = {
    problem: r.problem,
    method: r.method,
    setting: r.setting,
    status: r.status,
    error: r.error,
    drift: r.drift,
    counts: r.counts,
  };
  if (r.errorBelowReference) out.errorBelowReference = true;
  const unresolved = gateFigures(r.unresolved);
  if (unresolved) out.unresolved = unresolved;
  if (keepTime) {
    const median = r.time.medianSeconds;
    const ratio = r.time.calibrationRatio ?? (median !== null && calibration ? median / calibration : null);
    out.time = { medianSeconds: median, calibrationRatio: ratio };
  }
  return out;
}

/** Rebuilds every object with keys in the fixed order and sorts runs and problems. */
export function normalizeBaseline(b: Baseline): Baseline {
  const source: Baseline['source'] = { createdAt: b.source.createdAt, stepgauge: b.source.stepgauge };
  if (b.source.commit !== undefined) source.commit = b.source.commit;
  const out: Baseline = { format: BASELINE_FORMAT, version: BASELINE_VERSION, source, problems: [], runs: [] };
  if (b.calibrationSeconds !== undefined) out.calibrationSeconds = b.calibrationSeconds;
  out.problems = b.problems.map((p) => ({ id: p.id, sha256: p.sha256 })).sort((x, y) => compareText(x.id, y.id));
  if (b.configuration) {
    const c = b.configuration;
    out.configuration = {
      controller: c.controller,
      maxSteps: c.maxSteps,
      atol: c.atol === null ? null : Array.isArray(c.atol) ? [...c.atol] : c.atol,
      stepgauge: c.stepgauge,
      methods: c.methods.map((m) => ({ id: m.id, family: m.family, sha256: m.sha256 })).sort((x, y) => compareText(x.id, y.id)),
    };
  }
  // Runs last (re-inserted), so the short configuration is read before the long list.
  const runs = b.runs
    .map((r) => ({ key: runKey(r), run: normalizeRun(r) }))
    .sort((x, y) => compareText(x.key, y.key))
    .map((x) => x.run);
  const { runs: _placeholder, ...head } = out;
  return { ...head, runs };
}

function normalizeRun(r: BaselineRun): BaselineRun {
  const s = r.setting;
  const setting: RunSetting =
    'rtol' in s ? { rtol: s.rtol, atol: Array.isArray(s.atol) ? [...s.atol] : s.atol } : { steps: s.steps, h: s.h };
  const drift: Record<string, number> = {};
  for (const name of Object.keys(r.drift).sort(compareText)) drift[name] = r.drift[name]!;
  const c = r.counts;
  const out: BaselineRun = {
    problem: r.problem,
    method: r.method,
    setting,
    status: r.status,
    error: { final: r.error.final, max: r.error.max },
    drift,
    counts: { nfev: c.nfev, njev: c.njev, nlu: c.nlu, accepted: c.accepted, rejected: c.rejected },
  };
  if (r.errorBelowReference) out.errorBelowReference = true;
  const unresolved = gateFigures(r.unresolved);
  if (unresolved) out.unresolved = unresolved;
  if (r.time) out.time = { medianSeconds: r.time.medianSeconds, calibrationRatio: r.time.calibrationRatio ?? null };
  return out;
}

/** The figures a baseline compares (final, max), in that order; undefined when none is unresolved. */
function gateFigures(list: readonly ErrorFigure[] | undefined): ErrorFigure[] | undefined {
  const kept = GATE_FIGURES.filter((f) => list?.includes(f));
  return kept.length > 0 ? kept : undefined;
}

const GATE_FIGURES: readonly ErrorFigure[] = ['final', 'max'];

/** Code-unit order, independent of the locale of the machine writing the file. */
function compareText(a: string, b: string): number {
  return a < b ? -1 : a > b ? 1 : 0;
}

/** The canonical bytes of a baseline (two-space JSON, trailing newline). */
export function serializeBaseline(b: Baseline): string {
  // JSON.stringify writes NaN as null, which parseBaseline reads back as NaN.
  return `${JSON.stringify(normalizeBaseline(b), null, 2)}\n`;
}

/** Reads a baseline file; throws InputError naming the file and field. */
export function readBaselineFile(path: string): Baseline {
  let text: string;
  try {
    text = readFileSync(path, 'utf8');
  } catch (e) {
    throw new InputError(`cannot read baseline file (${(e as NodeJS.ErrnoException).code ?? String(e)})`, path);
  }
  return parseBaseline(text, path);
}

export function parseBaseline(text: string, where: string): Baseline {
  const value = parseJsonText(text, where, READABLE_BASELINE);
  return validateBaseline(value, where);
}

export function validateBaseline(value: unknown, where: string): Baseline {
  const v = new Validator(where);
  const root = v.object(value, '');
  if (root.format !== BASELINE_FORMAT) {
    throw new InputError(`field "format" is ${JSON.stringify(root.format)}; this reader reads ${READABLE_BASELINE}`, where);
  }
  if (root.version !== BASELINE_VERSION) {
    throw new InputError(`field "version" is ${JSON.stringify(root.version)}; this reader reads ${READABLE_BASELINE} only`, where);
  }
  const src = v.object(root.source, 'source');
  const source: Baseline['source'] = { createdAt: v.string(src.createdAt, 'source.createdAt'), stepgauge: v.string(src.stepgauge, 'source.stepgauge') };
  if (src.commit !== undefined) source.commit = v.string(src.commit, 'source.commit');
  const b: Baseline = { format: BASELINE_FORMAT, version: BASELINE_VERSION, source, problems: [], runs: [] };
  if (root.calibrationSeconds !== undefined) b.calibrationSeconds = v.positive(root.calibrationSeconds, 'calibrationSeconds');
  b.problems = v.array(root.problems, 'problems').map((x, i) => {
    const p = v.object(x, `problems[${i}]`);
    return { id: v.string(p.id, `problems[${i}].id`), sha256: v.string(p.sha256, `problems[${i}].sha256`) };
  });
  if (root.configuration !== undefined) b.configuration = validateConfiguration(v, root.configuration);
  b.runs = v.array(root.runs, 'runs').map((x, i) => validateRun(v, x, `runs[${i}]`));
  return b;
}

function validateConfiguration(v: Validator, value: unknown): Configuration {
  const c = v.object(value, 'configuration');
  const atol = c.atol === null ? null : Array.isArray(c.atol) ? c.atol.map((a, i) => v.number(a, `configuration.atol[${i}]`)) : v.number(c.atol, 'configuration.atol');
  return {
    controller: v.string(c.controller, 'configuration.controller'),
    maxSteps: c.maxSteps === null ? null : v.integer(c.maxSteps, 'configuration.maxSteps', 1),
    atol,
    stepgauge: v.string(c.stepgauge, 'configuration.stepgauge'),
    methods: v.array(c.methods, 'configuration.methods').map((x, i) => {
      const m = v.object(x, `configuration.methods[${i}]`);
      return { id: v.string(m.id, `configuration.methods[${i}].id`), family: v.string(m.family, `configuration.methods[${i}].family`), sha256: m.sha256 === null ? null : v.string(m.sha256, `configuration.methods[${i}].sha256`) };
    }),
  };
}

function validateRun(v: Validator, x: unknown, at: string): BaselineRun {
  const r = v.object(x, at);
  const s = v.object(r.setting, `${at}.setting`);
  let setting: RunSetting;
  if ('rtol' in s) {
    const atol = Array.isArray(s.atol) ? s.atol.map((a, i) => v.number(a, `${at}.setting.atol[${i}]`)) : v.number(s.atol, `${at}.setting.atol`);
    setting = { rtol: v.positive(s.rtol, `${at}.setting.rtol`), atol };
  } else if ('steps' in s) {
    setting = { steps: v.integer(s.steps, `${at}.setting.steps`, 1), h: v.number(s.h, `${at}.setting.h`) };
  } else {
    v.fail(`${at}.setting`, 'has neither rtol/atol nor steps/h');
  }
  if (!STATUSES.includes(r.status as Status)) v.fail(`${at}.status`, `is ${JSON.stringify(r.status)}, expected one of ${STATUSES.join(', ')}`);
  const e = v.object(r.error, `${at}.error`);
  const d = v.object(r.drift, `${at}.drift`);
  const drift: Record<string, number> = {};
  for (const [name, val] of Object.entries(d)) drift[name] = val === null ? Number.NaN : v.number(val, `${at}.drift.${name}`);
  const c = v.object(r.counts, `${at}.counts`);
  const count = (k: keyof Counts) => v.integer(c[k], `${at}.counts.${k}`, 0);
  const out: BaselineRun = {
    problem: v.string(r.problem, `${at}.problem`),
    method: v.string(r.method, `${at}.method`),
    setting,
    status: r.status as Status,
    error: { final: v.numberOrNull(e.final, `${at}.error.final`), max: v.numberOrNull(e.max, `${at}.error.max`) },
    drift,
    counts: { nfev: count('nfev'), njev: count('njev'), nlu: count('nlu'), accepted: count('accepted'), rejected: count('rejected') },
  };
  if (r.errorBelowReference !== undefined && v.boolean(r.errorBelowReference, `${at}.errorBelowReference`)) out.errorBelowReference = true;
  if (r.unresolved !== undefined) {
    const list = v.array(r.unresolved, `${at}.unresolved`).map((f, i) => {
      if (!GATE_FIGURES.includes(f as ErrorFigure)) v.fail(`${at}.unresolved[${i}]`, `is ${JSON.stringify(f)}, expected one of ${GATE_FIGURES.join(', ')}`);
      return f as ErrorFigure;
    });
    const kept = gateFigures(list);
    if (kept) out.unresolved = kept;
  }
  if (r.time !== undefined) {
    const t = v.object(r.time, `${at}.time`);
    out.time = {
      medianSeconds: v.numberOrNull(t.medianSeconds, `${at}.time.medianSeconds`),
      calibrationRatio: t.calibrationRatio === undefined ? null : v.numberOrNull(t.calibrationRatio, `${at}.time.calibrationRatio`),
    };
  }
  return out;
}

/** A baseline may be a baseline file or a full results file (e.g. the last release's sweep). */
export function readBaselineOrResults(path: string): Baseline | ResultsFile {
  let value: unknown;
  try {
    value = JSON.parse(readFileSync(path, 'utf8'));
  } catch (e) {
    const code = (e as NodeJS.ErrnoException).code;
    throw new InputError(code ? `cannot read baseline file (${code})` : `not valid JSON (${(e as Error).message})`, path);
  }
  const format = (value as { format?: unknown } | null)?.format;
  if (format === BASELINE_FORMAT) return validateBaseline(value, path);
  if (format === 'stepgauge-results') return validateResults(value, path);
  throw new InputError(`field "format" is ${JSON.stringify(format)}; --baseline reads ${READABLE_BASELINE} or ${READABLE_RESULTS}`, path);
}
