// Reproducible draws for dispersion samples. Every value is a pure function of (seed, sample,
// quantity), not of a stream's position, so any shard on any machine computes sample k alone and
// gets the same bits: integer mixing in 32-bit arithmetic (exact in every JavaScript engine), then
// Box-Muller for normal values.
import type { DistributionSpec } from './spec.js';

/**
 * Mixes one 32-bit word into a state: the finaliser of MurmurHash3 (A. Appleby, public domain),
 * applied after an add of the golden-ratio constant so that zero inputs still mix.
 */
function mix32(h: number, word: number): number {
  h = (h + Math.imul(word ^ 0x9e3779b9, 0x85ebca6b)) | 0;
  h ^= h >>> 16;
  h = Math.imul(h, 0x85ebca6b);
  h ^= h >>> 13;
  h = Math.imul(h, 0xc2b2ae35);
  h ^= h >>> 16;
  return h >>> 0;
}

/** A uniform draw in (0, 1) with 53 random bits, for (seed, sample, quantity, draw). */
export function uniformDraw(seed: number, sample: number, quantity: number, draw: number): number {
  let h = mix32(seed >>> 0, sample >>> 0);
  h = mix32(h, quantity >>> 0);
  const hi = mix32(h, 2 * draw) >>> 5; // 27 bits
  const lo = mix32(h, 2 * draw + 1) >>> 6; // 26 bits
  // (k + 0.5) / 2^53 never returns 0 or 1, so log(u) below is finite.
  return (hi * 67108864 + lo + 0.5) / 9007199254740992;
}

/** A standard normal draw by the Box-Muller transform (Box and Muller, Ann. Math. Stat. 29, 1958). */
export function normalDraw(seed: number, sample: number, quantity: number): number {
  const u1 = uniformDraw(seed, sample, quantity, 0);
  const u2 = uniformDraw(seed, sample, quantity, 1);
  return Math.sqrt(-2 * Math.log(u1)) * Math.cos(2 * Math.PI * u2);
}

/** The value of one dispersed quantity in one sample; `nominal` is the undispersed value. */
export function drawValue(dist: DistributionSpec, nominal: number, seed: number, sample: number, quantity: number): number {
  if ('normal' in dist) {
    const n = dist.normal;
    const mean = typeof n === 'number' ? nominal : (n.mean ?? nominal);
    const sd = typeof n === 'number' ? n : n.sd;
    return sd === 0 ? mean : mean + sd * normalDraw(seed, sample, quantity);
  }
  const [lo, hi] = dist.uniform;
  return lo + (hi - lo) * uniformDraw(seed, sample, quantity, 0);
}
