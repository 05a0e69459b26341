// dormand-prince-853 against an independent integrator from the registry: odex (a port of Hairer
// and Wanner's ODEX, Gragg-Bulirsch-Stoer extrapolation), on a planar Kepler orbit.
import odex from 'odex';
import { describe, expect, it } from 'vitest';
import { dormandPrince54, tableauMethodById } from '../src/methods/explicit/index.js';
import { kepler, maxAbsDiff } from './methods-explicit-helpers.js';

const dormandPrince853 = tableauMethodById('dormand-prince-853');

const E = 0.6;
const T = 4 * Math.PI; // two periods of the a = 1, mu = 1 orbit

function odexKepler(tol: number): number[] {
  const solver = new odex.Solver(4);
  solver.absoluteTolerance = tol;
  solver.relativeTolerance = tol;
  solver.maxSteps = 1_000_000;
  const f = (_x: number, y: number[]): number[] => {
    const r2 = y[0]! * y[0]! + y[1]! * y[1]!;
    const r3 = r2 * Math.sqrt(r2);
    return [y[2]!, y[3]!, -y[0]! / r3, -y[1]! / r3];
  };
  const res = solver.solve(f, 0, [1 - E, 0, 0, Math.sqrt((1 + E) / (1 - E))], T);
  expect(res.outcome).toBe(0); // odex Outcome.Converged
  return res.y;
}

describe('Kepler orbit e = 0.6 over two periods', () => {
  const p = kepler(E, T);
  it('dormand-prince-853 at rtol = atol = 1e-12 agrees with odex at 1e-12 to ~1e-9', () => {
    const ours = dormandPrince853.solve(p, { rtol: 1e-12, atol: 1e-12 }, { maxSteps: 1_000_000 });
    expect(ours.status).toBe('ok');
    const theirs = odexKepler(1e-12);
    expect(maxAbsDiff(ours.yFinal, theirs)).toBeLessThan(1e-9);
  });
  it('both return to the initial state after whole periods (exact: periodic orbit)', () => {
    const ours = dormandPrince853.solve(p, { rtol: 1e-12, atol: 1e-12 }, { maxSteps: 1_000_000 });
    expect(maxAbsDiff(ours.yFinal, p.y0)).toBeLessThan(1e-9);
    expect(maxAbsDiff(odexKepler(1e-12), p.y0)).toBeLessThan(1e-8);
    const dp5 = dormandPrince54.solve(p, { rtol: 1e-10, atol: 1e-10 }, { maxSteps: 1_000_000 });
    expect(maxAbsDiff(dp5.yFinal, p.y0)).toBeLessThan(1e-7);
  });
});
