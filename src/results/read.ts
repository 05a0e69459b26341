// Validating reader of results.json. Every consumer after a sweep (report, merge, check,
// baseline) reads through here, so a malformed or foreign file fails once, naming the file and
// the field, instead of surfacing later as a NaN in a table.
import { parseJsonText } from '../core/json-text.js';
import { readFileSync } from 'node:fs';
import { InputError } from '../core/errors.js';
import {
  RESULTS_FORMAT,
  RESULTS_VERSION,
  type Environment,
  type ProblemRecord,
  type ResultsFile,
  type RunResult,
  type RunSetting,
  type ErrorFigure,
} from './contract.js';
import { STATUSES, type Status } from '../core/types.js';
import { stepsProblem, toleranceProblem } from '../core/setting.js';
import { Validator } from './validate.js';

/** What this reader understands; quoted in every "cannot read" message. */
export const READABLE_RESULTS = `${RESULTS_FORMAT} version ${RESULTS_VERSION}`;

const REFERENCE_KINDS = ['exact', 'published', 'certified', 'trajectory', 'self'] as const;
const ERROR_FIGURES: readonly ErrorFigure[] = ['final', 'max', 'outputs', 'dense'];

/** Reads and validates a results file; throws InputError naming the file and field. */
export function readResultsFile(path: string): ResultsFile {
  let text: string;
  try {
    text = readFileSync(path, 'utf8');
  } catch (e) {
    throw new InputError(`cannot read results file (${(e as NodeJS.ErrnoException).code ?? String(e)})`, path);
  }
  return parseResultsText(text, path);
}

/** Parses results JSON text; `where` names the source in messages (usually the path). */
export function parseResultsText(text: string, where: string): ResultsFile {
  return validateResults(parseJsonText(text, where, READABLE_RESULTS), where);
}

/**
 * Checks a parsed value against the results contract and returns it typed. Unknown extra fields
 * are kept (the contract allows additions). JSON has no NaN, so writers emit null for a drift
 * that was not finite; it is read back as NaN to keep `drift` a record of numbers.
 */
export function validateResults(value: unknown, where: string): ResultsFile {
  const v = new Validator(where);
  const root = v.object(value, '');
  if (root.format !== RESULTS_FORMAT) {
    throw new InputError(
      `field "format" is ${JSON.stringify(root.format)}, not a stepgauge results file; this reader reads ${READABLE_RESULTS}`,
      where,
    );
  }
  if (root.version !== RESULTS_VERSION) {
    const newer = typeof root.version === 'number' && root.version > RESULTS_VERSION;
    throw new InputError(
      `field "version" is ${JSON.stringify(root.version)}${newer ? ' (written by a newer stepgauge)' : ''}; this reader reads ${READABLE_RESULTS} only`,
      where,
    );
  }
  v.string(root.createdAt, 'createdAt');
  const env = v.object(root.environment, 'environment');
  for (const k of ['node', 'platform', 'arch', 'cpu', 'stepgauge'] as const) v.string(env[k], `environment.${k}`);
  if (env.calibrationSeconds !== undefined) v.positive(env.calibrationSeconds, 'environment.calibrationSeconds');
  const runs = v.array(root.runs, 'runs').map((r, i) => validateRun(v, r, `runs[${i}]`));
  const problems = v.array(root.problems, 'problems').map((p, i) => validateProblem(v, p, `problems[${i}]`));
  if (root.interrupted !== undefined) v.boolean(root.interrupted, 'interrupted');
  if (root.shard !== undefined) {
    const s = v.object(root.shard, 'shard');
    const count = v.integer(s.count, 'shard.count', 1);
    const index = v.integer(s.index, 'shard.index', 1);
    if (index > count) v.fail('shard.index', `is ${index}, larger than shard.count ${count}`);
    v.string(s.planSha256, 'shard.planSha256');
  }
  return { ...root, environment: env as Environment, runs, problems } as ResultsFile;
}

function validateRun(v: Validator, value: unknown, at: string): RunResult {
  const r = v.object(value, at);
  v.string(r.problem, `${at}.problem`);
  v.string(r.method, `${at}.method`);
  const setting = validateSetting(v, r.setting, `${at}.setting`);
  if (!STATUSES.includes(r.status as Status)) v.fail(`${at}.status`, `is ${JSON.stringify(r.status)}, expected one of ${STATUSES.join(', ')}`);
  if (r.message !== undefined) v.string(r.message, `${at}.message`);
  const error = v.object(r.error, `${at}.error`);
  v.numberOrNull(error.final, `${at}.error.final`);
  v.numberOrNull(error.max, `${at}.error.max`);
  for (const k of ['outputs', 'dense'] as const) if (error[k] !== undefined) v.numberOrNull(error[k], `${at}.error.${k}`);
  if (r.resolution !== undefined) {
    const res = v.object(r.resolution, `${at}.resolution`);
    for (const k of ['final', 'max', 'outputs', 'dense'] as const) if (res[k] !== undefined) v.numberOrNull(res[k], `${at}.resolution.${k}`);
  }
  if (r.unresolved !== undefined) {
    v.array(r.unresolved, `${at}.unresolved`).forEach((f, i) => {
      if (!ERROR_FIGURES.includes(f as ErrorFigure)) v.fail(`${at}.unresolved[${i}]`, `is ${JSON.stringify(f)}, expected one of ${ERROR_FIGURES.join(', ')}`);
    });
  }
  if (r.denseInterpolant !== undefined) v.string(r.denseInterpolant, `${at}.denseInterpolant`);
  if (r.eventEvaluations !== undefined) v.integer(r.eventEvaluations, `${at}.eventEvaluations`, 0);
  if (r.denseEvaluations !== undefined) v.integer(r.denseEvaluations, `${at}.denseEvaluations`, 0);
  if (r.events !== undefined) {
    for (const [name, e] of Object.entries(v.object(r.events, `${at}.events`))) {
      const rec = v.object(e, `${at}.events.${name}`);
      v.array(rec.times, `${at}.events.${name}.times`);
      if (rec.locatedBy !== undefined) v.string(rec.locatedBy, `${at}.events.${name}.locatedBy`);
    }
  }
  const driftIn = v.object(r.drift, `${at}.drift`);
  const drift: Record<string, number> = {};
  for (const [name, d] of Object.entries(driftIn)) {
    drift[name] = d === null ? Number.NaN : v.number(d, `${at}.drift.${name}`);
  }
  const counts = v.object(r.counts, `${at}.counts`);
  for (const k of ['nfev', 'njev', 'nlu', 'accepted', 'rejected'] as const) v.integer(counts[k], `${at}.counts.${k}`, 0);
  const time = v.object(r.time, `${at}.time`);
  v.numberOrNull(time.medianSeconds, `${at}.time.medianSeconds`);
  v.integer(time.samples, `${at}.time.samples`, 0);
  if (time.calibrationRatio !== undefined) v.numberOrNull(time.calibrationRatio, `${at}.time.calibrationRatio`);
  v.number(r.tFinal, `${at}.tFinal`);
  const yFinal = v.array(r.yFinal, `${at}.yFinal`);
  yFinal.forEach((y, i) => {
    if (y !== null) v.number(y, `${at}.yFinal[${i}]`);
  });
  if (r.errorBelowReference !== undefined) v.boolean(r.errorBelowReference, `${at}.errorBelowReference`);
  if (r.planIndex !== undefined) v.integer(r.planIndex, `${at}.planIndex`, 0);
  return { ...r, setting, drift } as unknown as RunResult;
}

function validateSetting(v: Validator, value: unknown, at: string): RunSetting {
  const s = v.object(value, at);
  // The same rules a method applied when it accepted the setting (core/setting.ts).
  if ('rtol' in s) {
    const problem = toleranceProblem(s.rtol, s.atol, { rtolMayBeZero: true });
    if (problem) v.fail(`${at}.${problem.field}`, problem.what);
  } else if ('steps' in s) {
    const problem = stepsProblem(s.steps);
    if (problem) v.fail(`${at}.${problem.field}`, problem.what);
    v.number(s.h, `${at}.h`);
  } else {
    v.fail(at, 'has neither rtol/atol nor steps/h');
  }
  return s as RunSetting;
}

function validateProblem(v: Validator, value: unknown, at: string): ProblemRecord {
  const p = v.object(value, at);
  v.string(p.id, `${at}.id`);
  v.string(p.title, `${at}.title`);
  v.string(p.sha256, `${at}.sha256`);
  v.boolean(p.stiff, `${at}.stiff`);
  const ref = v.object(p.reference, `${at}.reference`);
  if (!REFERENCE_KINDS.includes(ref.kind as (typeof REFERENCE_KINDS)[number])) {
    v.fail(`${at}.reference.kind`, `is ${JSON.stringify(ref.kind)}, expected one of ${REFERENCE_KINDS.join(', ')}`);
  }
  if (ref.digits !== undefined) v.number(ref.digits, `${at}.reference.digits`);
  return p as ProblemRecord;
}
