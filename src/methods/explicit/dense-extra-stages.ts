// Interpolants that need stages of their own (J. H. Verner, "Numerically optimal Runge-Kutta pairs
// with interpolants", Numer. Algorithms 53 (2010) 383-396): after an accepted step, m extra
// stages at nodes c (rows a over every earlier stage), then y(t + theta h) = y + h sum_i
// b_i(theta) k_i with polynomial weights b_i. The extra stages are evaluated once per step, at
// the first value asked for inside it, and counted; a solve that asks for none makes none, so
// plain steps and their counts are the pair's alone.
//
// Sums run over increments k_i - k_1 with k_1 weighted by sum_j a_j = c (stages) or
// sum_i b_i(theta) = theta (values), as the increment form of the step does (tableau.ts): the
// weights reach 1e6 with cancelling signs, and multiplying O(h) differences keeps their rounding
// at O(h) instead of O(1).
import type { Problem } from '../../core/types.js';
import type { StepInterpolation } from './dense-dp54.js';
import type { ExtraStageInterpolant, Tableau } from './tableau.js';

/** Within this many ulps of theta = 1 the value is the step's own end state. */
const END_ULPS = 4;

/** The compiled form: nonzero couplings and weights, k_1's own coefficient left out. */
interface Compiled {
  readonly m: number;
  readonly c: Float64Array;
  /** Per extra stage j: columns (stage index >= 1) and values of its nonzero a_ji. */
  readonly aCol: readonly Int32Array[];
  readonly aVal: readonly Float64Array[];
  /** Stages (index >= 1) whose weight polynomial is not zero, and its coefficients (theta^1 first). */
  readonly wCol: Int32Array;
  readonly wPoly: readonly Float64Array[];
}

function compile(stages: number, d: ExtraStageInterpolant): Compiled {
  const m = d.c.length;
  if (d.a.length !== m) throw new Error(`extra-stage interpolant: ${m} nodes but ${d.a.length} rows`);
  const aCol: Int32Array[] = [];
  const aVal: Float64Array[] = [];
  d.a.forEach((row, j) => {
    if (row.length > stages + j) throw new Error(`extra-stage interpolant: row ${j} reaches stage ${row.length} (at most ${stages + j})`);
    const cols: number[] = [];
    const vals: number[] = [];
    row.forEach((v, i) => {
      if (i > 0 && v !== 0) {
        cols.push(i);
        vals.push(v);
      }
    });
    aCol.push(Int32Array.from(cols));
    aVal.push(Float64Array.from(vals));
  });
  if (d.weights.length > stages + m) throw new Error(`extra-stage interpolant: ${d.weights.length} weights for ${stages + m} stages`);
  const wCol: number[] = [];
  const wPoly: Float64Array[] = [];
  d.weights.forEach((poly, i) => {
    if (i > 0 && poly.some((v) => v !== 0)) {
      wCol.push(i);
      wPoly.push(Float64Array.from(poly));
    }
  });
  return { m, c: Float64Array.from(d.c), aCol, aVal, wCol: Int32Array.from(wCol), wPoly };
}

/** The interpolation of one solve of `problem` by a pair compiled as `tab`. */
export function extraStageInterpolation(tab: Tableau, d: ExtraStageInterpolant): (problem: Problem) => StepInterpolation {
  const s = tab.stages;
  const x = compile(s, d);
  const increments = tab.increments;
  return (problem) => {
    const n = problem.dimension;
    const f = problem.f;
    // Increments of the step's stages (rows 1..s-1) and of the extra ones (rows s..s+m-1).
    const delta = new Float64Array((s + x.m) * n);
    const rows: Float64Array[] = [];
    for (let i = 0; i < s + x.m; i++) rows.push(delta.subarray(i * n, (i + 1) * n));
    const yStage = new Float64Array(n);
    const w = new Float64Array(x.wCol.length);
    let tOld = NaN;
    let tNew = NaN;
    let ready = false;
    let evaluations = 0;

    const stagesFor = (h: number, y0: Float64Array, k: Float64Array) => {
      for (let i = 1; i < s; i++) {
        const off = i * n;
        if (increments) for (let j = 0; j < n; j++) delta[off + j] = k[off + j]!;
        else for (let j = 0; j < n; j++) delta[off + j] = k[off + j]! - k[j]!;
      }
      for (let e = 0; e < x.m; e++) {
        const cols = x.aCol[e]!;
        const vals = x.aVal[e]!;
        const ce = x.c[e]!;
        for (let j = 0; j < n; j++) {
          let sum = ce * k[j]!;
          for (let p = 0; p < cols.length; p++) sum += vals[p]! * delta[cols[p]! * n + j]!;
          yStage[j] = y0[j]! + h * sum;
        }
        const row = rows[s + e]!;
        // c = 1 is the end of the step: evaluate exactly at tNew, as the step's own stages do.
        f(ce === 1 ? tNew : tOld + ce * h, yStage, row);
        for (let j = 0; j < n; j++) row[j] = row[j]! - k[j]!;
      }
      evaluations += x.m;
      ready = true;
    };

    return {
      begin(t0, t1) {
        tOld = t0;
        tNew = t1;
        ready = false;
      },
      evaluations: () => evaluations,
      formula(out, theta, h, y0, y1, k, nn) {
        if (theta === 0) {
          for (let j = 0; j < nn; j++) out[j] = y0[j]!;
          return;
        }
        if (Math.abs(theta - 1) <= END_ULPS * Number.EPSILON) {
          for (let j = 0; j < nn; j++) out[j] = y1[j]!;
          return;
        }
        if (!ready) stagesFor(h, y0, k);
        for (let p = 0; p < w.length; p++) {
          const poly = x.wPoly[p]!;
          let v = 0;
          for (let q = poly.length - 1; q >= 0; q--) v = v * theta + poly[q]!;
          w[p] = v * theta;
        }
        for (let j = 0; j < nn; j++) {
          let sum = theta * k[j]!;
          for (let p = 0; p < w.length; p++) sum += w[p]! * delta[x.wCol[p]! * n + j]!;
          out[j] = y0[j]! + h * sum;
        }
      },
    };
  };
}
