// Entry point for problem files: read YAML or JSON, check the shape, build an equation model or a
// linear state-space model. Every failure is an InputError naming the file, line and field.
import { resolve } from 'node:path';
import { InputError } from '../core/errors.js';
import { buildEquationProblem } from './equations/build.js';
import { readStructuredFile } from './file/read-structured.js';
import { equationFileSchema, linearFileSchema } from './file/schema.js';
import { validateShape } from './file/validate-shape.js';
import { fail } from './file/fail.js';
import { buildLinearProblem } from './linear/build.js';
import type { UserProblem } from './user-problem.js';

export async function loadProblemFile(path: string): Promise<UserProblem> {
  try {
    return await loadChecked(path);
  } catch (e) {
    // The parsers, the shape check and every pass over an expression tree recurse.
    // MAX_EXPRESSION_DEPTH keeps single expressions shallow, but lists nested thousands deep or
    // definitions inlined into one another can still run past the stack.
    if (e instanceof RangeError && /call stack/i.test(e.message)) {
      throw new InputError('nested too deeply to be read (the call stack ran out): flatten nested lists, or use fewer and shorter definitions', path);
    }
    throw e;
  }
}

async function loadChecked(path: string): Promise<UserProblem> {
  const file = await readStructuredFile(path);
  const data = file.data;
  if (!data || typeof data !== 'object' || Array.isArray(data)) fail(file, [], 'a problem file must hold a mapping of fields (id, title, states, ...)');
  if ('linear' in data) {
    if ('equations' in data) fail(file, ['equations'], 'a file describes either `equations` or a `linear` model, not both');
    return buildLinearProblem(file, validateShape(linearFileSchema, file), resolve(path));
  }
  return buildEquationProblem(file, validateShape(equationFileSchema, file));
}
