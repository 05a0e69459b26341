// A dispersion of a built-in problem: a small file naming the catalogue problem (`base`) and the
// dispersion block. Kept in the sweep layer because it needs the catalogue.
import { readStructuredFile } from '../problems/file/read-structured.js';
import { dispersionFileSchema } from '../problems/file/schema.js';
import { validateShape } from '../problems/file/validate-shape.js';
import { fail } from '../problems/file/fail.js';
import { dispersionSamples, type SampleSet } from '../problems/dispersion/expand.js';
import { catalogue } from '../../problems/index.js';

/** The samples when `path` disperses a built-in problem; null when it is another kind of file. */
export async function loadDispersionOfBuiltin(path: string): Promise<SampleSet | null> {
  const file = await readStructuredFile(path);
  const data = file.data;
  if (!data || typeof data !== 'object' || Array.isArray(data) || !('base' in data)) return null;
  const spec = validateShape(dispersionFileSchema, file);
  const nominal = catalogue.find((p) => p.id === spec.base);
  if (!nominal) fail(file, ['base'], `no built-in problem is called '${spec.base}'; expected one of: ${catalogue.map((p) => p.id).join(', ')}`);
  // Built-in models are code: their parameters are fixed, only initial states can be dispersed.
  return dispersionSamples({ nominal, spec: spec.dispersion, where: path, parameters: new Map() });
}
