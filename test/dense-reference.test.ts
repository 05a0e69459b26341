// A certified reference evaluable anywhere: the bounded certifying run's steps joined by Hermite
// interpolation. Checked against exact solutions it was not given, between its steps.
import { describe, expect, it } from 'vitest';
import { useTempCache } from './helpers/temp-cache.js';
import { defineProblem } from '../src/authoring/define-problem.js';
import { withCertifiedReference } from '../src/measure/certify.js';
import { denseEvaluator } from '../src/measure/dense-reference.js';
import { referenceLookup } from '../src/measure/reference.js';
import { measureRun } from '../src/measure/run-one.js';
import { findMethod } from '../src/methods/registry.js';

useTempCache('sg-dense-');

describe('Hermite interpolation through four steps', () => {
  it('is eighth order: sin and cos from steps of 0.1 and 0.05 (errors fall by about 2^8)', () => {
    const worst = (h: number) => {
      const steps = { t: [] as number[], y: [] as number[], f: [] as number[] };
      for (let k = 0; k * h <= 3 + 1e-12; k++) {
        const t = k * h;
        steps.t.push(t);
        steps.y.push(Math.sin(t), Math.cos(t));
        steps.f.push(Math.cos(t), -Math.sin(t));
      }
      const ev = denseEvaluator(steps, 2);
      const out = new Float64Array(2);
      let w = 0;
      for (let t = 0; t <= 2.99; t += 0.0137) {
        ev(t, out);
        w = Math.max(w, Math.abs(out[0]! - Math.sin(t)), Math.abs(out[1]! - Math.cos(t)));
      }
      return w;
    };
    const ratio = worst(0.2) / worst(0.1);
    expect(Math.log2(ratio)).toBeGreaterThan(7.5);
    expect(worst(0.1)).toBeLessThan(1e-12);
  });
});

describe('a certified problem gets a dense reference', () => {
  // y'' = -y from (1, 0): exact cos t, -sin t (not given to stepgauge).
  const oscillator = defineProblem({
    id: 'uncertified-oscillator',
    title: 'oscillator without a reference',
    source: "hand-solved y'' = -y",
    y0: [1, 0],
    span: [0, 10],
    checkTimes: [2.5, 5, 7.5],
    f: (_t, y, dy) => {
      dy[0] = y[1]!;
      dy[1] = -y[0]!;
    },
  });

  it('agrees with the exact solution between its steps within its stated trust', () => {
    const p = withCertifiedReference(oscillator);
    expect(p.reference.digits).toBeGreaterThanOrEqual(10);
    const look = referenceLookup(p);
    expect(look.anywhere).toBe(true);
    const out = new Float64Array(2);
    const trust = 10 ** -p.reference.digits!;
    for (let t = 0.0123; t < 10; t += 0.0731) {
      expect(look.at(t, out)).toBe(true);
      expect(Math.abs(out[0]! - Math.cos(t))).toBeLessThanOrEqual(trust);
      expect(Math.abs(out[1]! + Math.sin(t))).toBeLessThanOrEqual(trust);
    }
  });

  it('so the error along the run is measured at every accepted step of the measured method', () => {
    const p = withCertifiedReference(oscillator);
    const run = measureRun(p, findMethod('bogacki-shampine-32')!, { rtol: 1e-5, atol: 1e-5 }, { maxSteps: 1e6 });
    // Independently: the worst error over the same accepted steps against cos t.
    let worst = 0;
    findMethod('bogacki-shampine-32')!.solve(p, { rtol: 1e-5, atol: 1e-5 }, {
      maxSteps: 1e6,
      observer: (t, y) => void (worst = Math.max(worst, Math.abs(y[0]! - Math.cos(t)), Math.abs(y[1]! + Math.sin(t)))),
    });
    expect(run.error.max! / worst).toBeCloseTo(1, 6);
  });
});
