// The written-out LU routines (src/core/lu-small.ts) against the loops of src/core/lu.ts for
// every size they exist for: same pivots, same factors and same solutions, bit for bit (the
// loops are the reference; their own check against mathjs is in the LU tests). Matrices from a
// fixed-seed generator, with zero columns, exact zeros below the pivot and rows that force swaps.
import { describe, expect, test } from 'vitest';
import { complexLuFactor, complexLuSolve, luFactor, luSolve } from '../src/core/lu.js';
import { SMALL_LU_MAX_N, smallLu } from '../src/core/lu-small.js';

function generator(seed: number): () => number {
  let s = seed >>> 0;
  return () => {
    s = (Math.imul(s, 1664525) + 1013904223) >>> 0;
    return s / 2 ** 32;
  };
}

/** A matrix with some structure: random entries, exact zeros, a zero column now and then. */
function matrix(n: number, rnd: () => number, kind: number): Float64Array {
  const a = new Float64Array(n * n);
  for (let q = 0; q < n * n; q++) a[q] = rnd() < 0.25 ? 0 : (rnd() - 0.5) * 10 ** Math.floor(rnd() * 6 - 3);
  if (kind === 1) for (let i = 0; i < n; i++) a[i * n + (n - 1)] = 0; // singular
  if (kind === 2) for (let i = 0; i < n; i++) a[i * n] = i; // first pivot forced below
  return a;
}

const same = (x: ArrayLike<number>, y: ArrayLike<number>) => Array.from(x).every((v, i) => Object.is(v, y[i]));

describe('written-out LU equals lu.ts bit for bit', () => {
  test.each(Array.from({ length: SMALL_LU_MAX_N }, (_, i) => [i + 1]))('n = %i: real and complex, 60 matrices each', (n) => {
    const rnd = generator(1000 + n);
    const lu = smallLu(n);
    for (let trial = 0; trial < 60; trial++) {
      const kind = trial % 3;
      const a = matrix(n, rnd, kind);
      const a1 = a.slice(), a2 = a.slice();
      const p1 = new Int32Array(n), p2 = new Int32Array(n);
      const ok1 = luFactor(a1, n, p1);
      expect(lu.factor(a2, p2)).toBe(ok1);
      if (kind === 1) expect(ok1).toBe(false);
      if (ok1) {
        expect(same(a1, a2)).toBe(true);
        expect(same(p1, p2)).toBe(true);
        const b = Float64Array.from({ length: n }, () => rnd() - 0.5);
        const b1 = b.slice(), b2 = b.slice();
        luSolve(a1, n, p1, b1);
        lu.solve(a2, p2, b2);
        expect(same(b1, b2)).toBe(true);
      }
      const ai = matrix(n, rnd, 0);
      const r1 = a.slice(), i1 = ai.slice(), r2 = a.slice(), i2 = ai.slice();
      const q1 = new Int32Array(n), q2 = new Int32Array(n);
      const c1 = complexLuFactor(r1, i1, n, q1);
      expect(lu.complexFactor(r2, i2, q2)).toBe(c1);
      if (c1) {
        expect(same(r1, r2) && same(i1, i2) && same(q1, q2)).toBe(true);
        const br = Float64Array.from({ length: n }, () => rnd() - 0.5), bi = Float64Array.from({ length: n }, () => rnd() - 0.5);
        const x1 = br.slice(), y1 = bi.slice(), x2 = br.slice(), y2 = bi.slice();
        complexLuSolve(r1, i1, n, q1, x1, y1);
        lu.complexSolve(r2, i2, q2, x2, y2);
        expect(same(x1, x2) && same(y1, y2)).toBe(true);
      }
    }
  });

  test('sizes outside 1..SMALL_LU_MAX_N are refused', () => {
    expect(() => smallLu(0)).toThrow(RangeError);
    expect(() => smallLu(SMALL_LU_MAX_N + 1)).toThrow(RangeError);
  });
});
