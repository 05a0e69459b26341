// One-dimensional tables: linear, log-linear (linear in log y, i.e. exponential between points)
// and monotone cubic interpolation (Fritsch and Carlson, Monotone piecewise cubic interpolation,
// SIAM J. Numer. Anal. 17 (1980) 238-246: Hermite cubics with slopes limited so the interpolant
// keeps the data's monotonicity). Each gives its value and its exact slope, for Jacobians.
// Outside the breakpoints the end piece continues (a line, an exponential, or the end tangent's
// line for the cubic), so a model that runs past its table stays smooth and says so in docs.
// Lookups are a binary search over Float64Arrays; nothing allocates per call.

export type Interpolation = 'linear' | 'log-linear' | 'monotone-cubic';

export interface Table {
  readonly x: Float64Array;
  readonly y: Float64Array;
  readonly kind: Interpolation;
  /** Slopes at the breakpoints (monotone cubic only). */
  readonly m: Float64Array;
  value(x: number): number;
  slope(x: number): number;
}

/** Why the data cannot make a table, or null. */
export function tableProblem(x: readonly number[], y: readonly number[], kind: Interpolation): string | null {
  if (x.length !== y.length) return `x has ${x.length} values and y ${y.length}`;
  if (x.length < 2) return 'a table needs at least two points';
  for (let i = 0; i < x.length; i++) {
    if (!Number.isFinite(x[i]!) || !Number.isFinite(y[i]!)) return `point ${i + 1} is not finite`;
    if (i > 0 && !(x[i]! > x[i - 1]!)) return `x must increase strictly (point ${i + 1}: ${x[i]} after ${x[i - 1]})`;
    if (kind === 'log-linear' && !(y[i]! > 0)) return `log-linear interpolation needs y > 0 (point ${i + 1}: ${y[i]})`;
  }
  return null;
}

/** Index k of the piece [x_k, x_k+1] holding v (the end pieces beyond the ends). */
function piece(x: Float64Array, v: number): number {
  let lo = 0;
  let hi = x.length - 2;
  while (lo < hi) {
    const mid = (lo + hi + 1) >> 1;
    if (x[mid]! <= v) lo = mid;
    else hi = mid - 1;
  }
  return lo;
}

/** Fritsch-Carlson slopes: centred where the secants agree in sign, zero at extrema, then limited. */
export function fritschCarlsonSlopes(x: Float64Array, y: Float64Array): Float64Array {
  const n = x.length;
  const d = new Float64Array(n - 1);
  for (let k = 0; k < n - 1; k++) d[k] = (y[k + 1]! - y[k]!) / (x[k + 1]! - x[k]!);
  const m = new Float64Array(n);
  m[0] = d[0]!;
  m[n - 1] = d[n - 2]!;
  for (let k = 1; k < n - 1; k++) m[k] = d[k - 1]! * d[k]! <= 0 ? 0 : (d[k - 1]! + d[k]!) / 2;
  for (let k = 0; k < n - 1; k++) {
    if (d[k] === 0) {
      m[k] = 0;
      m[k + 1] = 0;
      continue;
    }
    const a = m[k]! / d[k]!;
    const b = m[k + 1]! / d[k]!;
    const s = a * a + b * b;
    if (s > 9) {
      const tau = 3 / Math.sqrt(s);
      m[k] = tau * a * d[k]!;
      m[k + 1] = tau * b * d[k]!;
    }
  }
  return m;
}

export function makeTable(xs: readonly number[], ys: readonly number[], kind: Interpolation): Table {
  const why = tableProblem(xs, ys, kind);
  if (why) throw new Error(why);
  const x = Float64Array.from(xs);
  const y = Float64Array.from(ys);
  const n = x.length;
  const logy = kind === 'log-linear' ? y.map(Math.log) : y;
  const m = kind === 'monotone-cubic' ? fritschCarlsonSlopes(x, y) : new Float64Array(n);
  const value = (v: number): number => {
    const k = piece(x, v);
    const x0 = x[k]!;
    const h = x[k + 1]! - x0;
    if (kind === 'linear') return y[k]! + ((y[k + 1]! - y[k]!) * (v - x0)) / h;
    if (kind === 'log-linear') return Math.exp(logy[k]! + ((logy[k + 1]! - logy[k]!) * (v - x0)) / h);
    if (v < x[0]!) return y[0]! + m[0]! * (v - x[0]!);
    if (v > x[n - 1]!) return y[n - 1]! + m[n - 1]! * (v - x[n - 1]!);
    const s = (v - x0) / h;
    const s2 = s * s;
    const s3 = s2 * s;
    return (2 * s3 - 3 * s2 + 1) * y[k]! + (s3 - 2 * s2 + s) * h * m[k]! + (-2 * s3 + 3 * s2) * y[k + 1]! + (s3 - s2) * h * m[k + 1]!;
  };
  const slope = (v: number): number => {
    const k = piece(x, v);
    const x0 = x[k]!;
    const h = x[k + 1]! - x0;
    if (kind === 'linear') return (y[k + 1]! - y[k]!) / h;
    if (kind === 'log-linear') return (value(v) * (logy[k + 1]! - logy[k]!)) / h;
    if (v < x[0]!) return m[0]!;
    if (v > x[n - 1]!) return m[n - 1]!;
    const s = (v - x0) / h;
    const s2 = s * s;
    return ((6 * s2 - 6 * s) * y[k]! + (3 * s2 - 4 * s + 1) * h * m[k]! + (-6 * s2 + 6 * s) * y[k + 1]! + (3 * s2 - 2 * s) * h * m[k + 1]!) / h;
  };
  return { x, y, kind, m, value, slope };
}
