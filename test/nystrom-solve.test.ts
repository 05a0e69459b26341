// The Runge-Kutta-Nystrom pairs as they step: against analytic solutions, at equal steps for their
// order, both generated forms bit for bit, and the pairing rules for problems that are not in
// second-order form.
import { describe, expect, it } from 'vitest';
import { findMethod, findProblem } from '../src/index.js';
import { InputError } from '../src/core/errors.js';
import type { Problem } from '../src/core/types.js';
import { solveWithStep } from '../src/methods/explicit/embedded.js';
import {
  DORMAND_EL_MIKKAWY_PRINCE_1210,
  DORMAND_EL_MIKKAWY_PRINCE_86,
  nystromFsal,
  nystromSource,
  type NystromPair,
} from '../src/methods/explicit/nystrom/index.js';
import type { StageKernel } from '../src/methods/explicit/tableau.js';
import { planSweep } from '../src/sweep/plan.js';
import { catalogue } from '../problems/index.js';
import { makeProblem } from './methods-explicit-helpers.js';

const PAIRS = [DORMAND_EL_MIKKAWY_PRINCE_86, DORMAND_EL_MIKKAWY_PRINCE_1210] as const;
const OPTS = { maxSteps: 1_000_000 };

/** y'' = 6 y^2, y(0) = 1, y'(0) = -2: y = 1/(1 + t)^2 (substitution; derivation by hand). */
function inverseSquare(tEnd: number): Problem {
  return makeProblem({
    id: 'inverse-square',
    y0: [1, -2],
    tEnd,
    f: (_t, y, dy) => {
      dy[0] = y[1]!;
      dy[1] = 6 * y[0]! * y[0]!;
    },
    exact: (t, out) => {
      out[0] = 1 / (1 + t) ** 2;
      out[1] = -2 / (1 + t) ** 3;
    },
    separable: { positions: [0], velocities: [1], secondOrder: true },
  });
}

function maxError(p: Problem, y: Float64Array): number {
  const ex = new Float64Array(p.dimension);
  p.reference.kind === 'exact' && p.reference.exact!(p.tEnd, ex);
  let e = 0;
  for (let i = 0; i < p.dimension; i++) e = Math.max(e, Math.abs(y[i]! - ex[i]!));
  return e;
}

describe.each(PAIRS.map((p) => [p.id, p] as const))('%s', (id, pair) => {
  const method = findMethod(id);

  it('is registered with its orders and needs the second-order form', () => {
    expect(method.order).toBe(pair.order);
    expect(method.embeddedOrder).toBe(pair.embeddedOrder);
    expect(method.needsSecondOrder).toBe(true);
    expect(method.family).toBe('embedded-explicit');
  });

  it('equal steps: the velocity error is C h^p exactly on q\'\' = (p+1) t^p', () => {
    // A pair of order p integrates every g of degree < p exactly (sum b'_i c_i^k = 1/(k+1), k < p,
    // HNW I, sec. II.14), so each step's velocity error is the same constant and the global one
    // is C h^p (the quadrature argument of the Runge-Kutta pairs' test, derivation by hand).
    const p = pair.order;
    const form = makeProblem({
      id: 'power', y0: [0, 0], tEnd: 1, f: (t, y, dy) => void ((dy[0] = y[1]!), (dy[1] = (p + 1) * t ** p)),
      separable: { positions: [0], velocities: [1], secondOrder: true },
    });
    const at = (steps: number) => {
      // Equal steps through the adaptive loop: a tolerance no step can fail, and the step capped.
      const h = 1 / steps;
      const r = method.solve(form, { rtol: 1e6, atol: 1e6 }, { ...OPTS, initialStep: h, maxStep: h });
      expect(r.status).toBe('ok');
      expect(r.counts.rejected).toBe(0);
      expect(r.counts.accepted).toBe(steps);
      return Math.abs(r.yFinal[1]! - 1);
    };
    // Steps 1, 2, 4 keep the smallest error above 1e-14 (measured 1.4e-14 for the 12(10) pair).
    const errors = [1, 2, 4].map(at);
    for (const e of errors) expect(e).toBeGreaterThan(1e-14);
    expect(Math.abs(Math.log2(errors[0]! / errors[1]!) - p)).toBeLessThan(0.02);
    expect(Math.abs(Math.log2(errors[1]! / errors[2]!) - p)).toBeLessThan(0.05);
  });

  it('equal steps on y\'\' = 6 y^2: the error falls at least like h^(p-2) before rounding', () => {
    const problem = inverseSquare(3);
    const at = (steps: number) => {
      const h = 3 / steps;
      return maxError(problem, method.solve(problem, { rtol: 1e6, atol: 1e6 }, { ...OPTS, initialStep: h, maxStep: h }).yFinal);
    };
    // Measured slopes 6.9 and 7.7 (8(6), steps 8-32) and 9.4 and 10.9 (12(10), steps 4-16): the
    // 12th-order pair reaches its asymptotic rate only near rounding.
    const errors = (pair.order === 8 ? [8, 16, 32] : [4, 8, 16]).map(at);
    expect(errors[2]!).toBeGreaterThan(1e-13);
    expect(Math.log2(errors[1]! / errors[2]!)).toBeGreaterThan(pair.order - 1.2);
  });

  it('kepler-eccentric: final error against Kepler\'s equation shrinks with the tolerance', () => {
    const p = findProblem('kepler-eccentric');
    const errors = [1e-6, 1e-9, 1e-12].map((rtol) => {
      const r = method.solve(p, { rtol, atol: rtol }, OPTS);
      expect(r.status).toBe('ok');
      return maxError(p, r.yFinal);
    });
    expect(errors[1]!).toBeLessThan(errors[0]! / 10);
    expect(errors[2]!).toBeLessThan(errors[1]! / 10);
    // 10 orbits at rtol 1e-12: within 1e-9 of the analytic solution (measured 2e-11 and 6e-12).
    expect(errors[2]!).toBeLessThan(1e-9);
  });

  it('counts: FSAL pairs cost s - 1 evaluations per attempt, others s, plus the start', () => {
    const p = findProblem('kepler-eccentric');
    const r = method.solve(p, { rtol: 1e-9, atol: 1e-9 }, OPTS);
    const s = pair.c.length;
    const attempts = r.counts.accepted + r.counts.rejected;
    // One evaluation at t0 and one for the starting step; a non-FSAL pair pays its first stage
    // again after every accepted step (not after a rejected one: that stage is still valid).
    const perAttempt = s - 1;
    const extra = nystromFsal(pair) ? 0 : r.counts.accepted - 1;
    expect(r.counts.nfev).toBe(2 + perAttempt * attempts + extra);
  });

  it('an acceleration that turns NaN gives status diverged, stopping near t = 0.5, state finite', () => {
    const p = makeProblem({
      id: 'nan-after-half',
      y0: [1, 0],
      tEnd: 1,
      f: (t, y, dy) => void ((dy[0] = y[1]!), (dy[1] = t > 0.5 ? NaN : -y[0]!)),
      separable: { positions: [0], velocities: [1], secondOrder: true },
    });
    const r = method.solve(p, { rtol: 1e-6, atol: 1e-6 }, OPTS);
    expect(r.status).toBe('diverged');
    expect(r.tFinal).toBeGreaterThan(0.49);
    expect(r.tFinal).toBeLessThanOrEqual(0.5);
    expect(Array.from(r.yFinal).every(Number.isFinite)).toBe(true);
  });

  it('written out and looped give the same steps and the same bits', () => {
    for (const pid of ['kepler-eccentric', 'tethered-pair']) {
      const p = findProblem(pid);
      const split = p.separable!;
      const looped = new Function('P', 'V', nystromSource(pair))(Int32Array.from(split.positions), Int32Array.from(split.velocities)) as StageKernel;
      const shape = { stages: pair.c.length, fsal: nystromFsal(pair), order: pair.order, controlOrder: pair.embeddedOrder };
      const setting = { rtol: 1e-9, atol: 1e-9 };
      const a = method.solve(p, setting, OPTS);
      const b = solveWithStep(shape, id, p, setting, OPTS, () => looped);
      expect(b.counts).toEqual(a.counts);
      expect(Array.from(b.yFinal)).toEqual(Array.from(a.yFinal));
    }
  });
});

describe('pairing with problems', () => {
  const rkn = findMethod('dormand-el-mikkawy-prince-rkn86');

  it('refuses a problem without the second-order form, naming the field', () => {
    const p = makeProblem({ id: 'no-form', y0: [1, 0], tEnd: 1, f: (_t, y, dy) => void ((dy[0] = y[1]!), (dy[1] = -y[0]!)), separable: { positions: [0], velocities: [1] } });
    expect(() => rkn.solve(p, { rtol: 1e-6, atol: 1e-6 }, OPTS)).toThrow(InputError);
    expect(() => rkn.solve(p, { rtol: 1e-6, atol: 1e-6 }, OPTS)).toThrow(/separable\.secondOrder/);
  });

  it('the plan leaves it out of problems without the form, even when named, and says why', () => {
    const plan = planSweep({
      problems: ['van-der-pol', 'arenstorf-orbit', 'kepler-eccentric'].map((id) => findProblem(id)),
      methods: [rkn],
      tolerances: [1e-6],
      steps: undefined,
      methodsNamed: true,
    });
    expect(plan.runs.map((r) => r.problem)).toEqual(['kepler-eccentric']);
    const why = Object.fromEntries(plan.skipped.map((s) => [s.problem, s.reason]));
    expect(why['arenstorf-orbit']).toMatch(/needs a second-order problem.*Coriolis/);
    expect(why['van-der-pol']).toMatch(/needs a second-order problem/);
  });

  it('every catalogue problem that declares the form really has q\' = v', () => {
    // Checked at a perturbed initial state: f's position rows equal the paired velocities.
    const declared = catalogue.filter((p) => p.separable?.secondOrder);
    expect(declared.map((p) => p.id).sort()).toEqual(
      ['eclipse-circular-orbit', 'harmonic-oscillator', 'kepler-circular', 'kepler-eccentric', 'leo-j2', 'tethered-pair'],
    );
    for (const p of declared) {
      const split = p.separable!;
      const y = Float64Array.from(p.y0, (v, i) => v * (1 + 1e-3 * (i + 1)) + 1e-3);
      const dy = new Float64Array(p.dimension);
      p.f(p.t0, y, dy);
      split.positions.forEach((pos, k) => expect(dy[pos]).toBe(y[split.velocities[k]!]));
    }
  });
});

describe('a pair with a row longer than its stage is refused', () => {
  it('names the row', async () => {
    const { nystromMethod } = await import('../src/methods/explicit/nystrom/index.js');
    const bad: NystromPair = { ...DORMAND_EL_MIKKAWY_PRINCE_86, id: 'bad-pair', a: [[1], ...DORMAND_EL_MIKKAWY_PRINCE_86.a.slice(1)] };
    expect(() => nystromMethod(bad)).toThrow(/row 0 of a has 1 entries/);
  });
});

describe('stepgauge list', () => {
  it('names the second-order requirement and keeps the columns aligned for long ids', async () => {
    const { runCli } = await import('./helpers/cli.js');
    const r = await runCli(['list']);
    expect(r.code).toBe(0);
    const lines = r.stdout.split('\n');
    const rkn = lines.find((l) => l.trim().startsWith('dormand-el-mikkawy-prince-rkn1210'))!;
    expect(rkn).toMatch(/embedded-explicit\s+order 12\s+Dormand-El-Mikkawy-Prince RKN 12\(10\); second-order problems only \(q' = v\)/);
    const verlet = lines.find((l) => l.trim().startsWith('stormer-verlet '))!;
    expect(verlet).toMatch(/separable problems only/);
    // The family column starts at the same place on every method line.
    expect(rkn.indexOf('embedded-explicit')).toBe(lines.find((l) => l.trim().startsWith('verner-87 '))!.indexOf('embedded-explicit'));
  });
});
