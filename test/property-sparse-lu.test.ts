// Property: the sparse LU of src/core/sparse-lu.ts (minimum-degree order, Gilbert-Peierls
// left-looking factorization with threshold partial pivoting) solves the same systems as mathjs
// `lusolve` (an independent implementation) on random sparse matrices of random size and
// density, and as the dense complex LU of src/core/lu.ts (itself checked against the band LU and
// mathjs) in the complex form Radau IIA uses. The diagonal shift is drawn from [-3, 3], so many
// draws move pivots off the diagonal (counted, so the property cannot pass without exercising
// them); nearly singular draws (condition number above 1e6) are left out. Tolerances: forward
// error at most condition number x backward error (Higham, Accuracy and Stability of Numerical
// Algorithms, 2nd ed., 2002, sec. 7.1), backward error taken as 1e-13 (n eps times a modest
// growth factor, common practice, no source).
import fc from 'fast-check';
import * as math from 'mathjs';
import { describe, expect, it } from 'vitest';
import { complexLuFactor, complexLuSolve, luFactor, luSolve } from '../src/core/lu.js';
import { ComplexSparseLu, SparseLu, SparseLuAnalysis } from '../src/core/sparse-lu.js';
import { SparsePattern } from '../src/core/sparse-pattern.js';

// Thousandths in [-1, 1]: fast-check's doubles favour extremes (subnormals, zeros), which make
// most draws singular to working precision and leave little to compare.
const entry = fc.integer({ min: -1000, max: 1000 }).map((v) => v / 1000);

const sparseArb = fc
  .record({ n: fc.integer({ min: 1, max: 16 }), density: fc.integer({ min: 5, max: 40 }) })
  .chain(({ n, density }) =>
    fc.record({
      n: fc.constant(n),
      keep: fc.array(fc.integer({ min: 0, max: 99 }).map((v) => v < density), { minLength: n * n, maxLength: n * n }),
      re: fc.array(entry, { minLength: n * n, maxLength: n * n }),
      im: fc.array(entry, { minLength: n * n, maxLength: n * n }),
      shift: fc.integer({ min: -3000, max: 3000 }).map((v) => v / 1000),
      tight: fc.boolean(),
      b: fc.array(fc.integer({ min: -10000, max: 10000 }).map((v) => v / 1000), { minLength: 2 * n, maxLength: 2 * n }),
    }),
  );

interface Draw {
  n: number;
  keep: boolean[];
  re: number[];
  im: number[];
  shift: number;
  tight: boolean;
  b: number[];
}

/** The draw's pattern (rows' kept columns) and its dense matrix (shift on the diagonal). */
function build(d: Draw, part: number[]): { rows: number[][]; dense: Float64Array; values: Float64Array; pattern: SparsePattern } {
  const { n } = d;
  const rows = Array.from({ length: n }, (_, i) => Array.from({ length: n }, (_, j) => j).filter((j) => d.keep[i * n + j] || i === j));
  const dense = new Float64Array(n * n);
  rows.forEach((cols, i) => cols.forEach((j) => (dense[i * n + j] = part[i * n + j]! + (i === j && part === d.re ? d.shift : 0))));
  const pattern = new SparsePattern(n, rows);
  const values = new Float64Array(pattern.nnz);
  for (let i = 0; i < n; i++) for (let q = pattern.rowStart[i]!; q < pattern.rowStart[i + 1]!; q++) values[q] = dense[i * n + pattern.column[q]!]!;
  return { rows, dense, values, pattern };
}

/** Infinity-norm condition number of the dense n x n matrix (inverse column by column), Infinity if singular. */
function condition(n: number, dense: Float64Array, factor: (a: Float64Array, piv: Int32Array) => boolean, solve: (a: Float64Array, piv: Int32Array, x: Float64Array) => void): number {
  const a = Float64Array.from(dense);
  const piv = new Int32Array(n);
  if (!factor(a, piv)) return Infinity;
  const rowSums = new Float64Array(n);
  for (let j = 0; j < n; j++) {
    const e = new Float64Array(n);
    e[j] = 1;
    solve(a, piv, e);
    for (let i = 0; i < n; i++) rowSums[i]! += Math.abs(e[i]!);
  }
  let normA = 0;
  for (let i = 0; i < n; i++) normA = Math.max(normA, dense.subarray(i * n, (i + 1) * n).reduce((s, v) => s + Math.abs(v), 0));
  return normA * Math.max(...rowSums);
}

describe('sparse LU against mathjs lusolve (real) and the dense complex LU', () => {
  it('random sparse systems: same solution within condition x 1e-13; pivots leave the diagonal', () => {
    let offDiagonal = 0;
    let compared = 0;
    let growths = 0;
    fc.assert(
      fc.property(sparseArb, (d) => {
        const { n } = d;
        const { dense, values, pattern } = build(d, d.re);
        const cond = condition(n, dense, (a, piv) => luFactor(a, n, piv), (a, piv, x) => luSolve(a, n, piv, x));
        if (!(cond <= 1e6)) return; // nearly singular: nothing to compare at this precision
        // Half the draws start with no room past the analysis' estimate, so storage growth is exercised.
        const analysis = new SparseLuAnalysis(pattern);
        const lu = new SparseLu(analysis, undefined, d.tight ? 0 : n);
        expect(lu.factor(values)).toBe(true);
        offDiagonal += lu.offDiagonalPivots();
        growths += lu.growths;
        // A second factorization of the same values with the kept storage gives the same factors.
        const again = Float64Array.from(d.b.slice(0, n));
        lu.solve(again);
        expect(lu.factor(values)).toBe(true);
        const x = Float64Array.from(d.b.slice(0, n));
        lu.solve(x);
        expect(Array.from(x)).toEqual(Array.from(again));
        const rows = Array.from({ length: n }, (_, i) => Array.from(dense.subarray(i * n, (i + 1) * n)));
        const want = (math.lusolve(rows, d.b.slice(0, n)) as number[][]).map((r) => r[0]!);
        const size = Math.max(...want.map(Math.abs));
        for (let i = 0; i < n; i++) expect(Math.abs(x[i]! - want[i]!)).toBeLessThanOrEqual(1e-13 * cond * size);
        compared++;
      }),
      { numRuns: 400 },
    );
    expect(compared).toBeGreaterThan(200);
    expect(offDiagonal).toBeGreaterThan(20);
    expect(growths).toBeGreaterThan(0);
  });

  it('complex systems (re + i im): same solution as complexLuFactor/complexLuSolve within condition x 1e-13', () => {
    let compared = 0;
    fc.assert(
      fc.property(sparseArb, (d) => {
        const { n } = d;
        const real = build(d, d.re);
        const imag = build(d, d.im);
        // Condition of the real 2n x 2n form [re -im; im re], which has the complex matrix's singular values.
        const big = new Float64Array(4 * n * n);
        for (let i = 0; i < n; i++) {
          for (let j = 0; j < n; j++) {
            big[i * 2 * n + j] = real.dense[i * n + j]!;
            big[i * 2 * n + n + j] = -imag.dense[i * n + j]!;
            big[(n + i) * 2 * n + j] = imag.dense[i * n + j]!;
            big[(n + i) * 2 * n + n + j] = real.dense[i * n + j]!;
          }
        }
        const cond = condition(2 * n, big, (a, piv) => luFactor(a, 2 * n, piv), (a, piv, x) => luSolve(a, 2 * n, piv, x));
        if (!(cond <= 1e6)) return;
        const ar = Float64Array.from(real.dense);
        const ai = Float64Array.from(imag.dense);
        const piv = new Int32Array(n);
        expect(complexLuFactor(ar, ai, n, piv)).toBe(true);
        const wr = Float64Array.from(d.b.slice(0, n));
        const wi = Float64Array.from(d.b.slice(n));
        complexLuSolve(ar, ai, n, piv, wr, wi);
        const scale = Math.max(...Array.from(wr, Math.abs), ...Array.from(wi, Math.abs));
        const lu = new ComplexSparseLu(new SparseLuAnalysis(real.pattern), undefined, d.tight ? 0 : n);
        expect(lu.factor(real.values, imag.values)).toBe(true);
        const xr = Float64Array.from(d.b.slice(0, n));
        const xi = Float64Array.from(d.b.slice(n));
        lu.solve(xr, xi);
        for (let i = 0; i < n; i++) {
          expect(Math.abs(xr[i]! - wr[i]!)).toBeLessThanOrEqual(1e-13 * cond * scale);
          expect(Math.abs(xi[i]! - wi[i]!)).toBeLessThanOrEqual(1e-13 * cond * scale);
        }
        compared++;
      }),
      { numRuns: 300 },
    );
    expect(compared).toBeGreaterThan(150);
  });

  it('a singular matrix (a zero column) is refused, not solved', () => {
    // Column 1 is structurally present but all zero: no pivot exists at its step.
    const pattern = new SparsePattern(3, [[0, 1], [1], [1, 2]]);
    const values = new Float64Array(pattern.nnz);
    for (let i = 0; i < 3; i++) values[pattern.diagonal[i]!] = i === 1 ? 0 : 2;
    expect(new SparseLu(new SparseLuAnalysis(pattern)).factor(values)).toBe(false);
  });
});
