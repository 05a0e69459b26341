import type { AxisSpec } from './spec.js';
// Log axes whose ticks sit on powers of ten only, labelled "10⁻⁸" style, so every plot reads
// the same way and no axis ever shows "0.000001"-like decimals.

const SUPERSCRIPT: Record<string, string> = {
  '0': '⁰', '1': '¹', '2': '²', '3': '³', '4': '⁴',
  '5': '⁵', '6': '⁶', '7': '⁷', '8': '⁸', '9': '⁹', '-': '⁻',
};

/** Integer exponent in unicode superscript digits, e.g. -8 -> "⁻⁸". */
export function superscript(exponent: number): string {
  if (!Number.isInteger(exponent)) throw new RangeError(`superscript needs an integer, got ${exponent}`);
  return String(exponent)
    .split('')
    .map((c) => SUPERSCRIPT[c] ?? c)
    .join('');
}

/** 10^k parsed from its decimal text, so 1e-8 is the double nearest 10⁻⁸ and not 10**-8 rounded twice. */
export function decade(k: number): number {
  return Number(`1e${k}`);
}

/** "10ᵏ" for a value that is a power of ten (within rounding), otherwise null. */
export function decadeLabel(value: number): string | null {
  if (!(value > 0) || !Number.isFinite(value)) return null;
  const k = Math.round(Math.log10(value));
  if (Math.abs(value / decade(k) - 1) > 1e-9) return null;
  return `10${superscript(k)}`;
}

export interface DecadeRange {
  /** Exponent of the lowest decade at or below the smallest value. */
  lo: number;
  /** Exponent of the highest decade at or above the largest value (always > lo). */
  hi: number;
}

/** Smallest whole-decade span covering the positive finite values, or null if there are none. */
export function decadeRange(values: readonly number[]): DecadeRange | null {
  let min = Infinity;
  let max = -Infinity;
  for (const v of values) {
    if (v > 0 && Number.isFinite(v)) {
      if (v < min) min = v;
      if (v > max) max = v;
    }
  }
  if (min === Infinity) return null;
  // Nudge by a hair so a value that is itself a decade does not open an empty decade beside it.
  const lo = Math.floor(Math.log10(min) + 1e-12);
  let hi = Math.ceil(Math.log10(max) - 1e-12);
  if (hi <= lo) hi = lo + 1;
  return { lo, hi };
}

/** Tick values on the span; every decade while they fit, every 2nd, 3rd, ... decade beyond that. */
export function decadeTicks(range: DecadeRange, maxTicks = 16): number[] {
  const n = range.hi - range.lo;
  const stride = Math.max(1, Math.ceil(n / (maxTicks - 1)));
  const ticks: number[] = [];
  for (let k = range.lo; k <= range.hi; k += stride) ticks.push(decade(k));
  return ticks;
}

/** A positive time span covering this many decades or more gets a logarithmic time axis. */
const LOG_TIME_DECADES = 3;

/** Unit text for an axis title: " [m]", or "" when none is declared. */
export function unitSuffix(unit: string | undefined | null): string {
  return unit ? ` [${unit}]` : '';
}

/** Time axis of a trace plot: logarithmic when the sampled times span several decades (t0 >= 0). */
export function timeAxis(ctx: { results: { problems: { id: string; units?: unknown; timeDecades?: unknown }[] } }, problem: string, tMin: number, tMax: number, tPositive: number): AxisSpec {
  const record = ctx.results.problems.find((p) => p.id === problem);
  const units = record?.units as { time?: string } | undefined;
  const title = `t${unitSuffix(units?.time)}`;
  // The problem's own span decides (its check times from the first positive one to the end), or
  // the samples when it says nothing; t0 = 0 itself cannot be drawn on a log axis.
  const decades = typeof record?.timeDecades === 'number' ? record.timeDecades : Number.isFinite(tPositive) && tPositive > 0 ? Math.log10(tMax / tPositive) : 0;
  if (tMin >= 0 && Number.isFinite(tPositive) && decades >= LOG_TIME_DECADES) return { title: `${title}, log scale`, kind: 'log' };
  return { title, kind: 'linear', min: tMin, max: tMax };
}
