// Behaviour of the explicit methods against analytic solutions and exact work-count identities.
import { describe, expect, it } from 'vitest';
import { InputError } from '../src/core/errors.js';
import type { Method, Problem } from '../src/core/types.js';
import { dormandPrince54, embeddedMethod, explicitMethods, explicitTableaus, symplecticCompositions, tableauMethodById } from '../src/methods/explicit/index.js';
import { DORMAND_PRINCE_54 } from '../src/methods/explicit/tableaus/dormand-prince-54.js';
import { decay, exactAt, firstSameAsLast, kepler, makeProblem, maxAbsDiff, oscillator, oscillatorEnergy, reachableTolerance } from './methods-explicit-helpers.js';

const [euler, rk4, bogackiShampine32, dormandPrince853] = ['euler', 'rk4', 'bogacki-shampine-32', 'dormand-prince-853'].map(tableauMethodById) as [Method, Method, Method, Method];
const byId = (id: string): Method => explicitMethods.find((m) => m.id === id)!;
const symplectic = explicitMethods.filter((m) => m.family === 'symplectic');

const OPTS = { maxSteps: 1_000_000 };
const adaptive = explicitMethods.filter((m) => m.adaptive);
const fixedStep = explicitMethods.filter((m) => !m.adaptive);

function finalError(m: Method, p: Problem, setting: Parameters<Method['solve']>[1]): number {
  const r = m.solve(p, setting, OPTS);
  expect(r.status).toBe('ok');
  expect(r.tFinal).toBe(p.tEnd);
  return maxAbsDiff(r.yFinal, exactAt(p, p.tEnd));
}

describe('method metadata', () => {
  it('every registered tableau becomes a method that states the order its coefficients have', () => {
    // The orders themselves are checked against the order conditions (methods-explicit-order-conditions).
    for (const rec of explicitTableaus) {
      const m = tableauMethodById(rec.id);
      expect(m.order).toBe(rec.tableau.order);
      expect(m.embeddedOrder).toBe(rec.tableau.embeddedOrder);
      expect(m.family).toBe(rec.tableau.bHat ? 'embedded-explicit' : 'fixed-step');
      expect(m.adaptive).toBe(rec.tableau.bHat !== undefined);
      expect(rec.id).toMatch(/^[a-z0-9]+(-[a-z0-9]+)*$/);
    }
    expect(new Set(explicitMethods.map((m) => m.id)).size).toBe(explicitMethods.length);
    for (const m of explicitMethods) {
      expect(m.stiff).toBe(false);
      expect(m.source.length).toBeGreaterThan(20);
      expect(m.needsSeparable ?? false).toBe(m.family === 'symplectic');
    }
    // Every registered composition becomes a symplectic method of its stated order (the orders
    // are checked by convergence below and by the weights' conditions here).
    expect(symplectic.map((m) => m.id)).toEqual(symplecticCompositions.map((r) => r.id));
    for (const rec of symplecticCompositions) {
      expect(byId(rec.id).order).toBe(rec.order);
      expect(rec.id).toMatch(/^[a-z0-9]+(-[a-z0-9]+)*$/);
    }
  });
  it.each(symplecticCompositions.map((r) => [r.id, r] as const))('%s: substep weights meet the composition order conditions', (_id, rec) => {
    const w = rec.weights;
    // Consistency: the substeps add up to the step (E. Hairer, C. Lubich, G. Wanner, Geometric
    // Numerical Integration, 2nd ed. 2006, Sect. II.4.1; from memory).
    expect(Math.abs(w.reduce((a, x) => a + x, 0) - 1)).toBeLessThan(1e-15);
    // Symmetric weights over the symmetric Stormer-Verlet step give a symmetric method, whose
    // order is even (same book, Sect. II.3 and V.1; from memory).
    expect([...w].reverse()).toEqual([...w]);
    expect(rec.order % 2).toBe(0);
    // Order 4 from a symmetric order-2 basic method needs sum w^3 = 0 (same book, Theorem II.4.1,
    // from memory; Yoshida 1990 eq. (4.5)-(4.6) for the triple jump).
    if (rec.order >= 4) expect(Math.abs(w.reduce((a, x) => a + x ** 3, 0))).toBeLessThan(1e-14);
  });
});

describe('harmonic oscillator q\' = p, p\' = -(2 pi)^2 q over [0, 20] (exact: cos, sin)', () => {
  const p = oscillator(20);
  it.each(adaptive.map((m) => [m.id, m] as const))('%s: error within 1000 tol at a middle tolerance, shrinking with tol', (_id, m) => {
    const [loose, middle, tight] = reachableTolerance(m, 1e-10) === 1e-10 ? [1e-5, 1e-8, 1e-10] : [1e-3, 1e-5, 1e-6];
    const eLoose = finalError(m, p, { rtol: loose, atol: loose });
    const eMiddle = finalError(m, p, { rtol: middle, atol: middle });
    const eTight = finalError(m, p, { rtol: tight, atol: tight });
    // Pairs that propagate their lower-order solution (Fehlberg 4(5)) are controlled on the error
    // they make, so their global error is ~ (number of steps) x tol: about 7e-5 at 1e-8 over 1400
    // steps here. The pairs with local extrapolation stay well below 1000 tol (threshold: common
    // practice, no source).
    const propagatesLower = m.order < (m.embeddedOrder ?? 0);
    expect(eMiddle).toBeLessThan((propagatesLower ? 1e4 : 1e3) * middle);
    expect(eTight).toBeLessThan(eMiddle);
    expect(eMiddle).toBeLessThan(eLoose);
  });
  it('the PI controller also meets the tolerance, with a different step sequence', () => {
    const rPi = dormandPrince54.solve(p, { rtol: 1e-8, atol: 1e-8 }, { ...OPTS, controller: 'pi' });
    const rStd = dormandPrince54.solve(p, { rtol: 1e-8, atol: 1e-8 }, OPTS);
    expect(rPi.status).toBe('ok');
    expect(maxAbsDiff(rPi.yFinal, exactAt(p, 20))).toBeLessThan(1e-5);
    expect(rPi.counts.accepted).not.toBe(rStd.counts.accepted);
  });
});

describe('observed convergence order of fixed-step methods (oscillator over one period)', () => {
  // Step counts picked so that halving h changes the error by ~2^p (asymptotic range; checked by
  // hand, common practice, no source). Expected slopes are the published orders.
  const p = oscillator(1);
  // Every fixed-step method (tableaus and symplectic compositions) from the registry.
  const STEPS_BY_ORDER: Record<number, number> = { 1: 20000, 2: 400, 3: 200, 4: 100 };
  const cases: [Method, number, number][] = fixedStep.map((m) => [m, m.order, STEPS_BY_ORDER[m.order] ?? 50]);
  it.each(cases.map(([m, q, n]) => [m.id, m, q, n] as const))('%s: slope within 0.2 of its order', (_id, m, q, n) => {
    const e1 = finalError(m, p, { steps: n });
    const e2 = finalError(m, p, { steps: 2 * n });
    const e4 = finalError(m, p, { steps: 4 * n });
    const slope1 = Math.log2(e1 / e2);
    const slope2 = Math.log2(e2 / e4);
    expect(Math.abs(slope1 - q)).toBeLessThan(0.2);
    expect(Math.abs(slope2 - q)).toBeLessThan(0.2);
  });
  it('returns h = (tEnd - t0)/steps and lands exactly on tEnd', () => {
    const r = rk4.solve(oscillator(1), { steps: 3 }, OPTS);
    expect(r.h).toBe(1 / 3);
    expect(r.tFinal).toBe(1);
  });
});

describe('energy behaviour over 20 periods, h = 1/50', () => {
  // Symplectic methods keep energy errors bounded (no secular drift): HLW 2003 Acta Numerica,
  // sec. 5 (backward error analysis). RK4 is not symplectic; its energy error grows linearly.
  const p = oscillator(20);
  const e0 = oscillatorEnergy(p.y0);
  const drift = (m: Method): [number, number] => {
    let firstHalf = 0;
    let whole = 0;
    m.solve(p, { steps: 1000 }, {
      ...OPTS,
      observer: (t, y) => {
        const d = Math.abs(oscillatorEnergy(y) - e0) / e0;
        whole = Math.max(whole, d);
        if (t <= 10) firstHalf = Math.max(firstHalf, d);
      },
    });
    return [firstHalf, whole];
  };
  it.each(symplectic.map((m) => [m.id, m] as const))('%s: max drift over the first half ~ over all', (_id, m) => {
    const [half, whole] = drift(m);
    expect(whole).toBeLessThan(1.05 * half);
    // An order-p symplectic method keeps the energy within O((omega h)^p) here (same section of
    // HLW 2003); constant 1 (omega h = 2 pi / 50): common practice, no source. Stormer-Verlet
    // reaches 3.9e-3 against 1.6e-2, Yoshida 4 1.9e-5 against 2.5e-4.
    expect(whole).toBeLessThan(((2 * Math.PI) / 50) ** m.order);
  });
  it('rk4 at the same step: drift keeps growing (whole ~ 2 x first half)', () => {
    const [half, whole] = drift(rk4);
    expect(whole / half).toBeGreaterThan(1.9);
    expect(whole / half).toBeLessThan(2.1);
  });
});

describe("y' = -y", () => {
  const p = decay(1);
  // A p-stage explicit method of order p (p <= 4) has stability function R(z) = sum_{k<=p} z^k/k!
  // (HNW I, sec. IV.2), so N steps of size h give exactly R(-h)^N.
  const pStagesOrderP = explicitTableaus.filter((r) => !r.tableau.bHat && r.tableau.c.length === r.tableau.order && r.tableau.order <= 4);
  it.each(pStagesOrderP.map((r) => [r.id, tableauMethodById(r.id), r.tableau.order] as const))('%s reproduces R(-h)^N', (_id, m, q) => {
    const n = 10;
    const h = 1 / n;
    let r = 0;
    let term = 1;
    for (let k = 0; k <= q; k++) {
      r += term;
      term *= -h / (k + 1);
    }
    const res = m.solve(p, { steps: n }, OPTS);
    expect(Math.abs(res.yFinal[0]! - r ** n)).toBeLessThan(1e-15);
  });
  it('dormand-prince-54: every accepted step multiplies y by R(-h), R(z) = sum_{k<=5} z^k/k! + z^6/600', () => {
    // z^6/600 is b^T A^5 1 of DOPRI5 (HNW I, sec. IV.2; from memory).
    const ts: number[] = [];
    const ys: number[] = [];
    const r = dormandPrince54.solve(p, { rtol: 1e-6, atol: 1e-6 }, {
      ...OPTS,
      observer: (t, y) => {
        ts.push(t);
        ys.push(y[0]!);
      },
    });
    expect(r.status).toBe('ok');
    expect(ts.length).toBeGreaterThan(3);
    for (let i = 1; i < ts.length; i++) {
      const z = -(ts[i]! - ts[i - 1]!);
      const R = 1 + z + z ** 2 / 2 + z ** 3 / 6 + z ** 4 / 24 + z ** 5 / 120 + z ** 6 / 600;
      expect(Math.abs(ys[i]! / ys[i - 1]! - R)).toBeLessThan(1e-14);
    }
    expect(Math.abs(r.yFinal[0]! - Math.exp(-1))).toBeLessThan(1e-6);
  });
});

describe('landing, observer and counts', () => {
  const p = oscillator(4);
  const checkTimes = [0.3, 1.7, Math.PI, 3.999];
  it.each(adaptive.map((m) => [m.id, m] as const))('%s lands exactly on each check time and on tEnd', (_id, m) => {
    const ts: number[] = [];
    const r = m.solve(p, { rtol: 1e-7, atol: 1e-7 }, { ...OPTS, checkTimes, observer: (t) => ts.push(t) });
    expect(r.status).toBe('ok');
    for (const tc of checkTimes) expect(ts).toContain(tc);
    expect(ts[ts.length - 1]).toBe(4);
    expect(r.tFinal).toBe(4);
    for (let i = 1; i < ts.length; i++) {
      expect(ts[i]!).toBeGreaterThan(ts[i - 1]!);
      for (const tc of checkTimes) expect(ts[i - 1]! < tc && ts[i]! > tc).toBe(false);
    }
    // Landing must not shrink the step for good: a few extra steps per check time at most.
    const plain = m.solve(p, { rtol: 1e-7, atol: 1e-7 }, OPTS);
    expect(r.counts.accepted).toBeLessThanOrEqual(plain.counts.accepted + 2 * checkTimes.length);
  });

  it.each(explicitMethods.map((m) => [m.id, m] as const))('%s: observer at t0 and after each accepted step', (_id, m) => {
    const ts: number[] = [];
    let first: number[] = [];
    const setting = m.adaptive ? { rtol: 1e-6, atol: 1e-6 } : { steps: 37 };
    const r = m.solve(p, setting, {
      ...OPTS,
      observer: (t, y) => {
        if (ts.length === 0) first = Array.from(y);
        ts.push(t);
      },
    });
    expect(ts[0]).toBe(0);
    expect(first).toEqual([1, 0]);
    expect(ts.length).toBe(r.counts.accepted + 1);
  });

  it('nfev identities: FSAL, non-FSAL, fixed-step and symplectic', () => {
    const s = { rtol: 1e-7, atol: 1e-7 };
    // FSAL with s stages: f(t0,y0) + initial-step probe + (s-1) per attempted step. Non-FSAL:
    // also a fresh first stage after every accepted step but the last.
    for (const rec of explicitTableaus.filter((r) => r.tableau.bHat)) {
      const stages = rec.tableau.c.length;
      const c = tableauMethodById(rec.id).solve(p, s, OPTS).counts;
      expect(c.rejected + c.accepted, rec.id).toBeGreaterThan(3);
      const perAttempt = (stages - 1) * (c.accepted + c.rejected);
      expect(c.nfev, rec.id).toBe(firstSameAsLast(rec.tableau) ? 2 + perAttempt : 2 + perAttempt + c.accepted - 1);
      expect([c.njev, c.nlu]).toEqual([0, 0]);
    }
    // Fixed-step: s evaluations per step.
    for (const rec of explicitTableaus.filter((r) => !r.tableau.bHat)) {
      expect(tableauMethodById(rec.id).solve(p, { steps: 50 }, OPTS).counts.nfev, rec.id).toBe(50 * rec.tableau.c.length);
    }
    // A given initial step skips the probe.
    const c0 = dormandPrince54.solve(p, s, { ...OPTS, initialStep: 1e-3 }).counts;
    expect(c0.nfev).toBe(1 + 6 * (c0.accepted + c0.rejected));
    expect(rk4.solve(p, { steps: 50 }, OPTS).counts).toEqual({ nfev: 200, njev: 0, nlu: 0, accepted: 50, rejected: 0 });
    expect(euler.solve(p, { steps: 50 }, OPTS).counts.nfev).toBe(50);
    // Symplectic: one f call at t0, then two per Stormer-Verlet substep.
    for (const rec of symplecticCompositions) {
      expect(byId(rec.id).solve(p, { steps: 50 }, OPTS).counts.nfev, rec.id).toBe(1 + 2 * rec.weights.length * 50);
    }
  });

  it('a repeated solve gives identical counts and state', () => {
    for (const m of [dormandPrince54, dormandPrince853, bogackiShampine32]) {
      const a = m.solve(p, { rtol: 1e-9, atol: 1e-9 }, { ...OPTS, checkTimes });
      const b = m.solve(p, { rtol: 1e-9, atol: 1e-9 }, { ...OPTS, checkTimes });
      expect(b.counts).toEqual(a.counts);
      expect(Array.from(b.yFinal)).toEqual(Array.from(a.yFinal));
    }
  });
});

describe('failure statuses', () => {
  it('step-limit after exactly maxSteps attempts', () => {
    const r = dormandPrince54.solve(oscillator(20), { rtol: 1e-10, atol: 1e-10 }, { maxSteps: 5 });
    expect(r.status).toBe('step-limit');
    expect(r.counts.accepted + r.counts.rejected).toBe(5);
    expect(r.tFinal).toBeLessThan(20);
    const f = rk4.solve(oscillator(20), { steps: 100 }, { maxSteps: 7 });
    expect(f.status).toBe('step-limit');
    expect(f.counts.accepted).toBe(7);
  });
  it('timeout when the deadline has passed', () => {
    const r = dormandPrince54.solve(oscillator(20), { rtol: 1e-8, atol: 1e-8 }, { ...OPTS, deadline: performance.now() - 1 });
    expect(r.status).toBe('timeout');
    expect(r.counts.accepted).toBe(0);
  });
  const nanAfterHalf = makeProblem({
    id: 'nan-after-half',
    y0: [1],
    tEnd: 1,
    f: (t, y, dy) => {
      dy[0] = t > 0.5 ? NaN : -y[0]!;
    },
  });
  // One state, so no second-order form: the Nystrom pairs' case is in test/nystrom-solve.test.ts.
  it.each(explicitMethods.filter((m) => m.family !== 'symplectic' && !m.needsSecondOrder).map((m) => [m.id, m] as const))(
    '%s: a RHS that turns NaN gives status diverged, stopping near t = 0.5',
    (_id, m) => {
      const r = m.solve(nanAfterHalf, m.adaptive ? { rtol: 1e-6, atol: 1e-6 } : { steps: 10 }, OPTS);
      expect(r.status).toBe('diverged');
      expect(r.tFinal).toBeGreaterThan(m.adaptive ? 0.49 : 0.5);
      expect(r.tFinal).toBeLessThanOrEqual(m.adaptive ? 0.5 : 0.71);
      if (m.adaptive) expect(Number.isFinite(r.yFinal[0]!)).toBe(true);
    },
  );
  it("y' = y^2, y(0) = 1 blows up at t = 1: the adaptive solve stops just before it", () => {
    // Exact solution 1/(1 - t).
    const blowUp = makeProblem({
      id: 'blow-up',
      y0: [1],
      tEnd: 2,
      f: (_t, y, dy) => {
        dy[0] = y[0]! * y[0]!;
      },
    });
    const r = dormandPrince54.solve(blowUp, { rtol: 1e-8, atol: 1e-8 }, OPTS);
    expect(['step-underflow', 'diverged']).toContain(r.status);
    expect(Math.abs(r.tFinal - 1)).toBeLessThan(1e-6);
  });
});

describe('bad input', () => {
  const p = oscillator(1);
  it('wrong setting kind names the field', () => {
    expect(() => dormandPrince54.solve(p, { steps: 10 }, OPTS)).toThrow(InputError);
    expect(() => dormandPrince54.solve(p, { steps: 10 }, OPTS)).toThrow(/rtol/);
    expect(() => rk4.solve(p, { rtol: 1e-6, atol: 1e-6 }, OPTS)).toThrow(/steps/);
    expect(() => rk4.solve(p, { steps: 0 }, OPTS)).toThrow(/setting.steps/);
    expect(() => dormandPrince54.solve(p, { rtol: -1, atol: 1e-6 }, OPTS)).toThrow(/setting.rtol/);
    expect(() => dormandPrince54.solve(p, { rtol: 1e-6, atol: [1e-6] }, OPTS)).toThrow(/setting.atol/);
    expect(() => dormandPrince54.solve(p, { rtol: 1e-6, atol: 1e-6 }, { maxSteps: 0 })).toThrow(/maxSteps/);
  });
  it('symplectic methods explain why they need problem.separable', () => {
    const noSplit = { ...p, separable: undefined };
    const bad = { ...p, separable: { positions: [0], velocities: [0] } };
    for (const m of symplectic) {
      expect(() => m.solve(noSplit, { steps: 10 }, OPTS)).toThrow(InputError);
      expect(() => m.solve(noSplit, { steps: 10 }, OPTS)).toThrow(/separable.*positions/);
      expect(() => m.solve(bad, { steps: 10 }, OPTS)).toThrow(/more than once/);
    }
  });
  it('per-component atol is accepted', () => {
    const r = dormandPrince54.solve(p, { rtol: 1e-8, atol: [1e-8, 1e-7] }, OPTS);
    expect(r.status).toBe('ok');
    expect(maxAbsDiff(r.yFinal, exactAt(p, 1))).toBeLessThan(1e-6);
  });
});

describe('dormand-prince-54 dense output', () => {
  it('interpolates inside every step to within the tolerance of the exact solution', () => {
    const p = oscillator(2);
    let worst = 0;
    let steps = 0;
    const out = new Float64Array(2);
    const r = dormandPrince54.dense.solve(p, { rtol: 1e-9, atol: 1e-9 }, OPTS, (tOld, tNew, evaluate) => {
      steps++;
      for (const th of [0.25, 0.5, 0.75]) {
        const t = tOld + th * (tNew - tOld);
        evaluate(t, out);
        worst = Math.max(worst, maxAbsDiff(out, exactAt(p, t)));
      }
    });
    expect(r.status).toBe('ok');
    expect(steps).toBe(r.counts.accepted);
    expect(worst).toBeLessThan(1e-6);
    // The kept last step reproduces its right end.
    r.evaluate(r.lastStep!.tNew, out);
    expect(maxAbsDiff(out, r.yFinal)).toBeLessThan(1e-14);
    expect(() => r.evaluate(r.lastStep!.tOld - 1, out)).toThrow(InputError);
  });
  it('costs no extra f evaluations', () => {
    const p = oscillator(2);
    const a = dormandPrince54.dense.solve(p, { rtol: 1e-7, atol: 1e-7 }, OPTS);
    const b = dormandPrince54.solve(p, { rtol: 1e-7, atol: 1e-7 }, OPTS);
    expect(a.counts).toEqual(b.counts);
  });
});

describe('dormand-prince-54 unrolled kernel', () => {
  // The kernel must be the generic sweep written out: same steps, same state to rounding.
  const generic = embeddedMethod({ id: 'dp54-generic', name: 'generic', source: 'test' }, DORMAND_PRINCE_54);
  it.each([
    ['oscillator', oscillator(5), 1e-9],
    ['kepler e=0.6', kepler(0.6, 4 * Math.PI), 1e-10],
  ] as const)('%s: same counts and final state as the generic engine', (_name, p, tol) => {
    const a = dormandPrince54.solve(p, { rtol: tol, atol: tol }, OPTS);
    const b = generic.solve(p, { rtol: tol, atol: tol }, OPTS);
    expect(a.counts).toEqual(b.counts);
    expect(maxAbsDiff(a.yFinal, b.yFinal)).toBeLessThan(1e-12);
  });
});

describe('automatic initial step (HNW I, sec. II.4 starting step size)', () => {
  it("y' = -y, y0 = 1, rtol = atol = 1e-6, order 5: first step (0.01 / 5e5)^(1/6)", () => {
    // By hand from the algorithm: sc = 2e-6, d0 = d1 = 5e5, h0 = 0.01, d2 = |f1 - f0| / h0 / sc = 5e5,
    // h1 = (0.01 / max(d1, d2))^(1/(p+1)) = (2e-8)^(1/6), h = min(100 h0, h1).
    const ts: number[] = [];
    const r = dormandPrince54.solve(decay(1), { rtol: 1e-6, atol: 1e-6 }, { ...OPTS, observer: (t) => ts.push(t) });
    expect(r.counts.rejected).toBe(0);
    expect(Math.abs(ts[1]! - (2e-8) ** (1 / 6)) / ts[1]!).toBeLessThan(1e-14);
  });
});
