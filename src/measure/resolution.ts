// How finely a reference value is known, per component and in the state's own units: the smallest
// error it can confirm at that point. Exact formulas: round-off (or the floor their computation
// declares); published values: half a unit in the last digit given (or in the last trusted digit
// when fewer are declared); certified values: the certifying runs' measured agreement.
import type { Problem, Reference } from '../core/types.js';
import { scaleFloors } from './error-norm.js';

/** Round-off of an exact formula evaluated in doubles, relative to the state's largest component. */
export const EXACT_ROUNDOFF = 8 * Number.EPSILON;
/**
 * An error within this factor of the resolution at its point is "at resolution": it is shown as
 * such, kept out of fits and never meets a target (one digit of margin; common practice, no source).
 */
export const NEAR_RESOLUTION = 10;

/** Exponent of the last significant digit of v as JavaScript prints it (shortest round trip). */
export function lastDigitExponent(v: number): number {
  if (v === 0 || !Number.isFinite(v)) return -Infinity;
  const [mantissa, exp] = Math.abs(v).toExponential().split('e') as [string, string];
  const decimals = mantissa.includes('.') ? mantissa.split('.')[1]!.length : 0;
  return Number(exp) - decimals;
}

/**
 * Half a unit in the last digit of a tabulated value: the digits it is written with, or `digits`
 * significant digits when the source trusts fewer. A value of 0 is taken as known to its digits
 * relative to the state's largest component (`scale`).
 */
export function tabulatedHalfUnit(v: number, digits: number | undefined, scale: number): number {
  const size = Math.abs(v) > 0 ? Math.abs(v) : scale;
  const printed = Math.abs(v) > 0 ? lastDigitExponent(v) : -Infinity;
  const trusted = digits === undefined || size === 0 ? -Infinity : Math.floor(Math.log10(size)) - digits + 1;
  const e = Math.max(printed, trusted);
  return e === -Infinity ? EXACT_ROUNDOFF * size : 0.5 * 10 ** e;
}

/** Largest |v_i|. */
export function largest(v: ArrayLike<number>, n: number): number {
  let big = 0;
  for (let i = 0; i < n; i++) {
    const a = Math.abs(v[i]!);
    if (a > big) big = a;
  }
  return big;
}

/** Per-component resolution of an exact (formula or computed) reference state. */
export function exactResolution(reference: Reference, ref: ArrayLike<number>, out: Float64Array, n: number): void {
  const r = (reference.floor ?? EXACT_ROUNDOFF) * largest(ref, n);
  for (let i = 0; i < n; i++) out[i] = r;
}

/**
 * Per-component resolution of a tabulated reference state (published, certified or a table).
 * Certified values are as good as the certifying runs' agreement, measured the way certify.ts
 * measures it: relative per component (with the problem's floor) on relative error scales,
 * relative to the state's largest component otherwise; never better than round-off of each value.
 */
export function tabulatedResolution(problem: Problem, y: readonly number[]): number[] {
  const reference = problem.reference;
  const scale = largest(y, y.length);
  if (reference.kind === 'certified') {
    const out = new Float64Array(y.length);
    certifiedResolution(reference, scaleFloors(problem.errorScale, y.length), y, out, y.length);
    return Array.from(out);
  }
  return y.map((v) => Math.max(tabulatedHalfUnit(v, reference.digits, scale), EXACT_ROUNDOFF * Math.abs(v)));
}

/** The certified rule of tabulatedResolution, into out without allocating (floors: the problem's, or null). */
export function certifiedResolution(reference: Reference, floors: Float64Array | null, y: ArrayLike<number>, out: Float64Array, n: number): void {
  const rel = reference.digits === undefined ? 0 : 10 ** -reference.digits;
  const scale = largest(y, n);
  for (let i = 0; i < n; i++) {
    const v = Math.abs(y[i]!);
    out[i] = Math.max(rel * (floors ? Math.max(v, floors[i]!) : scale), EXACT_ROUNDOFF * v);
  }
}
