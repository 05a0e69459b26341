// Entry point for problem files: read YAML or JSON, check the shape, build an equation model or a
// linear state-space model. Every failure is an InputError naming the file, line and field.
import { resolve } from 'node:path';
import { InputError } from '../core/errors.js';
import { buildEquationProblem } from './equations/build.js';
import { readStructuredFile } from './file/read-structured.js';
import { equationFileSchema, linearFileSchema, programModelFileSchema, type EquationFile, type LinearFile } from './file/schema.js';
import { buildProgramModelProblem } from './program-model/build.js';
import { dispersionSamples, type SampleSet } from './dispersion/expand.js';
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
  /** The samples, built on demand, when the file has a dispersion block. */
  samples?: SampleSet;
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
  /** Set for equation files: builds the model with other parameter values without waiting (tables are read once). */
  let buildNow: ((spec: EquationFile) => UserProblem) | undefined;
  let spec: EquationFile | LinearFile;
  if ('linear' in data) {
    if ('equations' in data) fail(file, ['equations'], 'a file describes either `equations` or a `linear` model, not both');
    spec = validateShape(linearFileSchema, file);
    build = (s) => buildLinearProblem(file, s as LinearFile, resolve(path));
  } else {
    const equations = validateShape(equationFileSchema, file);
    spec = equations;
    const tables = await readTables(file, equations, resolve(path));
    buildNow = (s) => buildEquationProblem(file, s, tables);
    build = async (s) => buildNow!(s as EquationFile);
  }
  const nominal = await build(spec);
  if (!spec.dispersion) return { nominal };
  const parameters = new Map(Object.entries(spec.parameters ?? {}).map(([k, v]) => [k, typeof v === 'number' ? v : undefined] as const));
  const withValues = (values: Readonly<Record<string, number>>) => ({ ...spec, parameters: { ...spec.parameters, ...values } });
  let rebuild: (values: Readonly<Record<string, number>>) => Problem;
  if (buildNow) {
    // Compiled when a sample is built, which each process does only for the samples it runs; the
    // last few builds are kept, since samples that share parameter values (explicit cases) share one.
    const recent = new Map<string, Problem>();
    rebuild = (values) => {
      const key = JSON.stringify(values);
      let model = recent.get(key);
      if (!model) {
        model = buildNow!(withValues(values) as EquationFile);
        if (recent.size >= RECENT_BUILDS) recent.delete(recent.keys().next().value!);
        recent.set(key, model);
      }
      return model;
    };
  } else {
    // A linear model may read its matrices from files, which takes waiting: its parameter values
    // are built before sampling, one build per distinct set of values.
    const rebuilt = new Map<string, UserProblem>();
    for (const values of dispersionParameterValues(nominal, spec.dispersion, parameters, path)) {
      const key = JSON.stringify(values);
      if (!rebuilt.has(key)) rebuilt.set(key, await build(withValues(values)));
    }
    rebuild = (values) => rebuilt.get(JSON.stringify(values))!;
  }
  return { nominal, samples: dispersionSamples({ nominal, spec: spec.dispersion, where: path, parameters, rebuild }) };
}

/** Equation models built for other parameter values and kept for the next sample. */
const RECENT_BUILDS = 4;

/** The parameter values every sample will need, so their models can be built before expanding. */
function dispersionParameterValues(
  nominal: Problem,
  spec: NonNullable<EquationFile['dispersion']>,
  parameters: ReadonlyMap<string, number | undefined>,
  where: string,
): Record<string, number>[] {
  if (Object.keys(spec.parameters ?? {}).length === 0 && !(spec.cases ?? []).some((c) => Object.keys(c).some((k) => parameters.has(k)))) return [];
  // A dry pass over the samples with a recording rebuild: the draws are cheap and pure.
  const seen: Record<string, number>[] = [];
  const dry = dispersionSamples({ nominal, spec, where, parameters, rebuild: (values) => (seen.push({ ...values }), nominal) });
  for (let k = 1; k <= dry.count; k++) dry.sample(k);
  return seen;
}
