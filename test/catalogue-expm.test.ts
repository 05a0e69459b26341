// The Pade scaling-and-squaring matrix exponential against mathjs and closed forms.
import { describe, expect, it } from 'vitest';
import { expm as mathExpm, matrix, type Matrix } from 'mathjs';
import { expm, expmApply } from '../src/core/expm.js';
import { expmTrajectory } from '../src/problems/expm-trajectory.js';
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

describe('expmTrajectory (grid states and a Taylor series between them)', () => {
  // The state at t from the 50-digit reference exponential above applied to z0: exact at double
  // precision (common practice, no source).
  function exactState(t: number): number[] {
    const e = exactExpm(Float64Array.from(augmentedMatrix, (v) => v * t), n);
    return Array.from({ length: n }, (_, i) => e.slice(i * n, (i + 1) * n).reduce((s, v, j) => s + v * augmentedInitial[j]!, 0));
  }

  it('matches the 50-digit reference state between grid points to 2e-14', () => {
    const at = expmTrajectory(augmentedMatrix, n, 0, 30, augmentedInitial);
    const out = new Float64Array(n);
    for (const t of [0.0123, 1, 4.99, 13.7, 21.111, 30]) {
      at(t, out);
      const exact = exactState(t);
      for (let i = 0; i < n; i++) expect(Math.abs(out[i]! - exact[i]!), `t = ${t}, z${i}`).toBeLessThan(2e-14);
    }
  });

  it('agrees with one direct exponential per time to 3e-14 over the whole span, in any order', () => {
    // Measured against the 50-digit reference at 150 times over the span, each is within 1.3e-14
    // (trajectory 1.25e-14, direct 1.21e-14), so the two agree to within the sum of those.
    const at = expmTrajectory(augmentedMatrix, n, 0, 30, augmentedInitial);
    const ours = new Float64Array(n);
    const direct = new Float64Array(n);
    let worst = 0;
    // Decreasing, then a pseudo-random walk: the grid is filled lazily and must not depend on order.
    const times = [...Array.from({ length: 300 }, (_, k) => 30 - k * 0.0997), ...Array.from({ length: 300 }, (_, k) => (k * 7.31) % 30)];
    for (const t of times) {
      at(t, ours);
      expmApply(augmentedMatrix, n, t, augmentedInitial, direct);
      for (let i = 0; i < n; i++) worst = Math.max(worst, Math.abs(ours[i]! - direct[i]!));
    }
    expect(worst).toBeLessThan(3e-14);
  });

  it('falls back to one exponential per time where the grid would be too long, and handles M = 0', () => {
    // ||M||_1 = 1e4 over a span of 100: 4e6 grid points, over the limit; the rotation's closed form.
    const th = 1e4;
    const at = expmTrajectory(Float64Array.from([0, th, -th, 0]), 2, 0, 100, [1, 0]);
    const out = new Float64Array(2);
    at(0.01234, out);
    expect(Math.abs(out[0]! - Math.cos(th * 0.01234))).toBeLessThan(1e-11);
    expect(Math.abs(out[1]! + Math.sin(th * 0.01234))).toBeLessThan(1e-11);
    const still = expmTrajectory(new Float64Array(4), 2, 0, 1, [3, -2]);
    still(0.5, out);
    expect(Array.from(out)).toEqual([3, -2]);
  });
});
