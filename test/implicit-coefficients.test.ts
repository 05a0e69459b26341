// Coefficient checks for the implicit methods: order conditions, stability at infinity and the
// quantities derived from published tableaus.
import { describe, expect, test } from 'vitest';
import { RADAU5_A, RADAU5_C, RADAU5_TRANSFORM } from '../src/methods/implicit/radau-iia-5-tableau.js';
import { RODAS4 } from '../src/methods/implicit/rodas4.js';
import { ROS4_L_STABLE } from '../src/methods/implicit/ros4-l-stable.js';
import { TR_BDF2 } from '../src/methods/implicit/tr-bdf2.js';
import { differenceRescaleMatrix, rescaleDifferences } from '../src/methods/implicit/bdf-rescale.js';

function inv(m: number[][]): number[][] {
  const n = m.length;
  const a = m.map((r, i) => [...r, ...Array.from({ length: n }, (_, j) => (i === j ? 1 : 0))]);
  for (let k = 0; k < n; k++) {
    let p = k;
    for (let i = k + 1; i < n; i++) if (Math.abs(a[i]![k]!) > Math.abs(a[p]![k]!)) p = i;
    [a[k], a[p]] = [a[p]!, a[k]!];
    const d = a[k]![k]!;
    for (let j = 0; j < 2 * n; j++) a[k]![j]! /= d;
    for (let i = 0; i < n; i++) if (i !== k) {
      const f = a[i]![k]!;
      for (let j = 0; j < 2 * n; j++) a[i]![j] = a[i]![j]! - f * a[k]![j]!;
    }
  }
  return a.map((r) => r.slice(n));
}
const matmul = (a: number[][], b: number[][]) => a.map((r) => b[0]!.map((_, j) => r.reduce((s, v, k) => s + v * b[k]![j]!, 0)));

describe('Radau IIA 5 derived quantities', () => {
  test('eigenvalues of A^{-1} are the roots of z^3 - 9z^2 + 36z - 60 (denominator of the (2,3)-Pade approximation, HW II sec. IV.5)', () => {
    const { gamma, alpha, beta } = RADAU5_TRANSFORM;
    expect(Math.abs(((gamma - 9) * gamma + 36) * gamma - 60)).toBeLessThan(1e-12);
    // complex root alpha + i beta
    let re = 1, im = 0;
    const pw: [number, number][] = [[1, 0]];
    for (let k = 1; k <= 3; k++) {
      [re, im] = [re * alpha - im * beta, re * beta + im * alpha];
      pw.push([re, im]);
    }
    const pr = pw[3]![0] - 9 * pw[2]![0] + 36 * pw[1]![0] - 60;
    const pi = pw[3]![1] - 9 * pw[2]![1] + 36 * pw[1]![1];
    expect(Math.hypot(pr, pi)).toBeLessThan(1e-11);
    // From memory (HW II sec. IV.8 / RADAU5): gamma = 3.6378342527444957, alpha = 2.6810828736277521, beta = 3.0504301992474105.
    expect(gamma).toBeCloseTo(3.6378342527444957, 13);
    expect(alpha).toBeCloseTo(2.6810828736277521, 13);
    expect(beta).toBeCloseTo(3.0504301992474105, 13);
  });

  test('T^{-1} A^{-1} T is block diagonal [gamma] + [[alpha, -beta], [beta, alpha]]', () => {
    const { ainv, t, tinv, gamma, alpha, beta } = RADAU5_TRANSFORM;
    const to = (v: readonly number[]) => [v.slice(0, 3), v.slice(3, 6), v.slice(6, 9)] as number[][];
    const L = matmul(matmul(to(tinv), to(ainv)), to(t));
    const want = [[gamma, 0, 0], [0, alpha, -beta], [0, beta, alpha]];
    for (let i = 0; i < 3; i++) for (let j = 0; j < 3; j++) expect(Math.abs(L[i]![j]! - want[i]![j]!)).toBeLessThan(1e-12);
  });

  test('the tableau satisfies the simplifying conditions C(3) (order 5 with B(5), HW II sec. IV.5)', () => {
    for (let i = 0; i < 3; i++) for (let q = 1; q <= 3; q++) {
      let s = 0;
      for (let j = 0; j < 3; j++) s += RADAU5_A[i * 3 + j]! * RADAU5_C[j]! ** (q - 1);
      expect(Math.abs(s - RADAU5_C[i]! ** q / q)).toBeLessThan(1e-14);
    }
    // B(5): sum b_j c_j^(q-1) = 1/q with b = last row of A.
    for (let q = 1; q <= 5; q++) {
      let s = 0;
      for (let j = 0; j < 3; j++) s += RADAU5_A[6 + j]! * RADAU5_C[j]! ** (q - 1);
      expect(Math.abs(s - 1 / q)).toBeLessThan(1e-14);
    }
  });

  test('error-estimate weights equal the published -(13+7 sqrt6)/3, (-13+7 sqrt6)/3, -1/3 (HW II sec. IV.8, eq. (8.20); from memory)', () => {
    const s6 = Math.sqrt(6);
    const [d1, d2, d3] = RADAU5_TRANSFORM.d;
    expect(d1).toBeCloseTo(-(13 + 7 * s6) / 3, 12);
    expect(d2).toBeCloseTo((-13 + 7 * s6) / 3, 12);
    expect(d3).toBeCloseTo(-1 / 3, 12);
  });
});

// RODAS4 (6 stages) and ROS4's L-stable set (4 stages), both in the transformed form of HW II
// sec. IV.7, (7.25)-(7.26); the published coefficients carry 16 digits, hence the bound 1e-12.
describe.each([
  ['RODAS4', RODAS4],
  ['ROS4, L-stable set', ROS4_L_STABLE],
] as const)('%s', (_name, RB) => {
  // Back to the untransformed form: Gamma^{-1} = diag(1/gamma) - C, alpha = A Gamma, b = m Gamma.
  const s = RB.alpha.length;
  const g = RB.gamma;
  const ginv: number[][] = [];
  const A: number[][] = [];
  for (let i = 0; i < s; i++) {
    ginv.push(Array.from({ length: s }, (_, j) => (i === j ? 1 / g : j < i ? -RB.c[i]![j]! : 0)));
    A.push(Array.from({ length: s }, (_, j) => (j < i ? RB.a[i]![j]! : 0)));
  }
  const G = inv(ginv);
  const al = matmul(A, G);
  const bOf = (w: number[]) => matmul([w], G)[0]!;
  const lower = (i: number, j: number) => (j < i ? al[i]![j]! + G[i]![j]! : 0); // beta_ij
  const alphaI = al.map((r) => r.reduce((x, v) => x + v, 0));
  const betaP = Array.from({ length: s }, (_, i) => Array.from({ length: s }, (_, j) => lower(i, j)).reduce((x, v) => x + v, 0));
  const sum = (f: (j: number, k: number, l: number) => number, depth: number) => {
    let t = 0;
    for (let j = 0; j < s; j++) {
      if (depth === 1) t += f(j, 0, 0);
      else for (let k = 0; k < s; k++) {
        if (depth === 2) t += f(j, k, 0);
        else for (let l = 0; l < s; l++) t += f(j, k, l);
      }
    }
    return t;
  };
  // Order conditions of Rosenbrock methods up to order 4, HW II sec. IV.7, Table 7.1 (from memory),
  // in the untransformed coefficients alpha_ij, gamma_ij with beta_ij = alpha_ij + gamma_ij and
  // beta'_i = sum_{j<i} beta_ij; the gamma terms on the right are what the Jacobian (W) terms
  // in the stages add to the Runge-Kutta conditions. One line per rooted tree: order 1 (1 tree),
  // order 2 (1), order 3 (2), order 4 (4).
  const conditions = (b: number[]) => [
    sum((j) => b[j]!, 1) - 1,
    sum((j) => b[j]! * betaP[j]!, 1) - (0.5 - g),
    sum((j) => b[j]! * alphaI[j]! ** 2, 1) - 1 / 3,
    sum((j, k) => b[j]! * lower(j, k) * betaP[k]!, 2) - (1 / 6 - g + g * g),
    sum((j) => b[j]! * alphaI[j]! ** 3, 1) - 1 / 4,
    sum((j, k) => b[j]! * alphaI[j]! * al[j]![k]! * betaP[k]!, 2) - (1 / 8 - g / 3),
    sum((j, k) => b[j]! * lower(j, k) * alphaI[k]! ** 2, 2) - (1 / 12 - g / 3),
    sum((j, k, l) => b[j]! * lower(j, k) * lower(k, l) * betaP[l]!, 3) - (1 / 24 - g / 2 + 1.5 * g * g - g ** 3),
  ];
  test('main formula satisfies the 8 conditions of order 4 (HW II Table 7.1)', () => {
    for (const r of conditions(bOf(RB.m))) expect(Math.abs(r)).toBeLessThan(1e-12);
  });
  test('embedded formula (m - e) satisfies the 4 conditions of order 3 and not all of order 4', () => {
    const c = conditions(bOf(RB.m.map((v, i) => v - RB.e[i]!)));
    for (const r of c.slice(0, 4)) expect(Math.abs(r)).toBeLessThan(1e-12);
    expect(Math.max(...c.slice(4).map(Math.abs))).toBeGreaterThan(1e-6);
  });
  test('a stage marked as reusing the previous evaluation has the same alpha and a row (last entry 0)', () => {
    for (let i = 1; i < s; i++) {
      if (!RB.reuse[i]) continue;
      expect(RB.alpha[i]).toBe(RB.alpha[i - 1]);
      expect(RB.a[i]!.slice(0, i - 1)).toEqual(RB.a[i - 1]);
      expect(RB.a[i]![i - 1]).toBe(0);
    }
    expect(RB.reuse[0]).toBe(false);
  });
  test('alpha_i and gamma_i match the row sums of the untransformed coefficients; R(inf) = 0 (L-stable)', () => {
    for (let i = 0; i < s; i++) {
      expect(Math.abs(alphaI[i]! - RB.alpha[i]!)).toBeLessThan(1e-12);
      const gi = G[i]!.slice(0, i + 1).reduce((x, v) => x + v, 0);
      // gamma_i = sum_{j<=i} gamma_ij, diagonal included.
      expect(Math.abs(gi - RB.gammaSum[i]!)).toBeLessThan(1e-12);
    }
    // R(z) = 1 + z b^T (I - z B)^{-1} 1, B = alpha + Gamma; R(inf) = 1 - b^T B^{-1} 1.
    const B = al.map((r, i) => r.map((v, j) => v + G[i]![j]!));
    const Binv = inv(B);
    const b = bOf(RB.m);
    let rinf = 1;
    for (let i = 0; i < s; i++) for (let j = 0; j < s; j++) rinf -= b[i]! * Binv[i]![j]!;
    // For an order-4 method with one gamma and 4 stages R(z) = P(z) / (1 - gamma z)^4, P of degree
    // 4 fixed by the order, and R(inf) = (1/24 - 2 gamma/3 + 3 gamma^2 - 4 gamma^3 + gamma^4) / gamma^4
    // (the z^4 coefficient of e^z (1 - gamma z)^4; HW II sec. IV.7 chooses gamma at a root of it).
    // RODAS4 has 6 stages and is stiffly accurate, so R(inf) = 0 exactly. ROS4's gamma = 0.57282 is
    // that root (0.5728160624821...) rounded to 5 digits, so its R(inf) is small but not 0.
    if (s === 4) {
      const rinf4 = (1 / 24 - (2 * g) / 3 + 3 * g * g - 4 * g ** 3 + g ** 4) / g ** 4;
      expect(Math.abs(rinf - rinf4)).toBeLessThan(1e-12);
      expect(Math.abs(rinf)).toBeLessThan(2e-5);
    } else {
      expect(Math.abs(rinf)).toBeLessThan(1e-12);
    }
  });
});

describe('TR-BDF2 tableau', () => {
  const { a, b, bhat, c } = TR_BDF2;
  const cond = (w: number[]) => [
    w.reduce((x, v) => x + v, 0) - 1,
    w.reduce((x, v, i) => x + v * c[i]!, 0) - 1 / 2,
    w.reduce((x, v, i) => x + v * c[i]! ** 2, 0) - 1 / 3,
    w.reduce((x, v, i) => x + v * a[i]!.reduce((y, aij, j) => y + aij * c[j]!, 0), 0) - 1 / 6,
  ];
  test('b has order 2 (not 3), bhat has order 3 (RK order conditions, HW I sec. II.2)', () => {
    const cb = cond(b);
    expect(Math.abs(cb[0]!)).toBeLessThan(1e-15);
    expect(Math.abs(cb[1]!)).toBeLessThan(1e-15);
    expect(Math.abs(cb[2]!)).toBeGreaterThan(1e-3);
    for (const r of cond(bhat)) expect(Math.abs(r)).toBeLessThan(1e-15);
  });
  test('row sums equal c and the last row is b (stiffly accurate, so L-stable with A-stability)', () => {
    for (let i = 0; i < 3; i++) expect(Math.abs(a[i]!.reduce((x, v) => x + v, 0) - c[i]!)).toBeLessThan(1e-15);
    expect(a[2]).toEqual(b);
  });
});

describe('BDF step-change of backward differences', () => {
  test('R(1) U = I and rescaled differences of a cubic equal the differences at the new spacing', () => {
    const k = 4;
    const m = k + 1;
    const U = new Float64Array(m * m);
    differenceRescaleMatrix(k, 1, U);
    // U^2 = I (Shampine & Reichelt 1997, sec. 2.2).
    for (let i = 0; i < m; i++) for (let j = 0; j < m; j++) {
      let s2 = 0;
      for (let l = 0; l < m; l++) s2 += U[i * m + l]! * U[l * m + j]!;
      expect(Math.abs(s2 - (i === j ? 1 : 0))).toBeLessThan(1e-13);
    }
    const p = (t: number) => 1 + 2 * t - 0.5 * t * t + 0.3 * t ** 3;
    const diffs = (h: number) => {
      // backward differences at t = 0 on the grid 0, -h, -2h, ...
      let v = Array.from({ length: m }, (_, i) => p(-i * h));
      const out = [v[0]!];
      for (let j = 1; j < m; j++) {
        v = v.slice(0, m - j).map((x, i) => x - v[i + 1]!);
        out.push(v[0]!);
      }
      return out;
    };
    for (const r of [0.3, 0.5, 2, 3.7]) {
      const d = Float64Array.from(diffs(0.1));
      rescaleDifferences(d, 1, k, r, new Float64Array(3 * m * m + m));
      const want = diffs(0.1 * r);
      for (let j = 0; j < m; j++) expect(Math.abs(d[j]! - want[j]!)).toBeLessThan(1e-12);
    }
  });
});
