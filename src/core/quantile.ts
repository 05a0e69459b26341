// Quantiles of measured errors over the samples of a dispersion.

/**
 * The nearest-rank quantile: the smallest value v such that at least ceil(q n) of the values are
 * at most v (Hyndman and Fan, Am. Stat. 50 (1996), definition 1 applied to the upper rank). It is
 * always one of the values, so "the q quantile meets the target" means at least a share q of the
 * samples did, with no interpolation between samples.
 */
export function quantileOf(sorted: readonly number[], q: number): number {
  if (sorted.length === 0) return NaN;
  const rank = Math.max(1, Math.ceil(q * sorted.length - 1e-9));
  return sorted[Math.min(sorted.length, rank) - 1]!;
}
