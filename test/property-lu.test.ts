// Property: src/core/lu.ts (partial pivoting, Golub & Van Loan sec. 3.4) agrees with mathjs
// `lusolve` (an independent implementation) on random well-conditioned systems, and on random
// row permutations of them (pivoting must not depend on the row order of a nonsingular system).
import fc from 'fast-check';
import * as math from 'mathjs';
import { describe, expect, it } from 'vitest';
import { luFactor, luSolve } from '../src/core/lu.js';

const entry = fc.double({ min: -1, max: 1, noNaN: true });

/**
 * n x n matrices R + d I with entries of R in [-1, 1] and |d| >= n + 1: strictly diagonally
 * dominant (|a_ii| > sum_j!=i |a_ij|), so nonsingular with a condition number below about 2n + 1
 * in the infinity norm (Varah's bound, common practice).
 */
const systemArb = fc.integer({ min: 1, max: 9 }).chain((n) =>
  fc.record({
    n: fc.constant(n),
    a: fc.array(entry, { minLength: n * n, maxLength: n * n }),
    shift: fc.double({ min: n + 1, max: 4 * n + 4, noNaN: true }),
    negative: fc.boolean(),
    b: fc.array(fc.double({ min: -10, max: 10, noNaN: true }), { minLength: n, maxLength: n }),
    perm: fc.shuffledSubarray(Array.from({ length: n }, (_, i) => i), { minLength: n, maxLength: n }),
  }),
);

function solveWithLu(n: number, a: readonly number[], b: readonly number[]): Float64Array {
  const m = Float64Array.from(a);
  const piv = new Int32Array(n);
  expect(luFactor(m, n, piv)).toBe(true);
  const x = Float64Array.from(b);
  luSolve(m, n, piv, x);
  return x;
}

describe('dense LU against mathjs lusolve', () => {
  it('random diagonally dominant systems: same solution to 1e-13 relative, small residual', () => {
    fc.assert(
      fc.property(systemArb, ({ n, a, shift, negative, b }) => {
        const A = a.map((v, k) => (Math.floor(k / n) === k % n ? v + (negative ? -shift : shift) : v));
        const x = solveWithLu(n, A, b);
        const rows = Array.from({ length: n }, (_, i) => A.slice(i * n, (i + 1) * n));
        const want = (math.lusolve(rows, b) as number[][]).map((r) => r[0]!);
        const scale = Math.max(1, ...want.map(Math.abs));
        for (let i = 0; i < n; i++) expect(Math.abs(x[i]! - want[i]!)).toBeLessThanOrEqual(1e-13 * scale);
        // Backward check: |A x - b| at the level of rounding in the products.
        for (let i = 0; i < n; i++) {
          const r = rows[i]!.reduce((s, v, j) => s + v * x[j]!, 0) - b[i]!;
          expect(Math.abs(r)).toBeLessThanOrEqual(1e-13 * (Math.abs(b[i]!) + 5 * n * scale));
        }
      }),
      { numRuns: 300 },
    );
  });
  it('permuting the equations does not change the solution', () => {
    fc.assert(
      fc.property(systemArb, ({ n, a, shift, b, perm }) => {
        const A = a.map((v, k) => (Math.floor(k / n) === k % n ? v + shift : v));
        const x = solveWithLu(n, A, b);
        const PA = perm.flatMap((i) => A.slice(i * n, (i + 1) * n));
        const Pb = perm.map((i) => b[i]!);
        const y = solveWithLu(n, PA, Pb);
        const scale = Math.max(1, ...Array.from(x, Math.abs));
        for (let i = 0; i < n; i++) expect(Math.abs(x[i]! - y[i]!)).toBeLessThanOrEqual(1e-13 * scale);
      }),
      { numRuns: 200 },
    );
  });
  it('a singular matrix (a zero column) is reported, not solved', () => {
    // A zero column stays exactly zero through elimination (a_ij - m * 0), so its pivot is an
    // exact 0 whatever the other entries; a repeated row would not do: inexact multipliers
    // leave a pivot of rounding size, which is not "singular to working precision" by this test.
    fc.assert(
      fc.property(fc.integer({ min: 2, max: 7 }).chain((n) => fc.tuple(fc.constant(n), fc.array(entry, { minLength: n * n, maxLength: n * n }), fc.integer({ min: 0, max: n - 1 }))), ([n, a, k]) => {
        const A = Float64Array.from(a);
        for (let i = 0; i < n; i++) A[i * n + k] = 0;
        expect(luFactor(A, n, new Int32Array(n))).toBe(false);
      }),
      { numRuns: 200 },
    );
  });
});
