// Observed convergence order (read from results, so reports can state it) of a fixed-step method, only from its asymptotic range: successive
// local orders log(e_k+1 / e_k) / log(h_k+1 / h_k) that agree, on errors below saturation (callers
// pass only errors the reference resolves). Anything else is "not in the asymptotic range".

/** Errors at or above this are saturated (the solution is lost, not converging). Common practice, no source. */
export const SATURATION = 0.1;
/** Successive local orders agree when they differ by at most this. Common practice, no source. */
export const ORDER_AGREEMENT = 0.1;

export type ObservedOrder = { order: number; points: number } | { order: null; reason: string };

export const NOT_ASYMPTOTIC = 'not in the asymptotic range';

/** points: (h, error) pairs of one method on one problem, errors already resolved by the reference. */
export function observedOrder(points: readonly { h: number; error: number }[]): ObservedOrder {
  const usable = points
    .filter((p) => p.h > 0 && Number.isFinite(p.error) && p.error > 0 && p.error < SATURATION)
    .sort((a, b) => a.h - b.h);
  if (usable.length < 3) return { order: null, reason: `${NOT_ASYMPTOTIC} (fewer than 3 resolved, unsaturated points)` };
  const local: number[] = [];
  for (let k = 0; k + 1 < usable.length; k++) {
    const a = usable[k]!;
    const b = usable[k + 1]!;
    local.push(Math.log(b.error / a.error) / Math.log(b.h / a.h));
  }
  // From the finest steps outward: the longest run of agreeing successive local orders.
  let end = 1;
  while (end < local.length && Math.abs(local[end]! - local[end - 1]!) <= ORDER_AGREEMENT) end++;
  if (end < 2 || Math.abs(local[1]! - local[0]!) > ORDER_AGREEMENT) {
    return { order: null, reason: `${NOT_ASYMPTOTIC} (finest local orders ${local.slice(0, 2).map((p) => p.toFixed(2)).join(', ')} disagree)` };
  }
  // Least squares over the points of that run (end local orders = end + 1 points).
  const xs = usable.slice(0, end + 1).map((p) => Math.log10(p.h));
  const ys = usable.slice(0, end + 1).map((p) => Math.log10(p.error));
  const mx = xs.reduce((s, v) => s + v, 0) / xs.length;
  const my = ys.reduce((s, v) => s + v, 0) / ys.length;
  let sxx = 0;
  let sxy = 0;
  for (let i = 0; i < xs.length; i++) {
    sxx += (xs[i]! - mx) ** 2;
    sxy += (xs[i]! - mx) * (ys[i]! - my);
  }
  return { order: sxy / sxx, points: xs.length };
}
