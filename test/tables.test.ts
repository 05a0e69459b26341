// One-dimensional tables: each interpolation against its defining property, the exact slope
// against centred differences, Fritsch-Carlson monotonicity, and the drag problem's atmosphere and
// decay rate against the textbook formula.
import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import odex from 'odex';
import { makeTable, tableProblem } from '../src/problems/tables/interpolant.js';
import { findProblem } from '../problems/index.js';

describe('interpolants', () => {
  it('linear reproduces a line and log-linear an exponential, inside and beyond the breakpoints', () => {
    const xs = [0, 1, 2.5, 4];
    const lin = makeTable(xs, xs.map((x) => 3 - 2 * x), 'linear');
    const log = makeTable(xs, xs.map((x) => 5 * Math.exp(-0.7 * x)), 'log-linear');
    for (const x of [-1, 0, 0.3, 1, 2, 3.9, 4, 6]) {
      expect(lin.value(x)).toBeCloseTo(3 - 2 * x, 13);
      expect(lin.slope(x)).toBeCloseTo(-2, 13);
      expect(log.value(x) / (5 * Math.exp(-0.7 * x))).toBeCloseTo(1, 13);
      expect(log.slope(x) / (-0.7 * 5 * Math.exp(-0.7 * x))).toBeCloseTo(1, 12);
    }
  });

  it('monotone cubic passes through the data, keeps it monotone, and has a continuous slope (Fritsch and Carlson 1980)', () => {
    // Data of Fritsch and Carlson's example (RPN 14), values from memory; any increasing data will do.
    const x = [7.99, 8.09, 8.19, 8.7, 9.2, 10, 12, 15, 20];
    const y = [0, 2.76429e-5, 4.37498e-2, 0.169183, 0.469428, 0.94374, 0.998636, 0.999919, 0.999994];
    const t = makeTable(x, y, 'monotone-cubic');
    x.forEach((xi, k) => expect(t.value(xi)).toBeCloseTo(y[k]!, 14));
    let last = -Infinity;
    for (let v = 7.99; v <= 20; v += 0.001) {
      const now = t.value(v);
      expect(now).toBeGreaterThanOrEqual(last - 1e-15);
      last = now;
    }
    // Slope continuous at the breakpoints (C1): left and right limits agree.
    for (const xi of x.slice(1, -1)) expect(t.slope(xi - 1e-9)).toBeCloseTo(t.slope(xi + 1e-9), 5);
  });

  it('any increasing data gives an increasing interpolant (property)', () => {
    fc.assert(
      fc.property(fc.array(fc.tuple(fc.double({ min: 0.01, max: 10, noNaN: true }), fc.double({ min: 0, max: 10, noNaN: true })), { minLength: 2, maxLength: 12 }), (steps) => {
        const x: number[] = [];
        const y: number[] = [];
        let xa = 0;
        let ya = 0;
        for (const [dx, dy] of steps) {
          x.push((xa += dx));
          y.push((ya += dy));
        }
        const t = makeTable(x, y, 'monotone-cubic');
        let last = -Infinity;
        for (let k = 0; k <= 400; k++) {
          const v = x[0]! + ((x.at(-1)! - x[0]!) * k) / 400;
          const now = t.value(v);
          if (now < last - 1e-9 * Math.max(1, Math.abs(now))) return false;
          last = now;
        }
        return true;
      }),
      { seed: 28, numRuns: 200 },
    );
  });

  it('slopes are exact for the interpolant (centred differences away from breakpoints)', () => {
    const x = [0, 0.5, 1.5, 2, 3.5];
    const y = [1, 0.4, 0.9, 3, 2.2];
    for (const kind of ['linear', 'monotone-cubic'] as const) {
      const t = makeTable(x, y, kind);
      for (const v of [0.2, 0.9, 1.7, 2.8, 3.3]) {
        const h = 1e-6;
        expect(t.slope(v)).toBeCloseTo((t.value(v + h) - t.value(v - h)) / (2 * h), 7);
      }
    }
  });

  it('refuses bad data with the reason', () => {
    expect(tableProblem([0, 1], [1], 'linear')).toMatch(/x has 2 values and y 1/);
    expect(tableProblem([0, 0], [1, 2], 'linear')).toMatch(/increase strictly/);
    expect(tableProblem([0, 1], [1, 0], 'log-linear')).toMatch(/y > 0/);
  });
});

describe('decaying-orbit-drag', () => {
  const p = findProblem('decaying-orbit-drag')!;
  it('the semi-major axis falls at rho B sqrt(GM a) over the first orbit (within 5%), by odex', () => {
    // da/dt = -rho B sqrt(GM a) for a near-circular orbit (e.g. Vallado, 4th ed., ch. 9; from memory).
    const gm = 3.986004418e14;
    const sma = (y: ArrayLike<number>) => 1 / (2 / Math.hypot(y[0]!, y[1]!, y[2]!) - (y[3]! ** 2 + y[4]! ** 2 + y[5]! ** 2) / gm);
    const a0 = sma(p.y0);
    const period = 2 * Math.PI * Math.sqrt(a0 ** 3 / gm);
    const solver = new odex.Solver(6);
    solver.relativeTolerance = solver.absoluteTolerance = 1e-12;
    solver.maxSteps = 1e6;
    const dy = new Float64Array(6);
    const res = solver.solve((t: number, y: number[]) => (p.f(t, Float64Array.from(y), dy), Array.from(dy)), 0, [...p.y0], period);
    // Density at 210 km, log-linear between the 200 and 250 km rows of the table.
    const rho = 2.789e-10 * Math.pow(7.248e-11 / 2.789e-10, 10 / 50);
    const expected = -rho * 0.022 * Math.sqrt(gm * a0) * period;
    expect((sma(res.y) - a0) / expected).toBeGreaterThan(0.95);
    expect((sma(res.y) - a0) / expected).toBeLessThan(1.05);
  });
});
