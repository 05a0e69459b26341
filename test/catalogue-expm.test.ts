// The Pade scaling-and-squaring matrix exponential against mathjs and closed forms.
import { describe, expect, it } from 'vitest';
import { expm as mathExpm, matrix, type Matrix } from 'mathjs';
import { expm, expmApply } from '../src/problems/expm.js';
import { augmentedInitial, augmentedMatrix, AUGMENTED_DIMENSION } from '../problems/linear-oscillator-chain.js';

const n = AUGMENTED_DIMENSION;

// Independent reference: Taylor series of exp(A / 2^12), 40 terms, squared 12 times, all in
// BigInt fixed point with 50 decimal digits, starting from the exact value of each double entry.
// Truncation and rounding are far below 1e-30, so this is exact at double precision
// (common practice, no source).
const SCALE = 10n ** 50n;
const SQUARINGS = 12;
function toFixed(v: number): bigint {
  if (v === 0) return 0n;
  const e = Math.floor(Math.log2(Math.abs(v))) - 52;
  const mantissa = BigInt(v / 2 ** e); // exact: v = mantissa * 2^e with |mantissa| < 2^53
  return e >= 0 ? mantissa * SCALE * 2n ** BigInt(e) : (mantissa * SCALE) / 2n ** BigInt(-e);
}
function fixedMultiply(a: bigint[], b: bigint[], size: number): bigint[] {
  const c = new Array<bigint>(size * size).fill(0n);
  for (let i = 0; i < size; i++)
    for (let k = 0; k < size; k++) for (let j = 0; j < size; j++) c[i * size + j]! += a[i * size + k]! * b[k * size + j]!;
  return c.map((v) => v / SCALE);
}
function exactExpm(a: Float64Array, size: number): number[] {
  const scaled = Array.from(a, (v) => toFixed(v) / 2n ** BigInt(SQUARINGS));
  let term = Array.from({ length: size * size }, (_, i) => (i % (size + 1) === 0 ? SCALE : 0n));
  let sum = term.slice();
  for (let k = 1; k <= 40; k++) {
    term = fixedMultiply(term, scaled, size).map((v) => v / BigInt(k));
    sum = sum.map((v, i) => v + term[i]!);
  }
  for (let k = 0; k < SQUARINGS; k++) sum = fixedMultiply(sum, sum, size);
  return sum.map((v) => Number((v * 10n ** 20n) / SCALE) / 1e20);
}

function referenceExpm(a: Float64Array, size: number, t: number): number[][] {
  const rows: number[][] = [];
  for (let i = 0; i < size; i++) rows.push(Array.from(a.subarray(i * size, (i + 1) * size), (v) => v * t));
  return (mathExpm(matrix(rows)) as Matrix).toArray() as number[][];
}

describe('expm', () => {
  it('matches a 50-digit Taylor reference on the augmented oscillator-chain matrix to 2e-14', () => {
    for (const t of [0.01, 1, 7, 13.7, 30]) {
      const scaled = Float64Array.from(augmentedMatrix, (v) => v * t);
      const ours = expm(scaled, n);
      const exact = exactExpm(scaled, n);
      let worst = 0;
      for (let i = 0; i < n * n; i++) worst = Math.max(worst, Math.abs(ours[i]! - exact[i]!));
      expect(worst, `t = ${t}`).toBeLessThan(2e-14);
    }
  });

  it('matches mathjs expm on the augmented oscillator-chain matrix at several t', () => {
    // mathjs expm (registry library) as the outside reference. Against the 50-digit reference
    // above mathjs itself is off by up to 2.5e-13 here (at t = 7) while this expm is within
    // 6e-15, so the agreement bound is mathjs's accuracy, 5e-13.
    for (const t of [0.01, 0.3, 1, 2.5, 7, 13.7, 30]) {
      const scaled = Float64Array.from(augmentedMatrix, (v) => v * t);
      const ours = expm(scaled, n);
      const theirs = referenceExpm(augmentedMatrix, n, t);
      let worst = 0;
      for (let i = 0; i < n; i++) for (let j = 0; j < n; j++) worst = Math.max(worst, Math.abs(ours[i * n + j]! - theirs[i]![j]!));
      expect(worst, `t = ${t}`).toBeLessThan(5e-13);
    }
  });

  it('matches mathjs for the state expm(M t) z0', () => {
    const out = new Float64Array(n);
    for (const t of [5, 17.25, 29]) {
      expmApply(augmentedMatrix, n, t, augmentedInitial, out);
      const e = referenceExpm(augmentedMatrix, n, t);
      for (let i = 0; i < n; i++) {
        const ref = e[i]!.reduce((s, v, j) => s + v * augmentedInitial[j]!, 0);
        expect(Math.abs(out[i]! - ref)).toBeLessThan(5e-13);
      }
    }
  });

  it('gives a rotation for a skew generator, exercising many squarings', () => {
    // Closed form: exp([[0, th], [-th, 0]]) = [[cos th, sin th], [-sin th, cos th]].
    for (const th of [1e-3, 0.5, 3, 40, 250]) {
      const r = expm(Float64Array.from([0, th, -th, 0]), 2);
      const tol = 1e-15 * Math.max(1, th) * 4;
      expect(Math.abs(r[0]! - Math.cos(th))).toBeLessThan(tol);
      expect(Math.abs(r[1]! - Math.sin(th))).toBeLessThan(tol);
      expect(Math.abs(r[2]! + Math.sin(th))).toBeLessThan(tol);
      expect(Math.abs(r[3]! - Math.cos(th))).toBeLessThan(tol);
    }
  });

  it('gives exp of a Jordan block exactly: exp([[a, 1], [0, a]]) = e^a [[1, 1], [0, 1]]', () => {
    // Closed form for a 2x2 Jordan block.
    for (const a of [-3, 0.2, 4]) {
      const r = expm(Float64Array.from([a, 1, 0, a]), 2);
      const ea = Math.exp(a);
      expect(Math.abs(r[0]! / ea - 1)).toBeLessThan(4e-15);
      expect(Math.abs(r[1]! / ea - 1)).toBeLessThan(4e-15);
      expect(r[2]).toBe(0);
      expect(Math.abs(r[3]! / ea - 1)).toBeLessThan(4e-15);
    }
  });

  it('returns the identity for the zero matrix and rejects bad input', () => {
    expect(Array.from(expm(new Float64Array(4), 2))).toEqual([1, 0, 0, 1]);
    expect(() => expm(new Float64Array(3), 2)).toThrow(RangeError);
    expect(() => expm(Float64Array.from([NaN, 0, 0, 0]), 2)).toThrow(RangeError);
  });
});
