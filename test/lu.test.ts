// Dense LU (real and complex), finite-difference Jacobian and eigenvalues, checked against mathjs
// (a registry library) and matrices with known spectra.
import { describe, expect, test } from 'vitest';
import * as math from 'mathjs';
import fc from 'fast-check';
import { complexLuFactor, complexLuSolve, luFactor, luSolve } from '../src/core/lu.js';
import { finiteDifferenceJacobian } from '../src/core/jacobian.js';
import { eigenvalues } from '../src/core/eigen.js';
import { stiffnessRatio } from '../src/measure/stiffness.js';
import { robertson } from './implicit-helpers.js';

/** Well-conditioned: random entries in [-1, 1] plus n on the diagonal (diagonally dominant). */
function dominant(n: number, entries: number[]): number[][] {
  const a: number[][] = [];
  for (let i = 0; i < n; i++) {
    a.push([]);
    for (let j = 0; j < n; j++) a[i]!.push(entries[i * n + j]! + (i === j ? n * (entries[i * n + j]! >= 0 ? 1 : -1) : 0));
  }
  return a;
}

describe('real LU', () => {
  test('solution equals mathjs lusolve on random well-conditioned matrices', () => {
    fc.assert(
      fc.property(
        fc.integer({ min: 1, max: 8 }).chain((n) =>
          fc.tuple(
            fc.constant(n),
            fc.array(fc.double({ min: -1, max: 1, noNaN: true }), { minLength: n * n, maxLength: n * n }),
            fc.array(fc.double({ min: -10, max: 10, noNaN: true }), { minLength: n, maxLength: n }),
          ),
        ),
        ([n, entries, b]) => {
          const a = dominant(n, entries);
          const ref = (math.lusolve(a, b) as number[][]).map((r) => r[0]!);
          const lu = Float64Array.from(a.flat());
          const piv = new Int32Array(n);
          expect(luFactor(lu, n, piv)).toBe(true);
          const x = Float64Array.from(b);
          luSolve(lu, n, piv, x);
          for (let i = 0; i < n; i++) expect(Math.abs(x[i]! - ref[i]!)).toBeLessThan(1e-12 * (1 + Math.abs(ref[i]!)));
        },
      ),
      { seed: 20240601, numRuns: 200 },
    );
  });

  test('pivoting handles a zero leading entry; singular matrix is reported', () => {
    // [[0,1],[1,0]] x = [2,3] has x = [3,2] (by hand).
    const a = Float64Array.from([0, 1, 1, 0]);
    const piv = new Int32Array(2);
    expect(luFactor(a, 2, piv)).toBe(true);
    const b = Float64Array.from([2, 3]);
    luSolve(a, 2, piv, b);
    expect(Array.from(b)).toEqual([3, 2]);
    expect(luFactor(Float64Array.from([1, 2, 2, 4]), 2, new Int32Array(2))).toBe(false);
  });
});

describe('complex LU', () => {
  test('solution equals mathjs complex lusolve', () => {
    let seed = 12345;
    const rnd = () => ((seed = (seed * 16807) % 2147483647) / 2147483647) * 2 - 1;
    for (const n of [1, 2, 3, 5, 8]) {
      const ar: number[] = [], ai: number[] = [];
      for (let i = 0; i < n * n; i++) {
        ar.push(rnd() + (i % (n + 1) === 0 ? n : 0));
        ai.push(rnd());
      }
      const br: number[] = [], bi: number[] = [];
      for (let i = 0; i < n; i++) { br.push(rnd()); bi.push(rnd()); }
      const A = [];
      for (let i = 0; i < n; i++) {
        const row = [];
        for (let j = 0; j < n; j++) row.push(math.complex(ar[i * n + j]!, ai[i * n + j]!));
        A.push(row);
      }
      const B = br.map((v, i) => math.complex(v, bi[i]!));
      const ref = (math.lusolve(A as never, B as never) as unknown as math.Complex[][]).map((r) => math.complex(r[0] as never));
      const xr = Float64Array.from(ar), xi = Float64Array.from(ai);
      const piv = new Int32Array(n);
      expect(complexLuFactor(xr, xi, n, piv)).toBe(true);
      const sr = Float64Array.from(br), si = Float64Array.from(bi);
      complexLuSolve(xr, xi, n, piv, sr, si);
      for (let i = 0; i < n; i++) {
        expect(Math.abs(sr[i]! - ref[i]!.re)).toBeLessThan(1e-12);
        expect(Math.abs(si[i]! - ref[i]!.im)).toBeLessThan(1e-12);
      }
    }
  });
});

describe('finite-difference Jacobian', () => {
  test('matches the analytic Robertson Jacobian to ~sqrt(eps) relative', () => {
    const p = robertson(1);
    const y = Float64Array.from([0.9, 3e-5, 0.1]);
    const fy = new Float64Array(3);
    p.f(0, y, fy);
    const fd = new Float64Array(9);
    expect(finiteDifferenceJacobian(p.f, 0, y, fy, fd, 3, { yWork: new Float64Array(3), fWork: new Float64Array(3) })).toBe(3);
    const exact = new Float64Array(9);
    p.jacobian!(0, y, exact);
    const scale = Math.max(...Array.from(exact, Math.abs));
    // Forward differences: error O(sqrt(eps)) relative to the largest entry (common practice, no source).
    for (let k = 0; k < 9; k++) expect(Math.abs(fd[k]! - exact[k]!)).toBeLessThan(1e-6 * scale);
    expect(Array.from(y)).toEqual([0.9, 3e-5, 0.1]);
  });
});

describe('eigenvalues', () => {
  const sortC = (re: ArrayLike<number>, im: ArrayLike<number>) =>
    Array.from(re, (r, i) => [r, im[i]!] as [number, number]).sort((a, b) => a[0] - b[0] || a[1] - b[1]);

  test('rotation generator has +-i; companion of (x-1)(x-2)(x-3) has 1, 2, 3', () => {
    const r = eigenvalues([0, -1, 1, 0], 2);
    const s = sortC(r.re, r.im);
    expect(s[0]![0]).toBeCloseTo(0, 14);
    expect(s[0]![1]).toBeCloseTo(-1, 14);
    expect(s[1]![1]).toBeCloseTo(1, 14);
    // x^3 - 6x^2 + 11x - 6 companion matrix (by hand).
    const c = eigenvalues([6, -11, 6, 1, 0, 0, 0, 1, 0], 3);
    const sc = sortC(c.re, c.im).map((v) => v[0]);
    expect(sc[0]).toBeCloseTo(1, 10);
    expect(sc[1]).toBeCloseTo(2, 10);
    expect(sc[2]).toBeCloseTo(3, 10);
  });

  test('random nonsymmetric matrices: power sums and determinant via mathjs, and mathjs eigs where it converges', () => {
    let seed = 777;
    const rnd = () => ((seed = (seed * 16807) % 2147483647) / 2147483647) * 2 - 1;
    for (const n of [2, 3, 4, 6, 9]) {
      for (let rep = 0; rep < 5; rep++) {
        const a: number[] = [];
        for (let i = 0; i < n * n; i++) a.push(rnd());
        const rows = [];
        for (let i = 0; i < n; i++) rows.push(a.slice(i * n, i * n + n));
        const mine = eigenvalues(a, n);
        // Power sums sum(lambda^p) = trace(A^p) and prod(lambda) = det(A), with mathjs doing the
        // matrix side; they pin down the spectrum whether or not mathjs eigs converges.
        let pr = 1, pi = 0;
        let powR = Array.from(mine.re), powI = Array.from(mine.im);
        let Ap = rows as number[][];
        for (let pw = 1; pw <= n; pw++) {
          const tr = math.trace(Ap) as number;
          const sumR = powR.reduce((x, v) => x + v, 0);
          const sumI = powI.reduce((x, v) => x + v, 0);
          expect(Math.abs(sumR - tr)).toBeLessThan(1e-9 * Math.max(1, Math.abs(tr)) * n ** pw);
          expect(Math.abs(sumI)).toBeLessThan(1e-9 * n ** pw);
          const nr = powR.map((v, k) => v * mine.re[k]! - powI[k]! * mine.im[k]!);
          const ni = powR.map((v, k) => v * mine.im[k]! + powI[k]! * mine.re[k]!);
          powR = nr; powI = ni;
          Ap = math.multiply(Ap, rows) as number[][];
        }
        for (let k = 0; k < n; k++) {
          const r2 = pr * mine.re[k]! - pi * mine.im[k]!;
          pi = pr * mine.im[k]! + pi * mine.re[k]!;
          pr = r2;
        }
        const det = math.det(rows);
        expect(Math.abs(pr - det)).toBeLessThan(1e-10 * Math.max(1, Math.abs(det)));
        let ref: number[][] | undefined;
        try {
          ref = (math.eigs(rows).values as unknown as (number | math.Complex)[]).map((v) =>
            typeof v === 'number' ? [v, 0] : [v.re, v.im],
          );
        } catch {
          // mathjs eigs does not converge on every nonsymmetric matrix; the power sums above still apply.
          ref = undefined;
        }
        if (!ref) continue;
        const used = new Array(n).fill(false);
        for (const [rr, ri] of ref) {
          let best = -1, bd = Infinity;
          for (let k = 0; k < n; k++) {
            if (used[k]) continue;
            const d = Math.hypot(mine.re[k]! - rr!, mine.im[k]! - ri!);
            if (d < bd) { bd = d; best = k; }
          }
          used[best] = true;
          expect(bd).toBeLessThan(1e-8);
        }
      }
    }
  });

  test('stiffness ratio of diag(-1, -1000) is 1000; zero eigenvalues are left out', () => {
    const p = { ...robertson(1), dimension: 2, y0: [1, 1], f: (_t: number, y: Float64Array, dy: Float64Array) => { dy[0] = -y[0]!; dy[1] = -1000 * y[1]!; }, jacobian: undefined };
    const r = stiffnessRatio(p, [0], [[1, 1]]);
    expect(r.ratios[0]).toBeCloseTo(1000, 4);
    // Robertson at y0: J = [[-0.04,0,0],[0.04,0,0],[0,0,0]] has eigenvalues -0.04, 0, 0 -> ratio 1.
    const rob = stiffnessRatio(robertson(1), [0, 40], [[1, 0, 0], [0.7158270687, 0.9185534764e-5, 0.2841637457]]);
    expect(rob.ratios[0]).toBeCloseTo(1, 12);
    expect(rob.max).toBeGreaterThan(1e4);
  });
});
