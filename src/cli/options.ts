// Parsing and validating command-line values: every failure names the flag and what was expected.
import { InputError } from '../core/errors.js';
import { CONTROLLER_KINDS, type ControllerKind } from '../core/types.js';
import { MAX_RUN_TIMEOUT_SECONDS } from '../core/defaults.js';
import { requestedRtolProblem } from '../core/setting.js';
import { decades } from '../sweep/plan.js';

function positiveNumber(text: string, flag: string): number {
  const v = Number(text);
  if (text.trim() === '' || !Number.isFinite(v)) throw new InputError(`'${text}' is not a number`, flag);
  if (v <= 0) throw new InputError(`'${text}' must be positive`, flag);
  return v;
}

/** The forms -t accepts, said with every error in it. */
export const TOLERANCE_FORMS = 'a list like 1e-4,1e-8 or a range like 1e-3..1e-12 (one per decade, either direction)';

/** "1e-4,1e-8" (a list) or "1e-3..1e-12" (one per decade, either direction). */
export function parseTolerances(text: string, flag = '--tolerances'): number[] {
  const fail = (what: string): never => {
    throw new InputError(`${what}; expected ${TOLERANCE_FORMS}`, flag);
  };
  const value = (part: string): number => {
    const v = Number(part);
    if (part.trim() === '' || !Number.isFinite(v)) fail(`'${part.trim()}'${part.trim() === text.trim() ? '' : ` in '${text}'`} is not a number`);
    if (v <= 0) fail(`'${part.trim()}' must be positive`);
    const problem = requestedRtolProblem(v);
    if (problem) fail(problem);
    return v;
  };
  const trimmed = text.trim();
  if (trimmed === '') fail('no tolerance given');
  if (trimmed.includes('..')) {
    const parts = trimmed.split('..');
    if (parts.length !== 2) fail(`'${text}' is not a range`);
    return decades(value(parts[0]!), value(parts[1]!));
  }
  const values = trimmed.split(',').map((p) => {
    if (p.trim() === '') fail(`empty entry in '${text}'`);
    return value(p);
  });
  return [...new Set(values)];
}

/** A comma list of positive whole step counts. */
export function parseSteps(text: string): number[] {
  const flag = '--steps';
  if (text.trim() === '') throw new InputError('expected a list of step counts like 100,200,400', flag);
  const values = text.split(',').map((p) => {
    const v = positiveNumber(p, flag);
    if (!Number.isInteger(v)) throw new InputError(`'${p.trim()}' must be a whole number of steps`, flag);
    return v;
  });
  return [...new Set(values)];
}

/** --atol: one positive value for every state, or a comma list with one per state. */
export function parseAtol(text: string): number | number[] {
  const parts = text.split(',');
  const values = parts.map((p) => positiveNumber(p, '--atol'));
  return values.length === 1 ? values[0]! : values;
}

/** --summary-levels: a comma list of positive error levels. */
export function parseLevels(text: string): number[] {
  return [...new Set(text.split(',').map((p) => positiveNumber(p, '--summary-levels')))];
}

export function parsePositiveInt(text: string, flag: string): number {
  const v = positiveNumber(text, flag);
  if (!Number.isInteger(v)) throw new InputError(`'${text}' must be a whole number`, flag);
  return v;
}

/** Any finite number (the gate's factors and floor). */
export function parseNumber(value: string, flag: string): number {
  const n = Number(value);
  if (value.trim() === '' || !Number.isFinite(n)) throw new InputError(`expected a number, got ${JSON.stringify(value)}`, flag);
  return n;
}

export function parsePositive(text: string, flag: string): number {
  return positiveNumber(text, flag);
}

/** --controller: standard, pi or deadband (methods/explicit/control.ts). */
export function parseController(text: string): ControllerKind {
  if (!CONTROLLER_KINDS.includes(text as ControllerKind)) throw new InputError(`'${text}' is not a controller; expected ${CONTROLLER_KINDS.join(', ')}`, '--controller');
  return text as ControllerKind;
}

/** Help text of --controller, the same for run and choose. */
export const CONTROLLER_HELP = 'step-size controller for explicit pairs: standard, pi, or deadband (standard, but the step is kept while 0.5 <= err <= 1)';

export function parseRunTimeout(text: string): number {
  const v = positiveNumber(text, '--run-timeout');
  if (v > MAX_RUN_TIMEOUT_SECONDS) {
    throw new InputError(`'${text}' seconds is more than the longest run timeout, ${MAX_RUN_TIMEOUT_SECONDS} s (a day); leave the flag out for no limit`, '--run-timeout');
  }
  return v;
}

/**
 * --jobs as asked, held to twice the available cores (at least 4): each worker is a
 * single-threaded process that computes all the time, so more of them only share the cores and
 * cost memory (--jobs 1000 started 1000 processes). `note` is told when the value was lowered.
 */
export function parseJobs(text: string, cores: number, note: (message: string) => void): number {
  const asked = parsePositiveInt(text, '--jobs');
  const cap = Math.max(4, 2 * cores);
  if (asked <= cap) return asked;
  note(`--jobs ${asked} lowered to ${cap} (twice the ${cores} available cores); more workers would only share the cores`);
  return cap;
}

/** A comma list of positive numbers (rates, step sizes). */
export function parsePositiveList(text: string, flag: string): number[] {
  if (text.trim() === '') throw new InputError('expected a comma list of positive numbers', flag);
  return [...new Set(text.split(',').map((p) => positiveNumber(p, flag)))];
}
