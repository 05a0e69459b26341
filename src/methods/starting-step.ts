// The starting step every adaptive engine uses when the caller gives none: the algorithm of
// Hairer, Norsett and Wanner, one explicit Euler probe scaled by the method's order.
import { scaledRmsNorm } from '../core/vector.js';
import type { Rhs } from '../core/types.js';

const EPS = 2.220446049250313e-16;

/**
 * How the probe's norms are taken. The explicit pairs divide by the scale and form the difference
 * quotient (f1 - f0) / h0 before its norm ('divide'); the implicit engines multiply by 1 / scale
 * (1 / eps where the scale is 0) and divide the norm of f1 - f0 by h0 ('reciprocal'). Same formula,
 * different last bits; each family keeps the form its counts were measured with.
 */
export type ProbeArithmetic = 'divide' | 'reciprocal';

/** RMS of v scaled by atol_i + rtol |y0_i|, in the reciprocal form. */
function reciprocalNorm(v: Float64Array, y0: Float64Array, rtol: number, atol: Float64Array, n: number): number {
  let s = 0;
  for (let i = 0; i < n; i++) {
    const sc = atol[i]! + rtol * Math.abs(y0[i]!);
    const w = sc > 0 ? 1 / sc : 1 / EPS;
    s += (v[i]! * w) ** 2;
  }
  return Math.sqrt(s / n);
}

/** What the starting step needs: the problem at t0 and the tolerances, and two scratch buffers. */
export interface StartingStepInput {
  f: Rhs;
  t0: number;
  y0: Float64Array;
  /** f(t0, y0), already evaluated. */
  f0: Float64Array;
  /** The method's order (p in the book). */
  order: number;
  rtol: number;
  atol: Float64Array;
  /** tEnd - t0: no step is longer. */
  span: number;
  n: number;
  arithmetic: ProbeArithmetic;
  /** Scratch buffers of length n. */
  y1: Float64Array;
  f1: Float64Array;
}

/**
 * Starting step of Hairer, Norsett and Wanner, Solving ODEs I, sec. II.4 ("Starting step size"):
 * one extra f evaluation at t0 + h0 (the caller counts it).
 */
export function startingStep(input: StartingStepInput): number {
  const { f, t0, y0, f0, order, rtol, atol, span, n, arithmetic, y1, f1 } = input;
  const norm = (v: Float64Array): number => (arithmetic === 'divide' ? scaledRmsNorm(v, y0, y0, rtol, atol, n) : reciprocalNorm(v, y0, rtol, atol, n));
  const d0 = norm(y0);
  const d1 = norm(f0);
  let h0 = d0 < 1e-5 || d1 < 1e-5 ? 1e-6 : 0.01 * (d0 / d1);
  if (h0 > span) h0 = span;
  for (let i = 0; i < n; i++) y1[i] = y0[i]! + h0 * f0[i]!;
  f(t0 + h0, y1, f1);
  let d2: number;
  if (arithmetic === 'divide') {
    for (let i = 0; i < n; i++) f1[i] = (f1[i]! - f0[i]!) / h0;
    d2 = norm(f1);
  } else {
    for (let i = 0; i < n; i++) f1[i] = f1[i]! - f0[i]!;
    d2 = norm(f1) / h0;
  }
  // A probe that overflows says nothing about the scale: a small step, which the controller grows.
  if (!Number.isFinite(d2)) return Math.max(1e-6 * Math.min(1, span), 1e-12 * span);
  const m = d1 > d2 ? d1 : d2;
  const h1 = m <= 1e-15 ? Math.max(1e-6, h0 * 1e-3) : Math.pow(0.01 / m, 1 / (order + 1));
  let h = Math.min(100 * h0, h1);
  if (!(h > 0) || !Number.isFinite(h)) h = h0;
  return h > span ? span : h;
}
