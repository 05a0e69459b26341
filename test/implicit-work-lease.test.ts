// Work buffers of the implicit steppers kept between solves (src/methods/implicit/work-lease.ts):
// a kept lease must give bitwise the results of fresh buffers, a solve inside a solve must get
// its own lease, and a solve whose model throws must release it. Properties of the engines, no
// outside values needed.
import { describe, expect, it } from 'vitest';
import type { Method, Problem, SolveResult } from '../src/core/types.js';
import { implicitMethods } from '../src/methods/implicit/index.js';
import { WorkLease, leaseFor, withLease } from '../src/methods/implicit/work-lease.js';
import { robertson } from '../problems/robertson.js';
import { vanDerPolStiff } from '../problems/van-der-pol-stiff.js';

const OPTS = { maxSteps: 100_000 };

function solveOnce(m: Method, p: Problem): SolveResult {
  return m.solve(p, m.adaptive ? { rtol: 1e-6, atol: 1e-6 * 1e-6 } : { steps: 400 }, OPTS);
}

describe('implicit work leases', () => {
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

  for (const m of implicitMethods) {
    it(`${m.id}: a second solve on kept buffers is bitwise the first`, () => {
      for (const p of [robertson, vanDerPolStiff]) {
        const first = solveOnce(m, p);
        const again = solveOnce(m, p);
        expect(again.status).toBe(first.status);
        expect(again.counts).toEqual(first.counts);
        expect([...again.yFinal]).toEqual([...first.yFinal]);
      }
    });
  }

  it('gives a solve inside a solve its own buffers, and takes them back from a throwing model', () => {
    for (const m of implicitMethods) {
      const alone = solveOnce(m, vanDerPolStiff);
      let inner: SolveResult | null = null;
      const nesting: Problem = {
        ...vanDerPolStiff,
        f: (t, y, dy) => {
          if (inner === null) inner = solveOnce(m, vanDerPolStiff);
          vanDerPolStiff.f(t, y, dy);
        },
      };
      const outer = solveOnce(m, nesting);
      expect([...outer.yFinal]).toEqual([...alone.yFinal]);
      expect([...inner!.yFinal]).toEqual([...alone.yFinal]);
      let calls = 0;
      const throwing: Problem = {
        ...vanDerPolStiff,
        f: (t, y, dy) => {
          if (++calls === 40) throw new Error('model failed');
          vanDerPolStiff.f(t, y, dy);
        },
      };
      expect(() => solveOnce(m, throwing)).toThrow('model failed');
      const after = solveOnce(m, vanDerPolStiff);
      expect([...after.yFinal]).toEqual([...alone.yFinal]);
      expect(after.counts).toEqual(alone.counts);
    }
  });
});
