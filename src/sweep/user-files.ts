// Loading user problem and method files: YAML/JSON problem files and TypeScript/JavaScript modules.
import { existsSync, statSync } from 'node:fs';
import { extname } from 'node:path';
import type { Method, Problem } from '../core/types.js';
import type { SampleSet } from '../problems/dispersion/expand.js';
import { InputError } from '../core/errors.js';
import { loadDispersionOfBuiltin } from './dispersion-file.js';
import { kindOf } from '../problems/file/read-limited.js';
import { loadMethodModule, loadProblemModule } from '../authoring/module-loader.js';

const MODULE = /\.(?:[cm]?[jt]s)$/i;

function assertFile(path: string, flag: string): void {
  if (!existsSync(path)) throw new InputError(`file not found`, `${flag} ${path}`);
  const s = statSync(path);
  if (!s.isFile()) throw new InputError(`expected a file, found ${kindOf(s)}`, `${flag} ${path}`);
}

/** The problem of a file, or its samples (built on demand) when the file disperses one. */
export async function loadUserProblem(path: string): Promise<Problem | SampleSet> {
  assertFile(path, '--problem');
  if (MODULE.test(path)) return loadProblemModule(path);
  if (/\.(ya?ml|json)$/i.test(path)) {
    const builtin = await loadDispersionOfBuiltin(path);
    if (builtin) return builtin;
    // The expression compiler (mathjs) is loaded only for a file that has equations: it holds
    // about 35 MB in each process, which a dispersion of a built-in problem does not need.
    const { loadProblemFileWithSamples } = await import('../problems/load-file.js');
    const loaded = await loadProblemFileWithSamples(path);
    return loaded.samples ?? loaded.nominal;
  }
  throw new InputError(`unknown problem file type '${extname(path)}'; expected .yaml, .yml, .json, .ts or .js`, `--problem ${path}`);
}

export async function loadUserMethod(path: string): Promise<Method> {
  assertFile(path, '--method');
  if (/\.ya?ml$/i.test(path)) {
    const { loadProgramFile } = await import('../methods/program/file.js');
    const { programMethod } = await import('../methods/program/method.js');
    return programMethod(loadProgramFile(path));
  }
  if (!MODULE.test(path)) throw new InputError(`a method is a module (.ts or .js) or a program file (.yaml)`, `--method ${path}`);
  return loadMethodModule(path);
}
