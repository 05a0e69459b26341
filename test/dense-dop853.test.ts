// dormand-prince-853's continuous extension (E. Hairer and G. Wanner's dense output of DOP853,
// HNW I, 2nd ed. (1993), sec. II.6), held as polynomial weights over 16 stages, against outside
// checks: the published form it was expanded from (the dop853 code's dense-output preparation and
// CONTD8, version of March 2002), SciPy's DOP853 dense output over the same step (live, where
// python3 with SciPy is installed). Its continuous order conditions to order 7, local order and
// error.dense slope are checked with Verner's interpolants (test/methods-explicit-order-conditions
// .test.ts, test/dense-extra-stages.test.ts), its events in test/dense-accuracy.test.ts.
import { spawnSync } from 'node:child_process';
import { describe, expect, it } from 'vitest';
import { findMethod } from '../src/methods/registry.js';
import type { DenseMethod } from '../src/methods/explicit/index.js';
import { DOP853_B, DOP853_DENSE, DOP853_DENSE_D } from '../src/methods/explicit/tableaus/dormand-prince-853.js';
import { makeProblem } from './methods-explicit-helpers.js';

const dop853 = findMethod('dormand-prince-853') as unknown as DenseMethod;
const THETAS = [0.1, 0.37, 0.5, 0.81, 0.96];

/**
 * b_i(theta) read off the published form with h = 1 and k = the unit vector of stage i:
 * y0 + theta (dy + (1-theta)(bspl + theta (r3 + (1-theta)(r4 + theta (r5 + (1-theta)(r6 + theta r7))))))
 * with dy = sum_j b_j k_j, bspl = k_1 - dy, r3 = dy - k_13 - bspl, r_m = sum_j d_mj k_j (y0 = 0).
 */
function publishedWeight(i: number, theta: number): number {
  const t1 = 1 - theta;
  const dy = DOP853_B[i] ?? 0;
  const bspl = (i === 0 ? 1 : 0) - dy;
  const r3 = dy - (i === 12 ? 1 : 0) - bspl;
  const [r4, r5, r6, r7] = DOP853_DENSE_D.map((row) => row[i]!) as [number, number, number, number];
  return theta * (dy + t1 * (bspl + theta * (r3 + t1 * (r4 + theta * (r5 + t1 * (r6 + theta * r7))))));
}

const polynomial = (coeffs: readonly number[], theta: number): number => coeffs.reduce((acc, w, k) => acc + w * theta ** (k + 1), 0);

describe('dormand-prince-853 continuous extension', () => {
  it('its weight polynomials are the published form expanded (every stage, theta in (0, 1))', () => {
    // The two agree to the rounding of the polynomials' terms (coefficients up to 545 with
    // cancelling signs): each difference is held to 8 eps times the sum of |w_ik| theta^k, which
    // it stays far inside (measured at most 0.05 of that bound, 7.9e-14 absolute); a wrong digit
    // among the first 12 of a weight or a d exceeds it.
    expect(DOP853_DENSE.weights.length).toBe(16);
    let worst = 0;
    for (const theta of THETAS) {
      for (let i = 0; i < 16; i++) {
        const w = DOP853_DENSE.weights[i]!;
        const bound = 8 * Number.EPSILON * w.reduce((acc, v, k) => acc + Math.abs(v) * theta ** (k + 1), 0) + 1e-16;
        worst = Math.max(worst, Math.abs(polynomial(w, theta) - publishedWeight(i, theta)) / bound);
      }
    }
    expect(worst).toBeLessThan(1);
  });

  it('the published d rows weigh nothing in sum (so sum_i b_i(theta) = theta), and stages 2..5 never enter', () => {
    // HNW I sec. II.6: a continuous extension of order >= 1 has sum_i b_i(theta) = theta.
    for (const row of DOP853_DENSE_D) {
      expect(Math.abs(row.reduce((a, v) => a + v, 0))).toBeLessThan(1e-12);
      expect(row.slice(1, 5)).toEqual([0, 0, 0, 0]);
    }
    for (const theta of THETAS) {
      const sum = DOP853_DENSE.weights.reduce((a, w) => a + polynomial(w, theta), 0);
      expect(Math.abs(sum - theta)).toBeLessThan(1e-12);
    }
  });
});

/** The pendulum q' = p, p' = -sin q: nonlinear, so every stage of the interpolant matters. */
const pendulum = makeProblem({ id: 'pendulum', y0: [1, 0.5], tEnd: 0.5, f: (_t, y, dy) => void ((dy[0] = y[1]!), (dy[1] = -Math.sin(y[0]!))) });

/** SciPy's DOP853 over one step [0, 0.5] of the pendulum, its end state and its dense output at THETAS; null without SciPy. */
function scipyStep(): { y1: number[]; values: number[][] } | null {
  const code = [
    'import json, math',
    'from scipy.integrate import DOP853',
    'f = lambda t, y: [y[1], -math.sin(y[0])]',
    's = DOP853(f, 0.0, [1.0, 0.5], 0.5, first_step=0.5, rtol=1.0, atol=1.0)',
    's.step()',
    'assert s.t == 0.5, s.t',
    'd = s.dense_output()',
    `print(json.dumps({"y1": list(s.y), "values": [list(d(0.5 * th)) for th in ${JSON.stringify(THETAS)}]}))`,
  ].join('\n');
  const p = spawnSync('python3', ['-c', code], { encoding: 'utf8' });
  if (p.status !== 0) return null;
  return JSON.parse(p.stdout) as { y1: number[]; values: number[][] };
}

const scipy = scipyStep();
if (!scipy) console.warn('dense-dop853.test: python3 with SciPy not found; the comparison with SciPy DOP853 is skipped (apt-get install python3-scipy)');

describe.skipIf(!scipy)('against SciPy DOP853 over the same step (python3 with SciPy)', () => {
  it('one step of 0.5 on the pendulum: the same end state and the same interpolated values', () => {
    // scipy.integrate.DOP853 builds its dense output from the same published stages and d
    // coefficients; the two differ only by rounding (measured with SciPy 1.17.1: end states
    // 4.4e-16 apart, interpolated values 6.7e-15, SciPy summing its own polynomial form).
    const values: number[][] = [];
    const end = new Float64Array(2);
    const out = new Float64Array(2);
    const r = dop853.dense.solve(pendulum, { rtol: 1, atol: 1 }, { maxSteps: 10, initialStep: 0.5 }, (tOld, tNew, evaluate) => {
      expect([tOld, tNew]).toEqual([0, 0.5]);
      evaluate(tNew, end);
      for (const theta of THETAS) {
        evaluate(0.5 * theta, out);
        values.push(Array.from(out));
      }
    });
    expect(r.counts.accepted).toBe(1);
    expect(r.denseEvaluations).toBe(4);
    end.forEach((v, j) => expect(Math.abs(v - scipy!.y1[j]!)).toBeLessThan(1e-14));
    values.forEach((row, k) => row.forEach((v, j) => expect(Math.abs(v - scipy!.values[k]![j]!), `theta ${THETAS[k]}`).toBeLessThan(5e-14)));
  });
});
