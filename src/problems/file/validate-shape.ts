// Runs a zod schema and turns its first issues into one InputError that names the field and
// points at its line and column.
import type { z } from 'zod';
import { InputError } from '../../core/errors.js';
import { fieldPath, type StructuredFile } from './read-structured.js';

const SHOWN_ISSUES = 3;

export function validateShape<S extends z.ZodType>(schema: S, file: StructuredFile): z.infer<S> {
  const result = schema.safeParse(file.data);
  if (result.success) return result.data;
  const issues = result.error.issues.slice(0, SHOWN_ISSUES);
  // A non-finite number inside a field (a matrix cell, a list entry) is named by its own path.
  const pathOf = (i: z.core.$ZodIssue): (string | number)[] => {
    const at = i.path.filter((p): p is string | number => typeof p !== 'symbol');
    return nonFiniteInside(valueAt(file.data, at), at) ?? at;
  };
  const path = pathOf(issues[0]!);
  const text = issues
    .map((i) => {
      const at = pathOf(i);
      return `${fieldPath(at)}: ${describe(i, valueAt(file.data, at))}`;
    })
    .join('; ');
  const more = result.error.issues.length > SHOWN_ISSUES ? ` (and ${result.error.issues.length - SHOWN_ISSUES} more)` : '';
  throw new InputError(`${text}${more}`, file.locate(path));
}

/** The value the file holds at a field path, or undefined when the path leads nowhere. */
function valueAt(data: unknown, path: readonly (string | number)[]): unknown {
  let v = data;
  for (const key of path) {
    if (v === null || typeof v !== 'object' || !Object.prototype.hasOwnProperty.call(v, key)) return undefined;
    v = (v as Record<string | number, unknown>)[key];
  }
  return v;
}

/** Path of the first NaN or infinite number inside value (value itself included), if any. */
function nonFiniteInside(value: unknown, path: (string | number)[]): (string | number)[] | undefined {
  if (typeof value === 'number') return Number.isFinite(value) ? undefined : path;
  if (value === null || typeof value !== 'object') return undefined;
  const entries: [string | number, unknown][] = Array.isArray(value) ? value.map((v, k) => [k, v]) : Object.entries(value);
  for (const [key, v] of entries) {
    const found = nonFiniteInside(v, [...path, key]);
    if (found) return found;
  }
  return undefined;
}

function describe(issue: z.core.$ZodIssue, value: unknown): string {
  // YAML .nan/.inf and JSON literals past the double range (1e999) arrive as non-finite numbers;
  // the schema's generic union message would hide that.
  if (typeof value === 'number' && !Number.isFinite(value)) return `must be a finite number, got ${value}`;
  if (value === undefined && issue.code === 'invalid_type') return `is required (expected ${issue.expected})`;
  if (issue.code === 'invalid_union') return 'has none of the accepted forms (see schema/problem.schema.json)';
  return issue.message;
}
