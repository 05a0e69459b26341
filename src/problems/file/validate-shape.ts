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
  const first = issues[0]!;
  const path = first.path.filter((p): p is string | number => typeof p !== 'symbol');
  const text = issues
    .map((i) => `${fieldPath(i.path.filter((p): p is string | number => typeof p !== 'symbol'))}: ${describe(i)}`)
    .join('; ');
  const more = result.error.issues.length > SHOWN_ISSUES ? ` (and ${result.error.issues.length - SHOWN_ISSUES} more)` : '';
  throw new InputError(`${text}${more}`, file.locate(path));
}

function describe(issue: z.core.$ZodIssue): string {
  if (issue.code === 'invalid_union') return 'has none of the accepted forms (see schema/problem.schema.json)';
  return issue.message;
}
