// Loading user problem and method files (YAML/JSON problem files, TypeScript/JavaScript modules).
import type { Method, Problem } from '../core/types.js';
import { InputError } from '../core/errors.js';

export async function loadUserProblem(path: string): Promise<Problem> {
  throw new InputError('user problem files are not supported yet', path);
}

export async function loadUserMethod(path: string): Promise<Method> {
  throw new InputError('user method modules are not supported yet', path);
}
