// Property: trapezoidal-bdf2 decides its Newton test and its step factor without the general
// power routine (dampedTimesWithin in src/methods/implicit/common.ts, shared with bdf-variable,
// and acceptedFactor in tr-bdf2.ts), and
// must decide exactly as the direct formulas do, bit for bit, so that no count moves. The
// reference here is the direct floating-point expression each helper replaces, written out as
// the method stated it before (Newton: RADAU5's max(eta, eps)^0.8 * dy <= tol, Hairer & Wanner,
// Solving ODEs II, sec. IV.8; step: the standard controller with a hold band). Inputs are drawn
// both at random and right at the thresholds, where a shortcut would go wrong first.
import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { dampedTimesWithin } from '../src/methods/implicit/common.js';
import { acceptedFactor } from '../src/methods/implicit/tr-bdf2.js';

const EPS = 2.220446049250313e-16;
const SAFE = 0.9;
const MAX_FACTOR = 5;
const HOLD_RATIO = 1.2;

function directNewtonTest(eta: number, dy: number, tol: number): boolean {
  return Math.max(eta, EPS) ** 0.8 * dy <= tol;
}

function directFactor(err: number, afterReject: boolean): number {
  let factor = Math.min(MAX_FACTOR, SAFE * Math.max(err, 1e-10) ** (-1 / 3));
  if (afterReject) factor = Math.min(factor, 1);
  if (factor >= 1 && factor < HOLD_RATIO) factor = 1;
  return factor;
}

/** Positive doubles spread over many decades. */
const positive = (minExp: number, maxExp: number) =>
  fc.tuple(fc.double({ min: 1, max: 10, noNaN: true }), fc.integer({ min: minExp, max: maxExp })).map(([m, e]) => m * 10 ** e);

/**
 * A double up to 20,000 ulps from x on either side: across the shortcuts' band (1e-12 relative,
 * about 4,500 ulps) and past its edges, where a shortcut starts to decide alone.
 */
const ULPS = 20000;
const near = (x: number) =>
  fc.integer({ min: -ULPS, max: ULPS }).map((k) => {
    const buf = new Float64Array([x]);
    const bits = new BigInt64Array(buf.buffer);
    bits[0] = bits[0]! + BigInt(k);
    return buf[0]!;
  });

describe('trapezoidal-bdf2: power-free decisions equal the direct formulas', () => {
  it('Newton test: random contraction estimates, increments and tolerances', () => {
    fc.assert(
      fc.property(positive(-20, 20), positive(-320, 300), positive(-3, 3), (eta, dy, tol) => {
        expect(dampedTimesWithin(Math.max(eta, EPS), dy, tol)).toBe(directNewtonTest(eta, dy, tol));
      }),
      { numRuns: 20000 },
    );
  });

  it('Newton test: increments near the threshold tol / eta^0.8', () => {
    fc.assert(
      fc.property(positive(-16, 10), positive(-3, 3), fc.integer({ min: -ULPS, max: ULPS }), (eta, tol, k) => {
        const base = Math.max(eta, EPS);
        const edge = tol / base ** 0.8;
        const buf = new Float64Array([edge]);
        const bits = new BigInt64Array(buf.buffer);
        bits[0] = bits[0]! + BigInt(k);
        const dy = buf[0]!;
        expect(dampedTimesWithin(base, dy, tol)).toBe(directNewtonTest(eta, dy, tol));
      }),
      { numRuns: 20000 },
    );
  });

  it('step factor: random errors, with and without a rejection before', () => {
    fc.assert(
      fc.property(positive(-14, 1), fc.boolean(), (err, afterReject) => {
        expect(acceptedFactor(err, afterReject)).toBe(directFactor(err, afterReject));
      }),
      { numRuns: 20000 },
    );
  });

  it('step factor: errors near each threshold', () => {
    // The errors at which SAFE err^(-1/3) crosses 1, HOLD_RATIO and MAX_FACTOR, located by the
    // direct formula itself, then probed on both sides.
    const thresholds = [SAFE ** 3, (SAFE / HOLD_RATIO) ** 3, (SAFE / MAX_FACTOR) ** 3, 1e-10];
    for (const x of thresholds) {
      fc.assert(
        fc.property(near(x), fc.boolean(), (err, afterReject) => {
          expect(acceptedFactor(err, afterReject)).toBe(directFactor(err, afterReject));
        }),
        { numRuns: 2000 },
      );
    }
  });
});
