// Work buffers kept between solves (src/methods/work-lease.ts), for the explicit engines and the
// implicit steppers: a kept lease must give bitwise the results of fresh buffers, a solve inside
// a solve must get its own lease, and a solve whose model throws must release it. Properties of
// the engines, no outside values needed.
import { describe, expect, it } from 'vitest';
import type { Method, Problem, SolveResult } from '../src/core/types.js';
import { explicitMethods } from '../src/methods/explicit/index.js';
import { implicitMethods } from '../src/methods/implicit/index.js';
import { WorkLease, leaseFor, withLease } from '../src/methods/work-lease.js';
import { harmonicOscillator } from '../problems/harmonic-oscillator.js';
import { keplerEccentric } from '../problems/kepler-eccentric.js';
import { robertson } from '../problems/robertson.js';
import { vanDerPolStiff } from '../problems/van-der-pol-stiff.js';

const OPTS = { maxSteps: 100_000 };

function solveOnce(m: Method, p: Problem): SolveResult {
  if (m.family !== 'implicit') return m.solve(p, m.adaptive ? { rtol: 1e-9, atol: 1e-9 } : { steps: 4000 }, { ...OPTS, checkTimes: p.checkTimes });
  return m.solve(p, m.adaptive ? { rtol: 1e-6, atol: 1e-6 * 1e-6 } : { steps: 400 }, OPTS);
}

describe('work leases', () => {
  it('hands out distinct zeroed arrays, the same ones again after a release', () => {
    const owner = {};
    const a = leaseFor(owner, 3);
    const x = a.float64(3);
    const y = a.float64(9);
    const p = a.int32(3);
    x.fill(5);
    p.fill(2);
    expect(y).not.toBe(x);
    const busy = leaseFor(owner, 3);
    expect(busy).not.toBe(a);
    busy.release();
    a.release();
    const again = leaseFor(owner, 3);
    expect(again).toBe(a);
    expect(again.float64(3)).toBe(x);
    expect([...x]).toEqual([0, 0, 0]);
    expect(again.float64(9)).toBe(y);
    expect([...again.int32(3)]).toEqual([0, 0, 0]);
    expect([...again.copyOf([1, 2])]).toEqual([1, 2]);
    again.release();
    expect(new WorkLease().float64(2)).toHaveLength(2);
  });

  it('keeps row views with their matrix', () => {
    const owner = {};
    const a = leaseFor(owner, 2);
    const K = a.float64(6);
    const rows = a.rows(K, 3, 2);
    expect(rows.map((r) => [r.byteOffset, r.length])).toEqual([[0, 2], [16, 2], [32, 2]]);
    expect(rows[2]!.buffer).toBe(K.buffer);
    a.release();
    const b = leaseFor(owner, 2);
    expect(b.rows(b.float64(6), 3, 2)).toBe(rows);
    b.release();
    const c = leaseFor(owner, 2);
    const other = c.float64(8);
    expect(c.rows(other, 4, 2)).not.toBe(rows);
    c.release();
  });

  it('releases the lease when the solve using it throws', () => {
    const owner = {};
    let used: WorkLease | null = null;
    expect(() =>
      withLease(owner, 2, (lease) => {
        used = lease;
        throw new Error('model failed');
      }),
    ).toThrow('model failed');
    const next = leaseFor(owner, 2);
    expect(next).toBe(used);
    next.release();
  });

  const reuseCases = [
    ...explicitMethods.map((m) => [m, [keplerEccentric, harmonicOscillator]] as const),
    ...implicitMethods.map((m) => [m, [robertson, vanDerPolStiff]] as const),
  ];
  for (const [m, problems] of reuseCases) {
    it(`${m.id}: a second solve on kept buffers is bitwise the first`, () => {
      for (const p of problems) {
        const first = solveOnce(m, p);
        const again = solveOnce(m, p);
        expect(again.status).toBe(first.status);
        expect(again.counts).toEqual(first.counts);
        expect([...again.yFinal]).toEqual([...first.yFinal]);
      }
    });
  }

  it('gives a solve inside a solve its own buffers, and takes them back from a throwing model', () => {
    const cases = [...explicitMethods.map((m) => [m, harmonicOscillator] as const), ...implicitMethods.map((m) => [m, vanDerPolStiff] as const)];
    for (const [m, problem] of cases) {
      const alone = solveOnce(m, problem);
      let inner: SolveResult | null = null;
      const nesting: Problem = {
        ...problem,
        f: (t, y, dy) => {
          if (inner === null) inner = solveOnce(m, problem);
          problem.f(t, y, dy);
        },
      };
      const outer = solveOnce(m, nesting);
      expect([...outer.yFinal]).toEqual([...alone.yFinal]);
      expect([...inner!.yFinal]).toEqual([...alone.yFinal]);
      let calls = 0;
      const throwing: Problem = {
        ...problem,
        f: (t, y, dy) => {
          if (++calls === 40) throw new Error('model failed');
          problem.f(t, y, dy);
        },
      };
      expect(() => solveOnce(m, throwing)).toThrow('model failed');
      const after = solveOnce(m, problem);
      expect([...after.yFinal]).toEqual([...alone.yFinal]);
      expect(after.counts).toEqual(alone.counts);
    }
  });
});
