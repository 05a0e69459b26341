// One problem with a dispersion block becomes one problem per sample. Each sample is an ordinary
// problem (its own id, y0, parameters, definition and so SHA-256), so planning, sharding, workers,
// certification caching and merging treat it like any other.
//
// References: dispersing an initial state invalidates an exact formula written for the nominal
// state and any published table, so such samples take the model's closed form from another state
// where it has one (`exactFromState`), else a certified reference. Dispersing only parameters
// keeps exact formulas, which are written in terms of the parameters.
import { InputError } from '../../core/errors.js';
import type { DispersionTag, Problem, Reference } from '../../core/types.js';
import { drawValue } from './sample.js';
import type { DispersionSpec, DistributionSpec } from './spec.js';

export interface DispersionInput {
  nominal: Problem;
  spec: DispersionSpec;
  /** The file (or flag) the block came from, for messages. */
  where: string;
  /** Parameter names and nominal values (numbers, where the file gives numbers). */
  parameters: ReadonlyMap<string, number | undefined>;
  /** The model rebuilt with other parameter values; needed only when parameters are dispersed. */
  rebuild?: (values: Readonly<Record<string, number>>) => Problem;
}

/** Id of sample k of a problem: still kebab-case, so every id rule holds for it. */
export function sampleId(of: string, k: number): string {
  return `${of}-s${k}`;
}

/**
 * The samples of a dispersion, each built when asked for: a sample is a pure function of (seed,
 * sample number), so a process builds only the samples it runs and a sweep's memory does not grow
 * with the sample count.
 */
export interface SampleSet {
  /** The nominal problem's id. */
  of: string;
  /** Random samples plus explicit cases, numbered 1..count. */
  count: number;
  /** The undispersed problem (what every sample shares: pairing, tolerances, atol scale, layout). */
  nominal: Problem;
  /** Sample k (1..count), built now. */
  sample(k: number): Problem;
}

/** Checks the block against the model and answers its samples, built on demand. */
export function dispersionSamples(input: DispersionInput): SampleSet {
  const { nominal, spec, where } = input;
  const states = nominal.stateNames ?? nominal.y0.map((_, i) => `y${i + 1}`);
  const initial = Object.entries(spec.initial ?? {});
  const parameters = Object.entries(spec.parameters ?? {});
  for (const [name] of initial) {
    if (!states.includes(name)) throw new InputError(`dispersion.initial.${name}: no state is called '${name}'; states: ${states.join(', ')}`, where);
  }
  for (const [name, dist] of parameters) {
    if (!input.parameters.has(name)) throw new InputError(`dispersion.parameters.${name}: no parameter is called '${name}'`, where);
    if (input.parameters.get(name) === undefined && needsNominal(dist)) {
      throw new InputError(`dispersion.parameters.${name}: the parameter is an expression, so its normal distribution needs an explicit mean`, where);
    }
  }
  if (parameters.length > 0 && !input.rebuild) throw new InputError('dispersion.parameters: this problem cannot be rebuilt with other parameter values (only problem files can)', where);
  const known = new Set([...states, ...input.parameters.keys()]);
  (spec.cases ?? []).forEach((c, i) => {
    for (const name of Object.keys(c)) {
      if (!known.has(name)) throw new InputError(`dispersion.cases[${i}].${name}: not a state or parameter of ${nominal.id}`, where);
    }
  });
  const total = spec.samples + (spec.cases?.length ?? 0);
  if (total === 0) throw new InputError('dispersion: no samples and no cases; give samples > 0 or a list of cases', where);

  const sample = (k: number): Problem => {
    if (!Number.isInteger(k) || k < 1 || k > total) throw new RangeError(`${nominal.id} has samples 1..${total}, not ${k}`);
    const explicit = k > spec.samples ? spec.cases![k - spec.samples - 1]! : undefined;
    const values: Record<string, number> = {};
    if (explicit) Object.assign(values, explicit);
    else {
      // Quantities are numbered by their place in the block, so adding one never moves another's draws.
      initial.forEach(([name, dist], q) => (values[name] = drawValue(dist, nominal.y0[states.indexOf(name)]!, spec.seed, k, q)));
      parameters.forEach(([name, dist], q) => (values[name] = drawValue(dist, input.parameters.get(name) ?? 0, spec.seed, k, initial.length + q)));
    }
    return sampleProblem(input, states, values, { of: nominal.id, sample: k, explicitCase: explicit !== undefined, seed: spec.seed, values });
  };
  return { of: nominal.id, count: total, nominal, sample };
}

/** Every sample, built at once (choose over a dispersion runs them all at every trial). */
export function expandDispersion(input: DispersionInput): Problem[] {
  const set = dispersionSamples(input);
  return Array.from({ length: set.count }, (_, i) => set.sample(i + 1));
}

/** The sample number of a sample id of `of` (sampleId's inverse), or null when `id` is not one. */
export function sampleNumber(of: string, id: string): number | null {
  const prefix = `${of}-s`;
  if (!id.startsWith(prefix)) return null;
  const text = id.slice(prefix.length);
  return /^[1-9][0-9]*$/.test(text) ? Number(text) : null;
}

function needsNominal(dist: DistributionSpec): boolean {
  return 'normal' in dist && (typeof dist.normal === 'number' || dist.normal.mean === undefined);
}

function sampleProblem(input: DispersionInput, states: readonly string[], values: Record<string, number>, tag: DispersionTag): Problem {
  const paramValues: Record<string, number> = {};
  for (const name of input.parameters.keys()) if (name in values) paramValues[name] = values[name]!;
  const model = Object.keys(paramValues).length > 0 ? input.rebuild!(paramValues) : input.nominal;
  const y0 = model.y0.map((v, i) => values[states[i]!] ?? v);
  const statesMoved = states.some((s) => s in values);
  for (const v of y0) {
    if (!Number.isFinite(v)) throw new InputError(`dispersion sample ${tag.sample}: initial state is not finite (${y0.join(', ')})`, input.where);
  }
  const id = sampleId(input.nominal.id, tag.sample);
  return {
    ...model,
    id,
    title: `${input.nominal.title}, dispersion sample ${tag.sample}`,
    y0,
    reference: statesMoved ? referenceFrom(model, y0) : model.reference,
    // The sample's values are part of what it is: two samples never share a hash or a certificate.
    definition: `${model.definition}\ndispersion of ${input.nominal.id}, sample ${tag.sample}${tag.explicitCase ? ' (explicit case)' : ''}, seed ${tag.seed}: ${JSON.stringify(values)}`,
    dispersion: tag,
  };
}

function referenceFrom(model: Problem, y0: readonly number[]): Reference {
  const closed = model.exactFromState?.(y0);
  if (closed) return { kind: 'exact', source: closed.source, exact: closed.exact };
  return { kind: 'certified', points: [] };
}
