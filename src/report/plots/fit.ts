// Least-squares slope in log-log space: the observed convergence order from (h, error) points and
// the tolerance-proportionality exponent from (rtol, error) points.
import type { Point } from './spec.js';

export interface LogLogFit {
  slope: number;
  /** log10(y) at log10(x) = 0. */
  intercept: number;
  /** Centroid in log10 space; a reference line through it is comparable to the fit. */
  meanLogX: number;
  meanLogY: number;
  n: number;
}

/** Null when fewer than two points have distinct x (no slope is defined). */
export function fitLogLog(points: readonly Point[]): LogLogFit | null {
  const xs: number[] = [];
  const ys: number[] = [];
  for (const p of points) {
    if (p.x > 0 && p.y > 0 && Number.isFinite(p.x) && Number.isFinite(p.y)) {
      xs.push(Math.log10(p.x));
      ys.push(Math.log10(p.y));
    }
  }
  const n = xs.length;
  if (n < 2) return null;
  const mx = xs.reduce((a, b) => a + b, 0) / n;
  const my = ys.reduce((a, b) => a + b, 0) / n;
  let sxx = 0;
  let sxy = 0;
  for (let i = 0; i < n; i++) {
    sxx += (xs[i]! - mx) ** 2;
    sxy += (xs[i]! - mx) * (ys[i]! - my);
  }
  if (!(sxx > 0)) return null;
  const slope = sxy / sxx;
  return { slope, intercept: my - slope * mx, meanLogX: mx, meanLogY: my, n };
}
