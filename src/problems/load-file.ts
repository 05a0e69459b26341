// Entry point for problem files: read YAML or JSON, check the shape, build an equation model or a
// linear state-space model. Every failure is an InputError naming the file, line and field.
import { resolve } from 'node:path';
import { InputError } from '../core/errors.js';
import { buildEquationProblem } from './equations/build.js';
import { readStructuredFile } from './file/read-structured.js';
import { equationFileSchema, linearFileSchema, programModelFileSchema, type EquationFile, type LinearFile } from './file/schema.js';
import { buildProgramModelProblem } from './program-model/build.js';
import { expandDispersion } from './dispersion/expand.js';
import type { Problem } from '../core/types.js';
import { validateShape } from './file/validate-shape.js';
import { fail } from './file/fail.js';
import { prototypeKeyPath } from './file/prototype-keys.js';
import { buildLinearProblem } from './linear/build.js';
import type { UserProblem } from './user-problem.js';
import { readTables } from './tables/file-tables.js';

/** The problem of a file, nominal values only (a dispersion block is checked, not expanded). */
export async function loadProblemFile(path: string): Promise<UserProblem> {
  return (await loadProblemFileWithSamples(path)).nominal;
}

export interface LoadedProblemFile {
  nominal: UserProblem;
  /** One problem per sample, when the file has a dispersion block. */
  samples?: Problem[];
}

export async function loadProblemFileWithSamples(path: string): Promise<LoadedProblemFile> {
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

async function loadChecked(path: string): Promise<LoadedProblemFile> {
  const file = await readStructuredFile(path);
  const data = file.data;
  if (!data || typeof data !== 'object' || Array.isArray(data)) fail(file, [], 'a problem file must hold a mapping of fields (id, title, states, ...)');
  const prototypeKey = prototypeKeyPath(data);
  if (prototypeKey) fail(file, prototypeKey, `'${String(prototypeKey.at(-1))}' cannot be used as a name or key (it is special to JavaScript objects)`);
  if ('base' in data) fail(file, ['base'], 'a file with `base` disperses a built-in problem; give it to --problem directly');
  if ('model' in data) {
    if ('equations' in data || 'linear' in data) fail(file, ['model'], '`model: program` means the equations live in your program: leave out `equations` and `linear`');
    return { nominal: buildProgramModelProblem(file, validateShape(programModelFileSchema, file), resolve(path)) };
  }
  let build: (spec: EquationFile | LinearFile) => Promise<UserProblem>;
  let spec: EquationFile | LinearFile;
  if ('linear' in data) {
    if ('equations' in data) fail(file, ['equations'], 'a file describes either `equations` or a `linear` model, not both');
    spec = validateShape(linearFileSchema, file);
    build = (s) => buildLinearProblem(file, s as LinearFile, resolve(path));
  } else {
    spec = validateShape(equationFileSchema, file);
    build = async (s) => buildEquationProblem(file, s as EquationFile, await readTables(file, s as EquationFile, resolve(path)));
  }
  const nominal = await build(spec);
  if (!spec.dispersion) return { nominal };
  const rebuilt = new Map<string, UserProblem>();
  const parameters = new Map(Object.entries(spec.parameters ?? {}).map(([k, v]) => [k, typeof v === 'number' ? v : undefined] as const));
  // Rebuilding compiles the model again; samples that share parameter values share the build.
  const rebuildSync = (values: Readonly<Record<string, number>>): Problem => rebuilt.get(JSON.stringify(values))!;
  const wanted = dispersionParameterValues(nominal, spec.dispersion, parameters, path);
  for (const values of wanted) {
    const key = JSON.stringify(values);
    if (!rebuilt.has(key)) rebuilt.set(key, await build({ ...spec, parameters: { ...spec.parameters, ...values } }));
  }
  const samples = expandDispersion({ nominal, spec: spec.dispersion, where: path, parameters, rebuild: rebuildSync });
  return { nominal, samples };
}

/** The parameter values every sample will need, so their models can be built before expanding. */
function dispersionParameterValues(
  nominal: Problem,
  spec: NonNullable<EquationFile['dispersion']>,
  parameters: ReadonlyMap<string, number | undefined>,
  where: string,
): Record<string, number>[] {
  if (Object.keys(spec.parameters ?? {}).length === 0 && !(spec.cases ?? []).some((c) => Object.keys(c).some((k) => parameters.has(k)))) return [];
  // A dry expansion with a recording rebuild: the draws are cheap and pure.
  const seen: Record<string, number>[] = [];
  expandDispersion({ nominal, spec, where, parameters, rebuild: (values) => (seen.push({ ...values }), nominal) });
  return seen;
}
