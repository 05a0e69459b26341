// Parsing and validating command-line values: every failure names the flag and what was expected.
import { InputError } from '../core/errors.js';
import { decades } from '../sweep/plan.js';

function positiveNumber(text: string, flag: string): number {
  const v = Number(text);
  if (text.trim() === '' || !Number.isFinite(v)) throw new InputError(`'${text}' is not a number`, flag);
  if (v <= 0) throw new InputError(`'${text}' must be positive`, flag);
  return v;
}

/** "1e-4,1e-8" (a list) or "1e-3..1e-12" (one per decade, either direction). */
export function parseTolerances(text: string): number[] {
  const flag = '--tolerances';
  const trimmed = text.trim();
  if (trimmed === '') throw new InputError('expected a list like 1e-4,1e-8 or a range like 1e-3..1e-12', flag);
  if (trimmed.includes('..')) {
    const parts = trimmed.split('..');
    if (parts.length !== 2) throw new InputError(`'${text}' is not a range like 1e-3..1e-12`, flag);
    const a = positiveNumber(parts[0]!, flag);
    const b = positiveNumber(parts[1]!, flag);
    checkTolerance(a, flag);
    checkTolerance(b, flag);
    return decades(a, b);
  }
  const values = trimmed.split(',').map((p) => {
    if (p.trim() === '') throw new InputError(`empty entry in '${text}'; expected a list like 1e-4,1e-8`, flag);
    const v = positiveNumber(p, flag);
    checkTolerance(v, flag);
    return v;
  });
  return [...new Set(values)];
}

function checkTolerance(v: number, flag: string): void {
  if (v >= 1) throw new InputError(`tolerance ${v} must be below 1`, flag);
  if (v < 1e-16) throw new InputError(`tolerance ${v} is below double precision (1e-16)`, flag);
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

export function parsePositiveInt(text: string, flag: string): number {
  const v = positiveNumber(text, flag);
  if (!Number.isInteger(v)) throw new InputError(`'${text}' must be a whole number`, flag);
  return v;
}

export function parsePositive(text: string, flag: string): number {
  return positiveNumber(text, flag);
}

/** A comma list of positive numbers (rates, step sizes). */
export function parsePositiveList(text: string, flag: string): number[] {
  if (text.trim() === '') throw new InputError('expected a comma list of positive numbers', flag);
  return [...new Set(text.split(',').map((p) => positiveNumber(p, flag)))];
}
