// Work buffers kept between solves (src/methods/explicit/workspace.ts): a lent set must give
// bitwise the results of a fresh one, a solve inside a solve must get its own set, and a solve
// that throws must give its set back. Properties of the engine, no outside values needed.
import { describe, expect, it } from 'vitest';
import type { Problem } from '../src/core/types.js';
import { compileTableau, dormandPrince54, rk4, solveEmbedded } from '../src/methods/explicit/index.js';
import { DORMAND_PRINCE_54 } from '../src/methods/explicit/tableaus/dormand-prince-54.js';
import { borrowWork, returnWork } from '../src/methods/explicit/workspace.js';
import { harmonicOscillator } from '../problems/harmonic-oscillator.js';
import { keplerEccentric } from '../problems/kepler-eccentric.js';

const OPTS = { maxSteps: 1e6 };
const TIGHT = { rtol: 1e-9, atol: 1e-9 };

describe('explicit work buffers', () => {
  it('lends one set at a time, zeroed, with y0 in place', () => {
    const tab = compileTableau(DORMAND_PRINCE_54);
    const a = borrowWork(tab, 3, [1, 2, 3]);
    a.K.fill(7);
    a.yNew.fill(7);
    const b = borrowWork(tab, 3, [4, 5, 6]);
    expect(b).not.toBe(a);
    returnWork(b);
    returnWork(a);
    const c = borrowWork(tab, 3, [9, 8, 7]);
    expect(c).toBe(a);
    expect([...c.y]).toEqual([9, 8, 7]);
    expect(c.K.every((v) => v === 0)).toBe(true);
    expect(c.yNew.every((v) => v === 0)).toBe(true);
    expect(c.kRow[1]!.buffer).toBe(c.K.buffer);
    returnWork(c);
  });

  it('gives bitwise the same result on a reused set', () => {
    for (const [m, setting] of [[dormandPrince54, TIGHT], [rk4, { steps: 4000 }]] as const) {
      const first = m.solve(keplerEccentric, setting, { ...OPTS, checkTimes: keplerEccentric.checkTimes });
      const again = m.solve(keplerEccentric, setting, { ...OPTS, checkTimes: keplerEccentric.checkTimes });
      expect(again.counts).toEqual(first.counts);
      expect([...again.yFinal]).toEqual([...first.yFinal]);
    }
  });

  it('gives a solve started inside a solve its own set', () => {
    const alone = dormandPrince54.solve(harmonicOscillator, TIGHT, OPTS);
    let inner: ReturnType<typeof dormandPrince54.solve> | null = null;
    const nesting: Problem = {
      ...harmonicOscillator,
      f: (t, y, dy) => {
        // The model itself integrates (once), on the same method and state size.
        if (inner === null) inner = dormandPrince54.solve(harmonicOscillator, TIGHT, OPTS);
        harmonicOscillator.f(t, y, dy);
      },
    };
    const outer = dormandPrince54.solve(nesting, TIGHT, OPTS);
    expect([...outer.yFinal]).toEqual([...alone.yFinal]);
    expect(outer.counts).toEqual(alone.counts);
    expect([...inner!.yFinal]).toEqual([...alone.yFinal]);
  });

  it('gets its set back from a solve whose model throws', () => {
    let calls = 0;
    const throwing: Problem = {
      ...harmonicOscillator,
      f: (t, y, dy) => {
        if (++calls === 50) throw new Error('model failed');
        harmonicOscillator.f(t, y, dy);
      },
    };
    const tab = compileTableau(DORMAND_PRINCE_54);
    const n = throwing.dimension;
    const kept = borrowWork(tab, n, throwing.y0);
    returnWork(kept);
    expect(() => solveEmbedded(tab, 'dormand-prince-54', throwing, TIGHT, OPTS)).toThrow('model failed');
    const next = borrowWork(tab, n, throwing.y0);
    expect(next).toBe(kept);
    returnWork(next);
  });
});
