// The generated (unrolled) step kernels must be the generic sweep written out: same steps, same
// counts, same state to rounding; and the written-out and looped forms of one kernel bitwise equal.
import { describe, expect, it } from 'vitest';
import type { Method, Problem } from '../src/core/types.js';
import { UNROLL_MAX_N, embeddedMethod, explicitTableaus, fixedStepMethod, tableauMethodById, unrolledSource } from '../src/methods/explicit/index.js';
import type { StageKernel, TableauData } from '../src/methods/explicit/tableau.js';
import { VERNER_87 } from '../src/methods/explicit/tableaus/verner-87.js';
import { keplerEccentric } from '../problems/kepler-eccentric.js';
import { exactAt, kepler, makeProblem, maxAbsDiff, oscillator, reachableTolerance } from './methods-explicit-helpers.js';

const OPTS = { maxSteps: 1_000_000 };

/** Every registered pair (with its generated kernel) and every fixed-step tableau. */
const withKernel: [Method, TableauData][] = explicitTableaus.filter((m) => m.tableau.bHat).map((m) => [tableauMethodById(m.id), m.tableau]);
const fixed: [Method, TableauData][] = explicitTableaus.filter((m) => !m.tableau.bHat).map((m) => [tableauMethodById(m.id), m.tableau]);
const verner87 = tableauMethodById('verner-87');

/** Three uncoupled Kepler orbits (12 states): above UNROLL_MAX_N, so the looped kernel runs. */
function keplerTriple(): Problem {
  const one = kepler(0.6, 2 * Math.PI);
  const y0 = [...one.y0, ...one.y0.map((v) => 0.9 * v), ...one.y0.map((v) => 1.1 * v)];
  const a = new Float64Array(4);
  const da = new Float64Array(4);
  return makeProblem({
    id: 'kepler-triple',
    y0,
    tEnd: 2 * Math.PI,
    f: (t, y, dy) => {
      for (let b = 0; b < 3; b++) {
        for (let i = 0; i < 4; i++) a[i] = y[4 * b + i]!;
        one.f(t, a, da);
        for (let i = 0; i < 4; i++) dy[4 * b + i] = da[i]!;
      }
    },
  });
}

const problems: [string, Problem, number][] = [
  ['oscillator (n=2, written out)', oscillator(5), 1e-9],
  ['kepler e=0.6 (n=4, written out)', kepler(0.6, 4 * Math.PI), 1e-10],
  ['three kepler orbits (n=12, looped)', keplerTriple(), 1e-9],
];

describe('generated step kernels agree with the generic engine', () => {
  it('the looped form is what runs above UNROLL_MAX_N', () => {
    expect(keplerTriple().dimension).toBeGreaterThan(UNROLL_MAX_N);
  });
  for (const [method, data] of withKernel) {
    const generic = embeddedMethod({ id: `${method.id}-generic`, name: 'generic', source: 'test' }, data);
    it.each(problems)(`${method.id}, %s: same counts and final state`, (_name, p, problemTol) => {
      const tol = reachableTolerance(method, problemTol);
      for (const controller of ['standard', 'pi'] as const) {
        const opts = { ...OPTS, controller, checkTimes: [0.3, 1.7] };
        const a = method.solve(p, { rtol: tol, atol: tol }, opts);
        const b = generic.solve(p, { rtol: tol, atol: tol }, opts);
        expect(a.status).toBe('ok');
        expect(a.counts).toEqual(b.counts);
        expect(a.tFinal).toBe(b.tFinal);
        // Rounding differs per step (h * sum vs a sum of h * a_ij terms) and Kepler orbits
        // amplify it (a phase error grows with time): measured up to 1.6e-12 here, against
        // truncation errors of order 1e-9 at these tolerances.
        expect(maxAbsDiff(a.yFinal, b.yFinal)).toBeLessThan(1e-11);
      }
    });
  }
});

describe('written-out and looped kernels are the same arithmetic', () => {
  const f = kepler(0.6, 1).f;
  it.each(withKernel.map(([m, d]) => [m.id, d] as const))('%s: bitwise equal step and error', (id, d) => {
    const n = 4;
    const s = d.c.length;
    const run = (kernel: StageKernel) => {
      const K = new Float64Array(s * n);
      const kRow = Array.from({ length: s }, (_, i) => K.subarray(i * n, (i + 1) * n));
      const y = Float64Array.of(0.4, 0.1, -0.2, 2);
      f(0, y, kRow[0]!);
      const io = Float64Array.of(0.5, 0.53, 0.03, 1e-9, 0, 0);
      const yNew = new Float64Array(n);
      kernel(f, io, y, yNew, new Float64Array(n), K, kRow, new Float64Array(n).fill(1e-9), n);
      return { yNew: Array.from(yNew), K: Array.from(K), err: io[4], bad: io[5] };
    };
    const looped = new Function(unrolledSource(d, id))() as StageKernel;
    const written = new Function(unrolledSource(d, id, n))() as StageKernel;
    const a = run(looped);
    expect(a.err).toBeGreaterThan(0);
    expect(run(written)).toEqual(a);
  });
});

describe('generated fixed-step kernels agree with the generic fixed-step engine', () => {
  for (const [method, data] of fixed) {
    const generic = fixedStepMethod({ id: `${method.id}-generic`, name: 'generic', source: 'test' }, data);
    it.each(problems)(`${method.id}, %s: same counts, bitwise equal final state`, (_name, p) => {
      // The sums are written in the generic engine's order, so the states agree exactly.
      const a = method.solve(p, { steps: 3000 }, OPTS);
      const b = generic.solve(p, { steps: 3000 }, OPTS);
      expect(a.status).toBe('ok');
      expect(a.counts).toEqual(b.counts);
      expect(a.tFinal).toBe(b.tFinal);
      expect(Array.from(a.yFinal)).toEqual(Array.from(b.yFinal));
    });
  }
});

describe('increment form (stages stored as k_i - k_1)', () => {
  // Verner's 8(7) pair in doubles: rounding its large cancelling weights to the nearest doubles
  // breaks the low-order conditions by ~1e-13, which left a global error floor on the eccentric
  // orbit; stepping with increments multiplies those rounding errors by O(h) differences.
  // Reference: the exact orbit from Kepler's equation (problems/kepler-eccentric.ts, e = 0.6, 10 periods).
  const p = keplerEccentric;
  const published = embeddedMethod({ id: 'verner-87-published', name: 'test', source: 'test' }, { ...VERNER_87, increments: false });
  it('verner-87 at rtol = atol = 1e-14 ends within 3e-11 of the exact orbit; stepped as published it does not', () => {
    const tol = { rtol: 1e-14, atol: 1e-14 };
    const incr = verner87.solve(p, tol, OPTS);
    const plain = published.solve(p, tol, OPTS);
    expect(maxAbsDiff(incr.yFinal, exactAt(p, p.tEnd))).toBeLessThan(3e-11); // measured 7e-12
    expect(maxAbsDiff(plain.yFinal, exactAt(p, p.tEnd))).toBeGreaterThan(1e-10); // measured 4e-10
  });
  it('both forms take the same steps at a moderate tolerance and agree to rounding', () => {
    const tol = { rtol: 1e-9, atol: 1e-9 };
    const incr = verner87.solve(p, tol, OPTS);
    const plain = published.solve(p, tol, OPTS);
    expect(incr.counts).toEqual(plain.counts);
    // Kepler orbits amplify per-step rounding into phase (measured 1e-9 apart), against a
    // truncation error near 1e-7 at this setting.
    expect(maxAbsDiff(incr.yFinal, plain.yFinal)).toBeLessThan(1e-8);
  });
});
