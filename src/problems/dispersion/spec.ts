// The `dispersion` block of a problem file: how many samples, the seed, and the distribution of
// each dispersed initial state and parameter, plus explicit cases. Checked with zod like the rest
// of the file; names are checked against the model by `expandDispersion`.
import { z } from 'zod';

/** Largest sample count one file may ask for; past it, split the envelope over several files. */
export const MAX_DISPERSION_SAMPLES = 1_000_000;

const finite = z.number().refine(Number.isFinite, 'must be a finite number');

/**
 * One dispersed quantity. `normal`: mean (default the nominal value) and standard deviation `sd`,
 * or a bare number for sd around the nominal value. `uniform`: [low, high], absolute bounds.
 */
export const distributionSpec = z.union([
  z.strictObject({ normal: z.union([finite.pipe(z.number().nonnegative()), z.strictObject({ mean: finite.optional(), sd: finite.pipe(z.number().nonnegative()) })]) }),
  z.strictObject({ uniform: z.tuple([finite, finite]).refine(([lo, hi]) => lo <= hi, 'low must not exceed high') }),
]);
export type DistributionSpec = z.infer<typeof distributionSpec>;

export const dispersionSpec = z.strictObject({
  /** Random samples drawn from the distributions (numbered 1..samples). */
  samples: z.number().int().min(0).max(MAX_DISPERSION_SAMPLES),
  /** Unsigned 32-bit seed: the same seed gives the same samples on every machine and shard. */
  seed: z.number().int().min(0).max(0xffffffff),
  initial: z.record(z.string(), distributionSpec).optional(),
  parameters: z.record(z.string(), distributionSpec).optional(),
  /** Explicit cases (corner cases, a failing sample to rerun), numbered after the random samples. */
  cases: z.array(z.record(z.string(), finite)).optional(),
});
export type DispersionSpec = z.infer<typeof dispersionSpec>;
