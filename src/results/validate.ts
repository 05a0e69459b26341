// Structural checks for JSON files read by stepgauge (results, baselines): each check names the
// file and the field path and says what was found, so bad input fails with one clear line.
import { InputError } from '../core/errors.js';

/** Small checking kit: each check names the field path and what was found. */
export class Validator {
  constructor(private readonly where: string) {}

  fail(field: string, what: string): never {
    throw new InputError(`field "${field || '(top level)'}" ${what}`, this.where);
  }

  object(x: unknown, field: string): Record<string, unknown> {
    if (typeof x !== 'object' || x === null || Array.isArray(x)) this.fail(field, `is ${describe(x)}, expected an object`);
    return x as Record<string, unknown>;
  }

  array(x: unknown, field: string): unknown[] {
    if (!Array.isArray(x)) this.fail(field, `is ${describe(x)}, expected an array`);
    return x;
  }

  string(x: unknown, field: string): string {
    if (typeof x !== 'string') this.fail(field, `is ${describe(x)}, expected a string`);
    return x;
  }

  boolean(x: unknown, field: string): boolean {
    if (typeof x !== 'boolean') this.fail(field, `is ${describe(x)}, expected true or false`);
    return x;
  }

  number(x: unknown, field: string): number {
    if (typeof x !== 'number' || !Number.isFinite(x)) this.fail(field, `is ${describe(x)}, expected a number`);
    return x;
  }

  numberOrNull(x: unknown, field: string): number | null {
    if (x === null) return null;
    return this.number(x, field);
  }

  positive(x: unknown, field: string): number {
    const n = this.number(x, field);
    if (!(n > 0)) this.fail(field, `is ${n}, expected a positive number`);
    return n;
  }

  integer(x: unknown, field: string, min: number): number {
    const n = this.number(x, field);
    if (!Number.isInteger(n) || n < min) this.fail(field, `is ${n}, expected an integer >= ${min}`);
    return n;
  }
}

function describe(x: unknown): string {
  if (x === undefined) return 'missing';
  if (x === null) return 'null';
  if (Array.isArray(x)) return 'an array';
  if (typeof x === 'object') return 'an object';
  const text = JSON.stringify(x);
  return `${typeof x} ${text.length > 40 ? `${text.slice(0, 40)}...` : text}`;
}
