// Property: the banded LU of src/core/band-lu.ts (Golub & Van Loan, sec. 4.3.5) solves the same
// systems as the dense LU of src/core/lu.ts (itself checked against mathjs in property-lu), on
// random banded matrices of random size and bandwidths, real and complex. The diagonal shift is
// drawn from [-3, 3], so many draws need row swaps (counted below, so the property cannot pass
// without exercising them); nearly singular draws are left out by the dense solution's size.
import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { bandIndex, bandLuFactor, bandLuSolve, bandWidth, complexBandLuFactor, complexBandLuSolve } from '../src/core/band-lu.js';
import { complexLuFactor, complexLuSolve, luFactor, luSolve } from '../src/core/lu.js';

// Thousandths in [-1, 1]: fast-check's doubles favour extremes (subnormals, zeros), which make
// most draws singular to working precision and leave little to compare.
const entry = fc.integer({ min: -1000, max: 1000 }).map((v) => v / 1000);

const bandedArb = fc
  .record({ n: fc.integer({ min: 1, max: 14 }), ml: fc.integer({ min: 0, max: 4 }), mu: fc.integer({ min: 0, max: 4 }) })
  .chain(({ n, ml, mu }) =>
    fc.record({
      n: fc.constant(n),
      ml: fc.constant(ml),
      mu: fc.constant(mu),
      re: fc.array(entry, { minLength: n * n, maxLength: n * n }),
      im: fc.array(entry, { minLength: n * n, maxLength: n * n }),
      shift: fc.integer({ min: -3000, max: 3000 }).map((v) => v / 1000),
      b: fc.array(fc.double({ min: -10, max: 10, noNaN: true }), { minLength: 2 * n, maxLength: 2 * n }),
    }),
  );

/** Dense row-major matrix with the entries outside the band set to 0 and the shift on the diagonal. */
function dense(n: number, ml: number, mu: number, vals: readonly number[], shift: number): Float64Array {
  const a = new Float64Array(n * n);
  for (let i = 0; i < n; i++) {
    for (let j = Math.max(0, i - ml); j <= Math.min(n - 1, i + mu); j++) a[i * n + j] = vals[i * n + j]! + (i === j ? shift : 0);
  }
  return a;
}

function toBand(a: Float64Array, n: number, ml: number, mu: number): Float64Array {
  const w = bandWidth(ml, mu);
  const out = new Float64Array(n * w);
  for (let i = 0; i < n; i++) for (let j = Math.max(0, i - ml); j <= Math.min(n - 1, i + mu); j++) out[bandIndex(i, j, ml, w)] = a[i * n + j]!;
  return out;
}

const maxAbs = (v: ArrayLike<number>) => Array.from(v).reduce((m, x) => Math.max(m, Math.abs(x)), 0);

describe('banded LU against dense LU', () => {
  it('real: same solution to 1e-11 relative on random banded systems', () => {
    let swaps = 0;
    let compared = 0;
    fc.assert(
      fc.property(bandedArb, ({ n, ml, mu, re, shift, b }) => {
        const A = dense(n, ml, mu, re, shift);
        const D = A.slice();
        const pd = new Int32Array(n);
        if (!luFactor(D, n, pd)) return;
        const xd = Float64Array.from(b.slice(0, n));
        luSolve(D, n, pd, xd);
        if (!(maxAbs(xd) <= 1e6)) return; // nearly singular draw (or one whose tiny pivots overflow)
        const B = toBand(A, n, ml, mu);
        const pb = new Int32Array(n);
        expect(bandLuFactor(B, n, ml, mu, pb)).toBe(true);
        for (let k = 0; k < n; k++) if (pb[k] !== k) swaps++;
        const xb = Float64Array.from(b.slice(0, n));
        bandLuSolve(B, n, ml, mu, pb, xb);
        const scale = Math.max(1, maxAbs(xd));
        for (let i = 0; i < n; i++) expect(Math.abs(xb[i]! - xd[i]!)).toBeLessThanOrEqual(1e-11 * scale);
        compared++;
      }),
      { numRuns: 400 },
    );
    expect(compared).toBeGreaterThan(300);
    expect(swaps).toBeGreaterThan(100);
  });

  it('complex: same solution to 1e-11 relative on random banded systems', () => {
    let compared = 0;
    fc.assert(
      fc.property(bandedArb, ({ n, ml, mu, re, im, shift, b }) => {
        const Ar = dense(n, ml, mu, re, shift);
        const Ai = dense(n, ml, mu, im, 0);
        const Dr = Ar.slice();
        const Di = Ai.slice();
        const pd = new Int32Array(n);
        if (!complexLuFactor(Dr, Di, n, pd)) return;
        const xr = Float64Array.from(b.slice(0, n));
        const xi = Float64Array.from(b.slice(n));
        complexLuSolve(Dr, Di, n, pd, xr, xi);
        if (!(Math.max(maxAbs(xr), maxAbs(xi)) <= 1e6)) return;
        const Br = toBand(Ar, n, ml, mu);
        const Bi = toBand(Ai, n, ml, mu);
        const pb = new Int32Array(n);
        expect(complexBandLuFactor(Br, Bi, n, ml, mu, pb)).toBe(true);
        const yr = Float64Array.from(b.slice(0, n));
        const yi = Float64Array.from(b.slice(n));
        complexBandLuSolve(Br, Bi, n, ml, mu, pb, yr, yi);
        const scale = Math.max(1, maxAbs(xr), maxAbs(xi));
        for (let i = 0; i < n; i++) {
          expect(Math.abs(yr[i]! - xr[i]!)).toBeLessThanOrEqual(1e-11 * scale);
          expect(Math.abs(yi[i]! - xi[i]!)).toBeLessThanOrEqual(1e-11 * scale);
        }
        compared++;
      }),
      { numRuns: 300 },
    );
    expect(compared).toBeGreaterThan(250);
  });

  it('a zero column is reported singular', () => {
    const n = 5;
    const A = dense(n, 1, 1, Array.from({ length: n * n }, () => 1), 2);
    for (let i = 0; i < n; i++) A[i * n + 2] = 0;
    expect(bandLuFactor(toBand(A, n, 1, 1), n, 1, 1, new Int32Array(n))).toBe(false);
  });
});
