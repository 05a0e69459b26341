// Kepler's equation solver and the elliptic state built on it.
import { describe, expect, it } from 'vitest';
import { ellipticState, solveKepler } from '../problems/physics/kepler.js';

/** Bisection on the monotone g(E) = E - e sin E - M, an algorithm independent of Newton. */
function bisectKepler(M: number, e: number): number {
  let lo = M - 1;
  let hi = M + 1; // |E - M| = e |sin E| < 1
  for (let k = 0; k < 200; k++) {
    const mid = 0.5 * (lo + hi);
    if (mid === lo || mid === hi) break;
    if (mid - e * Math.sin(mid) - M < 0) lo = mid;
    else hi = mid;
  }
  return 0.5 * (lo + hi);
}

/** Small deterministic generator so a failure can be replayed (common practice, no source). */
function lcg(seed: number): () => number {
  let s = seed >>> 0;
  return () => {
    s = (Math.imul(s, 1664525) + 1013904223) >>> 0;
    return s / 2 ** 32;
  };
}

describe('solveKepler', () => {
  it('round-trips M = E - e sin E to machine precision for e in [0, 0.99] and |M| <= 100', () => {
    const rand = lcg(12345);
    let worst = 0;
    for (let i = 0; i < 20000; i++) {
      const e = 0.99 * rand();
      const M = 200 * (rand() - 0.5);
      const E = solveKepler(M, e);
      worst = Math.max(worst, Math.abs(E - e * Math.sin(E) - M) / Math.max(1, Math.abs(M)));
    }
    // A few ulps of |M| (the reduction M - 2 pi k costs an ulp of M): common practice, no source.
    expect(worst).toBeLessThan(8 * Number.EPSILON);
  });

  it('agrees with bisection (an independent root finder) to 1e-15', () => {
    const rand = lcg(777);
    for (let i = 0; i < 500; i++) {
      const e = 0.95 * rand();
      const M = 2 * Math.PI * (rand() - 0.5);
      expect(Math.abs(solveKepler(M, e) - bisectKepler(M, e))).toBeLessThan(1e-15);
    }
  });

  it('gives the exact values at the symmetric points and for e = 0', () => {
    // Analytic: E = M when e = 0, and E = M at M = 0 and M = pi for every e (sin E = 0 there).
    expect(solveKepler(0.7, 0)).toBe(0.7);
    expect(solveKepler(0, 0.6)).toBe(0);
    expect(Math.abs(solveKepler(Math.PI, 0.6) - Math.PI)).toBeLessThan(1e-15);
    expect(Math.abs(solveKepler(-Math.PI / 2 + 4 * Math.PI, 0.3) - 4 * Math.PI - solveKepler(-Math.PI / 2, 0.3))).toBeLessThan(2e-15);
  });

  it('reproduces the textbook example M = 235.4 deg, e = 0.4', () => {
    // Vallado, Fundamentals of Astrodynamics and Applications, Example 2-1:
    // E = 220.512074767522 deg (from memory).
    const E = (solveKepler((235.4 * Math.PI) / 180, 0.4) * 180) / Math.PI;
    expect(Math.abs(E - 220.512074767522)).toBeLessThan(1e-9);
  });

  it('rejects eccentricities outside [0, 1)', () => {
    expect(() => solveKepler(1, 1)).toThrow(RangeError);
    expect(() => solveKepler(1, -0.1)).toThrow(RangeError);
  });
});

describe('ellipticState', () => {
  it('starts at periapsis and returns there after one period 2 pi sqrt(a^3/mu)', () => {
    // Analytic: periapsis distance a (1 - e), speed there sqrt(mu (1 + e) / (a (1 - e))) (vis-viva).
    const out = new Float64Array(4);
    const a = 2;
    const e = 0.3;
    const mu = 3;
    ellipticState(0, a, e, mu, out);
    expect(out[0]).toBeCloseTo(a * (1 - e), 15);
    expect(out[1]).toBe(0);
    expect(out[2]).toBeCloseTo(0, 15);
    expect(out[3]).toBeCloseTo(Math.sqrt((mu * (1 + e)) / (a * (1 - e))), 14);
    const period = 2 * Math.PI * Math.sqrt((a * a * a) / mu);
    const back = new Float64Array(4);
    ellipticState(period, a, e, mu, back);
    for (let i = 0; i < 4; i++) expect(Math.abs(back[i]! - out[i]!)).toBeLessThan(1e-14);
  });

  it('reaches apoapsis a (1 + e) on the -x axis at half a period', () => {
    // Analytic: M = pi gives E = pi, x = -a (1 + e), y = 0.
    const out = new Float64Array(4);
    ellipticState(Math.PI, 1, 0.6, 1, out);
    expect(Math.abs(out[0]! + 1.6)).toBeLessThan(1e-15);
    expect(Math.abs(out[1]!)).toBeLessThan(1e-15);
  });
});
