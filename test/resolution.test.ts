// Every reference value carries a resolution, and every error figure is compared with it at its
// own point and in its own units.
import { describe, expect, it } from 'vitest';
import { findMethod } from '../src/methods/registry.js';
import { measureRun } from '../src/measure/run-one.js';
import { lastDigitExponent, tabulatedHalfUnit } from '../src/measure/resolution.js';
import { robertson } from '../problems/robertson.js';
import { linearOscillatorChain } from '../problems/linear-oscillator-chain.js';
import type { Problem } from '../src/core/types.js';

describe('published values: half a unit in the last digit given', () => {
  it('reads the digits a value is written with, or fewer when the source trusts fewer', () => {
    // Hairer and Wanner, Solving ODEs II, sec. IV.1: y2(40) = 0.9185534764e-5 (10 digits printed).
    expect(lastDigitExponent(0.9185534764e-5)).toBe(-15);
    expect(tabulatedHalfUnit(0.9185534764e-5, undefined, 1)).toBeCloseTo(0.5e-15, 30);
    // Declared 6 digits: half a unit in the 6th digit.
    expect(tabulatedHalfUnit(0.9185534764e-5, 6, 1)).toBeCloseTo(0.5e-11, 26);
  });
});

describe('Robertson at t = 40 (published to 10 digits, truncated)', () => {
  const rodas4 = findMethod('hairer-wanner-rodas4')!;
  const setting = { rtol: 1e-10, atol: 1e-10 * 1e-12 };

  it('rodas4 at rtol 1e-10 landing on t = 40: the error there is flagged, not reported as real', () => {
    const landing: Problem = { ...robertson, landOnCheckTimes: true };
    const run = measureRun(landing, rodas4, setting, { maxSteps: 1e6 });
    expect(run.status).toBe('ok');
    // The error at t = 40 is the table's (about 1.6e-10 relative), within 10x of half a unit in
    // the last printed digit of the component where it is largest (y3 = 0.2841637457:
    // 0.5e-10 / 0.2841637457 = 1.76e-10).
    expect(run.error.outputs).toBeGreaterThan(1e-10);
    expect(run.error.outputs).toBeLessThan(2e-10);
    expect(run.resolution!.outputs).toBeCloseTo(0.5e-10 / 0.2841637457, 20);
    expect(run.unresolved).toContain('outputs');
    expect(run.unresolved).toContain('max');
  });

  it('with its own steps, the value at t = 40 comes from a stated interpolant and is its own figure', () => {
    const run = measureRun(robertson, rodas4, setting, { maxSteps: 1e6 });
    expect(run.landing).toBe('own-steps');
    expect(run.outputInterpolant).toMatch(/cubic Hermite/);
    expect(run.error.outputs).not.toBeNull();
  });
});

describe('the verdict does not depend on units', () => {
  // x'' = -x in km (A) or in metres (B), error measured on the position output in metres. The
  // published value at t = 10 is cos(10) (analytic) written to 8 digits in each unit.
  const T = 10;
  function oscillator(scale: number): Problem {
    const yEnd = [Number((scale * Math.cos(T)).toPrecision(8)), Number((-scale * Math.sin(T)).toPrecision(8))];
    return {
      id: `osc-${scale}`,
      title: 'oscillator',
      source: 'analytic: x = cos t',
      dimension: 2,
      t0: 0,
      tEnd: T,
      y0: [scale, 0],
      f: (_t, y, dy) => {
        dy[0] = y[1]!;
        dy[1] = -y[0]!;
      },
      stiff: false,
      invariants: [],
      errorScale: { kind: 'absolute' },
      reference: { kind: 'published', digits: 8, points: [{ t: T, y: yEnd }] },
      checkTimes: [],
      outputs: { names: ['x_m'], fn: (_t, y, out) => void (out[0] = (y[0]! * 1000) / scale) },
      errorOn: 'outputs',
      definition: `osc ${scale}`,
    };
  }
  it('km and metres give the same flag at every step count (rk4)', () => {
    const rk4 = findMethod('rk4')!;
    const km = oscillator(1);
    const m = oscillator(1000);
    let flagged = 0;
    for (const steps of [20, 40, 80, 160, 320, 640]) {
      const a = measureRun(km, rk4, { steps }, { maxSteps: 1e6 });
      const b = measureRun(m, rk4, { steps }, { maxSteps: 1e6 });
      expect(a.errorBelowReference === true).toBe(b.errorBelowReference === true);
      expect(a.error.final! / b.error.final!).toBeCloseTo(1, 4);
      if (a.errorBelowReference) flagged++;
    }
    // The ladder crosses the resolution (0.5e-7 km = 0.05 mm), so both verdicts occur.
    expect(flagged).toBeGreaterThan(0);
    expect(flagged).toBeLessThan(6);
  });
});

describe('an exact reference computed with a matrix exponential has a floor', () => {
  it('linear-oscillator-chain: errors near 4e-13 of the state are flagged', () => {
    const dop853 = findMethod('dormand-prince-853')!;
    const run = measureRun(linearOscillatorChain, dop853, { rtol: 1e-14, atol: 1e-14 }, { maxSteps: 1e7 });
    expect(run.resolution!.final).toBeGreaterThan(1e-13);
    expect(run.unresolved).toContain('final');
  });
});
